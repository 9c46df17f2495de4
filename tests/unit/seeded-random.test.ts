/**
 * Unit tests of app/lib/seeded-random.ts: the same seed gives the same exercise numbers on every
 * visit, different seeds give different numbers, and the helpers stay on their grids.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { exerciseSeed, seededRandom } from "../../app/lib/seeded-random";

describe("seededRandom", () => {
  // Source: the seedrandom 3.0.5 README (node_modules/seedrandom/README.md): seedrandom('hello.')
  // "Always" gives 0.9282578795792454, then 0.3752569768646784.
  it("reproduces the published first values of seedrandom('hello.')", () => {
    const rng = seededRandom("hello.");
    expect(rng.next()).toBe(0.9282578795792454);
    expect(rng.next()).toBe(0.3752569768646784);
  });

  it("the same seed gives the same sequence; another seed gives another", () => {
    const draw = (seed: string) => {
      const rng = seededRandom(seed);
      return Array.from({ length: 20 }, () => rng.uniformStep(1, 10, 0.5));
    };
    expect(draw("student-17|stiffness-1|0")).toEqual(draw("student-17|stiffness-1|0"));
    expect(draw("student-17|stiffness-1|0")).not.toEqual(draw("student-18|stiffness-1|0"));
  });

  it("uniformStep stays on the grid, inside the range, written cleanly, and reaches every grid value", () => {
    const rng = seededRandom("grid");
    const seen = new Set<number>();
    for (let i = 0; i < 500; i++) {
      const v = rng.uniformStep(0.1, 0.9, 0.1);
      expect(v).toBeGreaterThanOrEqual(0.1);
      expect(v).toBeLessThanOrEqual(0.9);
      expect(String(v)).toMatch(/^0\.\d$/); // 0.30000000000000004 would fail here
      seen.add(v);
    }
    expect([...seen].sort()).toEqual([0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9]);
  });

  it("uniformStep keeps to the grid for any range and step (property)", () => {
    fc.assert(
      fc.property(
        fc.string(),
        fc.integer({ min: -500, max: 500 }),
        fc.integer({ min: 0, max: 400 }),
        fc.constantFrom(0.01, 0.05, 0.1, 0.25, 0.5, 1, 2.5),
        (seed, minTenths, spanTenths, step) => {
          const min = minTenths / 10;
          const max = min + spanTenths / 10;
          const v = seededRandom(seed).uniformStep(min, max, step);
          expect(v).toBeGreaterThanOrEqual(min - 1e-9);
          expect(v).toBeLessThanOrEqual(max + 1e-9);
          const k = (v - min) / step;
          expect(Math.abs(k - Math.round(k))).toBeLessThan(1e-6);
        },
      ),
      { numRuns: 500, seed: 3 },
    );
  });

  it("integer includes both ends and is roughly even (10 000 throws of a die, fixed seed)", () => {
    const rng = seededRandom("die");
    const counts = [0, 0, 0, 0, 0, 0];
    for (let i = 0; i < 10_000; i++) counts[rng.integer(1, 6) - 1]++;
    for (const c of counts) expect(Math.abs(c - 10_000 / 6)).toBeLessThan(150);
  });

  it("uniform stays in [min, max)", () => {
    const rng = seededRandom("u");
    for (let i = 0; i < 200; i++) {
      const v = rng.uniform(2, 3);
      expect(v >= 2 && v < 3).toBe(true);
    }
  });

  it("pick takes every item sometimes; shuffle is a permutation and repeatable", () => {
    const rng = seededRandom("pick");
    const items = ["pine strip", "oak strip", "rubber band", "ruler"] as const;
    const picked = new Set(Array.from({ length: 200 }, () => rng.pick(items)));
    expect(picked.size).toBe(items.length);
    const a = seededRandom("s").shuffle([1, 2, 3, 4, 5, 6, 7, 8]);
    expect([...a].sort()).toEqual([1, 2, 3, 4, 5, 6, 7, 8]);
    expect(seededRandom("s").shuffle([1, 2, 3, 4, 5, 6, 7, 8])).toEqual(a);
  });

  it("refuses impossible requests with a RangeError", () => {
    const rng = seededRandom("x");
    expect(() => rng.integer(5, 1)).toThrow(RangeError);
    expect(() => rng.integer(1.5, 3)).toThrow(RangeError);
    expect(() => rng.uniformStep(0, 1, 0)).toThrow(RangeError);
    expect(() => rng.uniform(Number.NaN, 1)).toThrow(RangeError);
    expect(() => rng.pick([])).toThrow(RangeError);
  });
});

describe("exerciseSeed", () => {
  it("keeps the parts apart, so different keys never collide by concatenation", () => {
    expect(exerciseSeed("a|b", "c")).not.toBe(exerciseSeed("a", "b|c"));
    expect(exerciseSeed("student-17", "stiffness-1", 0)).toBe(exerciseSeed("student-17", "stiffness-1", 0));
    expect(exerciseSeed("s", 1)).not.toBe(exerciseSeed("s", "1"));
  });
});
