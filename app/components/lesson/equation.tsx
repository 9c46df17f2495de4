// A displayed equation. Its KaTeX markup (HTML for the eye, MathML for screen readers) was made by
// react-katex when the lesson was compiled (app/lib/lesson-equations.server.ts), so the browser only
// shows it: the same markup on the server and in the browser, and no KaTeX code on the page.
// A formula too wide for a phone gives a `narrow` version over more lines, shown below the `sm` width.
export function Equation({ tex, html, narrowHtml }: { tex: string; html?: string; narrow?: string; narrowHtml?: string }) {
  if (!html) return <code className="my-5 block">{tex}</code>;
  if (!narrowHtml) return <div className="my-5 overflow-x-auto" dangerouslySetInnerHTML={{ __html: html }} />;
  return (
    <>
      <div className="my-5 hidden overflow-x-auto sm:block" dangerouslySetInnerHTML={{ __html: html }} />
      <div className="my-5 overflow-x-auto sm:hidden" dangerouslySetInnerHTML={{ __html: narrowHtml }} />
    </>
  );
}
