// A displayed equation, rendered by KaTeX on the server with MathML beside the HTML for screen readers.
// react-katex is a CommonJS package: its default import is the module object on the server and in the browser.
import ReactKatex from "react-katex";

const { BlockMath } = ReactKatex;

export function Equation({ tex }: { tex: string }) {
  return (
    <div className="my-5 overflow-x-auto">
      <BlockMath math={tex} renderError={() => <code>{tex}</code>} />
    </div>
  );
}
