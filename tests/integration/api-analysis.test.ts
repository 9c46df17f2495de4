// POST /api/analysis through its route action with real requests: the NIST StRD certified values come
// back through the API to 1e-9 relative, bad input is a 400/413 with a list, fuzzed bodies never give a 500,
// and the per-address limit holds (counted in PostgreSQL).
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { action, loader, ANALYSIS_REQUESTS_PER_MINUTE } from "~/routes/api.analysis";
import { readStrd } from "../fixtures/nist-strd";

let address = 0;
/** Each test gets its own client address so the rate limit of one never touches another. */
function post(body: unknown, options: { raw?: boolean; from?: string } = {}) {
  const request = new Request("http://localhost/api/analysis", {
    method: "POST",
    headers: { "content-type": "application/json", "x-forwarded-for": options.from ?? `10.0.0.${++address}` },
    body: options.raw ? (body as string) : JSON.stringify(body),
  });
  return action({ request, params: {}, context: {} } as never) as Promise<Response>;
}

function expectRelative(actual: number, certified: number) {
  expect(Math.abs(actual - certified)).toBeLessThanOrEqual(1e-9 * Math.abs(certified));
}

describe("POST /api/analysis against NIST StRD (source: NIST ITL Statistical Reference Datasets, tests/fixtures/nist-strd)", () => {
  it("Norris, with an intercept: slope, intercept, standard errors, residual SD and R²", async () => {
    const norris = readStrd("Norris.dat");
    const response = await post({ points: norris.x.map((x, i) => ({ forceN: norris.y[i], deformationCm: x })) });
    expect(response.status).toBe(200);
    const { fit } = await response.json();
    expectRelative(fit.withIntercept.slope, norris.parameters.B1.estimate);
    expectRelative(fit.withIntercept.intercept, norris.parameters.B0.estimate);
    expectRelative(fit.withIntercept.slopeSE, norris.parameters.B1.sd);
    expectRelative(fit.withIntercept.interceptSE, norris.parameters.B0.sd);
    expectRelative(fit.withIntercept.residualSD, norris.residualSD);
    expectRelative(fit.withIntercept.r2, norris.r2);
  });

  it("NoInt1, through the origin: slope, its standard error, residual SD and uncentred R²", async () => {
    const noInt1 = readStrd("NoInt1.dat");
    const response = await post({ points: noInt1.x.map((x, i) => ({ forceN: noInt1.y[i], deformationCm: x })) });
    const { fit } = await response.json();
    expectRelative(fit.throughOrigin.slope, noInt1.parameters.B1.estimate);
    expectRelative(fit.throughOrigin.slopeSE, noInt1.parameters.B1.sd);
    expectRelative(fit.throughOrigin.residualSD, noInt1.residualSD);
    expectRelative(fit.throughOrigin.r2, noInt1.r2);
  });
});

describe("POST /api/analysis with ruler readings", () => {
  it("works out deformations in both modes, leaves broken points out of the fits and finds the breaking load", async () => {
    // Invented readings: a strip bending by 0.4 cm per newton, breaking at 5 N.
    const bend = await post({
      mode: "bend",
      unloadedCm: 20,
      points: [
        { forceN: 1, readingCm: 19.6, returnReadingCm: 20 },
        { forceN: 2, readingCm: 19.2, returnReadingCm: 20 },
        { forceN: 3, readingCm: 18.8, returnReadingCm: 19.8 },
        { forceN: 4, readingCm: 18.4 },
        { forceN: 5, readingCm: 15, broke: true },
      ],
    });
    const body = await bend.json();
    expect(body.points.map((p: { deformationCm: number }) => p.deformationCm)).toEqual([0.4, 0.8, 1.2, 1.6, 5]);
    expect(body.fit.throughOrigin.slope).toBeCloseTo(2.5, 12);
    expect(body.breakingLoadN).toBe(5);
    expect(body.elasticLimitN).toBe(2);
    expect(body.points[2].permanentSetCm).toBeCloseTo(0.2, 12);
    expect(body.proportional).toBe(true);

    const stretch = await post({ mode: "stretch", unloadedCm: 10, points: [{ forceN: 1, readingCm: 11 }, { forceN: 2, readingCm: 12 }] });
    expect((await stretch.json()).points[1].deformationCm).toBe(2);
  });
});

describe("bad input", () => {
  const cases: [string, unknown, number][] = [
    ["not JSON", "{not json", 400],
    ["one point", { points: [{ forceN: 1, deformationCm: 1 }] }, 400],
    ["a negative force", { points: [{ forceN: -1, deformationCm: 1 }, { forceN: 2, deformationCm: 2 }] }, 400],
    ["a string for a number", { points: [{ forceN: "2", deformationCm: 1 }, { forceN: 2, deformationCm: 2 }] }, 400],
    ["a point with neither reading nor deformation", { points: [{ forceN: 1 }, { forceN: 2, deformationCm: 2 }] }, 400],
    ["a reading without the unloaded reading", { points: [{ forceN: 1, readingCm: 3 }, { forceN: 2, readingCm: 2 }] }, 400],
    ["too many points", { points: Array.from({ length: 1001 }, (_, i) => ({ forceN: i, deformationCm: i })) }, 413],
    ["one force throughout", { unloadedCm: 25, points: [24.0, 23.9, 24.1].map((r) => ({ forceN: 3, readingCm: r })) }, 400],
  ];
  it("one force throughout is named: the force has to change between readings", async () => {
    const response = await post({ unloadedCm: 25, points: [24.0, 23.9, 24.1].map((r) => ({ forceN: 3, readingCm: r })) });
    expect((await response.json()).errors).toEqual([
      "points: every reading has the same force (3 N): change the load between readings, so that there are at least two different forces.",
    ]);
  });
  for (const [name, body, status] of cases) {
    it(`${name} → ${status} with a list of what is wrong`, async () => {
      const response = await post(body, { raw: typeof body === "string" });
      expect(response.status).toBe(status);
      const answer = await response.json();
      expect(Array.isArray(answer.errors)).toBe(true);
      expect(answer.errors.length).toBeGreaterThan(0);
    });
  }

  it("answers GET with 405 and says to POST", async () => {
    const response = (await loader()) as Response;
    expect(response.status).toBe(405);
    expect(response.headers.get("allow")).toBe("POST");
  });

  it("never answers a fuzzed body with a 500 or an exception (fast-check)", async () => {
    const point = fc.record(
      {
        forceN: fc.oneof(fc.double(), fc.string(), fc.constant(null), fc.integer({ min: 0, max: 10 })),
        readingCm: fc.oneof(fc.double(), fc.constant(undefined), fc.string()),
        deformationCm: fc.oneof(fc.double({ min: 0, max: 100, noNaN: true }), fc.constant(undefined)),
        returnReadingCm: fc.oneof(fc.double(), fc.constant(undefined)),
        broke: fc.oneof(fc.boolean(), fc.string(), fc.constant(undefined)),
      },
      { requiredKeys: [] },
    );
    const body = fc.oneof(
      fc.record({ mode: fc.oneof(fc.constantFrom("bend", "stretch"), fc.string()), unloadedCm: fc.oneof(fc.double(), fc.string()), resolutionCm: fc.oneof(fc.double(), fc.constant(undefined)), points: fc.array(point, { maxLength: 12 }) }, { requiredKeys: [] }),
      fc.jsonValue(),
      fc.string().map((s) => ({ __raw: s })),
    );
    await fc.assert(
      fc.asyncProperty(body, async (b) => {
        const raw = typeof b === "object" && b !== null && "__raw" in b ? (b as { __raw: string }).__raw : undefined;
        const response = await post(raw ?? b, { raw: raw !== undefined, from: "fuzz" });
        expect([200, 400, 413, 429]).toContain(response.status);
        const answer = await response.json();
        if (response.status === 200) expect(JSON.stringify(answer)).not.toMatch(/NaN|Infinity/);
      }),
      { numRuns: 100 },
    );
  });
});

describe("the per-address limit", () => {
  it(`allows ${ANALYSIS_REQUESTS_PER_MINUTE} requests a minute from one address, then answers 429`, { timeout: 60_000 }, async () => {
    const body = { points: [{ forceN: 1, deformationCm: 1 }, { forceN: 2, deformationCm: 2 }] };
    // Windows are whole minutes: start early in one so the loop stays inside it.
    while (new Date().getSeconds() > 45) await new Promise((r) => setTimeout(r, 1000));
    const statuses: number[] = [];
    for (let i = 0; i < ANALYSIS_REQUESTS_PER_MINUTE + 2; i++) statuses.push((await post(body, { from: "192.0.2.7" })).status);
    expect(statuses.slice(0, ANALYSIS_REQUESTS_PER_MINUTE).every((s) => s === 200)).toBe(true);
    expect(statuses.slice(ANALYSIS_REQUESTS_PER_MINUTE)).toEqual([429, 429]);
    const other = await post(body, { from: "192.0.2.8" });
    expect(other.status).toBe(200);
  });
});
