// Browsers ask for /favicon.ico on their own; Bendwise's mark is an SVG.
export function loader() {
  return new Response(null, { status: 301, headers: { Location: "/favicon.svg", "Cache-Control": "public, max-age=86400" } });
}
