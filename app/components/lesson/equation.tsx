// A displayed equation, rendered by KaTeX on the server with MathML beside the HTML for screen readers.
import { BlockMath } from "react-katex";

export function Equation({ tex }: { tex: string }) {
  return (
    <div className="my-5 overflow-x-auto">
      <BlockMath math={tex} renderError={() => <code>{tex}</code>} />
    </div>
  );
}
