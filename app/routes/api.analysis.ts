// POST /api/analysis — analyse a series of readings (the contract is in app/lib/science.ts and
// app/lib/analysis-request.ts). Open to anyone, limited per address; bad input is a 400 (413 for too
// many points or too large a body) with a list of what is wrong, never a 500.
import type { Route } from "./+types/api.analysis";
import { db } from "~/db/client.server";
import { clientAddress } from "~/lib/auth/throttle.server";
import { MAX_POINTS, parseAnalysisRequestText } from "~/lib/analysis-request";
import { hitRateLimit } from "~/lib/rate-limit.server";
import { analyseReadings } from "~/lib/science";

export const ANALYSIS_REQUESTS_PER_MINUTE = 120;
/** 1000 points with every field written out fit comfortably in 256 KB. */
const MAX_BODY_BYTES = 256 * 1024;

const json = (body: unknown, status = 200, headers: Record<string, string> = {}) =>
  Response.json(body, { status, headers: { "Cache-Control": "no-store", ...headers } });

export async function loader() {
  return json({ errors: ["Send the readings with POST, as JSON."] }, 405, { Allow: "POST" });
}

export async function action({ request }: Route.ActionArgs) {
  if (request.method !== "POST") return json({ errors: ["Send the readings with POST, as JSON."] }, 405, { Allow: "POST" });
  const limit = await hitRateLimit({ db }, `analysis:${clientAddress(request)}`, ANALYSIS_REQUESTS_PER_MINUTE);
  if (!limit.allowed) {
    return json({ errors: [`Too many requests: at most ${limit.limit} a minute. Try again in ${limit.retryAfter} s.`] }, 429, {
      "Retry-After": String(limit.retryAfter),
    });
  }
  const declared = Number(request.headers.get("content-length") ?? 0);
  if (declared > MAX_BODY_BYTES) return json({ errors: [`The body is larger than ${MAX_BODY_BYTES / 1024} KB.`] }, 413);
  let text: string;
  try {
    text = await request.text();
  } catch {
    return json({ errors: ["The body could not be read."] }, 400);
  }
  if (text.length > MAX_BODY_BYTES) return json({ errors: [`The body is larger than ${MAX_BODY_BYTES / 1024} KB.`] }, 413);
  const parsed = parseAnalysisRequestText(text);
  if (!parsed.ok) return json({ errors: parsed.errors, maxPoints: MAX_POINTS }, parsed.status);
  return json(analyseReadings(parsed.data));
}
