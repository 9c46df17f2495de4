// Displayed equations in a lesson (<Equation tex="…" /> in the MDX) become math at compile time, the
// same way $$…$$ does: rehype-katex renders them to HTML with MathML beside it, once, when the lesson
// is compiled. So no KaTeX code ships to the browser (it was most of a lesson page's JavaScript) and
// no request renders math: the page only carries the finished markup and KaTeX's stylesheet.

type Node = { type: string; name?: string | null; value?: unknown; attributes?: Attribute[]; children?: Node[]; data?: unknown };
type Attribute = { type: string; name?: string; value?: unknown };

/** The mdast node remark-math makes for a $$…$$ block, with the hast it turns into. */
function displayMath(tex: string): Node {
  return {
    type: "math",
    value: tex,
    data: {
      hName: "pre",
      hChildren: [{ type: "element", tagName: "code", properties: { className: ["language-math", "math-display"] }, children: [{ type: "text", value: tex }] }],
    },
  };
}

/** A remark plugin: each <Equation tex="…" /> becomes a displayed formula in a scrolling box. */
export function remarkEquations() {
  return (tree: Node) => {
    const walk = (node: Node) => {
      if (!node.children) return;
      node.children = node.children.map((child) => {
        if ((child.type === "mdxJsxFlowElement" || child.type === "mdxJsxTextElement") && child.name === "Equation") {
          const tex = child.attributes?.find((a) => a.type === "mdxJsxAttribute" && a.name === "tex")?.value;
          if (typeof tex !== "string") throw new Error('<Equation> needs its formula as a plain string: <Equation tex="k = F / x" />');
          return {
            type: child.type,
            name: "div",
            attributes: [{ type: "mdxJsxAttribute", name: "className", value: "my-5 overflow-x-auto" }],
            children: [displayMath(tex)],
          };
        }
        walk(child);
        return child;
      });
    };
    walk(tree);
  };
}
