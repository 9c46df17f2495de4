// GET /api/ping — a constant JSON answer that touches nothing: no session, no database. It is the
// floor of `npm run bench`: every figure there is a share of what the same server does on this route,
// measured in the same run, so the numbers mean the same on a fast or a slow machine.
const PONG = JSON.stringify({ pong: true });

export function loader() {
  return new Response(PONG, { headers: { "Content-Type": "application/json", "Cache-Control": "no-store" } });
}
