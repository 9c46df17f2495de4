// A displayed equation. Its KaTeX markup (HTML for the eye, MathML for screen readers) was made by
// react-katex when the lesson was compiled (app/lib/lesson-equations.server.ts), so the browser only
// shows it: the same markup on the server and in the browser, and no KaTeX code on the page.
export function Equation({ tex, html }: { tex: string; html?: string }) {
  if (!html) return <code className="my-5 block">{tex}</code>;
  return <div className="my-5 overflow-x-auto" dangerouslySetInnerHTML={{ __html: html }} />;
}
