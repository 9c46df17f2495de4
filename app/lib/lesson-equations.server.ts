// Displayed equations in a lesson (<Equation tex="…" /> in the MDX) are rendered once, when the lesson
// is compiled: react-katex's BlockMath renders each formula to KaTeX's HTML with MathML beside it, and
// the finished markup is handed to the <Equation> component as a plain string. So no KaTeX code ships
// to the browser (it was most of a lesson page's JavaScript) and no request renders math.
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import ReactKatex from "react-katex";

// react-katex is a CommonJS package: its default import is the module object.
const { BlockMath } = ReactKatex;

type Node = { type: string; name?: string | null; attributes?: Attribute[]; children?: Node[] };
type Attribute = { type: string; name?: string; value?: unknown };

/** KaTeX's markup for a displayed formula; a formula KaTeX cannot read fails the compile with its message. */
export function renderDisplayedFormula(tex: string): string {
  return renderToStaticMarkup(
    createElement(BlockMath, {
      math: tex,
      renderError: (error: Error) => {
        throw new Error(`<Equation tex="${tex}">: ${error.message}`);
      },
    }),
  );
}

/**
 * A remark plugin: each <Equation tex="…" /> gets its rendered markup as an `html` attribute, and its
 * version for a phone's width (`narrow="…"`, the same formula over more lines), if it has one, as `narrowHtml`.
 */
export function remarkEquations() {
  return (tree: Node) => {
    const walk = (node: Node) => {
      for (const child of node.children ?? []) {
        if ((child.type === "mdxJsxFlowElement" || child.type === "mdxJsxTextElement") && child.name === "Equation") {
          const attribute = (name: string) => child.attributes?.find((a) => a.type === "mdxJsxAttribute" && a.name === name)?.value;
          const tex = attribute("tex");
          const narrow = attribute("narrow");
          if (typeof tex !== "string") throw new Error('<Equation> needs its formula as a plain string: <Equation tex="k = F / x" />');
          if (narrow !== undefined && typeof narrow !== "string") throw new Error(`<Equation tex="${tex}">: narrow must be a plain string too`);
          child.attributes = [
            ...(child.attributes ?? []),
            { type: "mdxJsxAttribute", name: "html", value: renderDisplayedFormula(tex) },
            ...(narrow ? [{ type: "mdxJsxAttribute", name: "narrowHtml", value: renderDisplayedFormula(narrow) }] : []),
          ];
        }
        walk(child);
      }
    };
    walk(tree);
  };
}
