/**
 * Unit tests of app/lib/science.ts, checked against outside sources where one exists (each named
 * beside its test). Readings marked "invented" are made up for the test, not measured.
 */
import { describe, expect, it } from "vitest";
import {
  G_N_PER_KG,
  analyseReadings,
  beamStiffnessNPerM,
  beamStiffnessScale,
  breakingLoadN,
  deformationCm,
  implausibleReadings,
  deformationUncertaintyCm,
  designCheck,
  elasticLimit,
  fitThroughOrigin,
  fitWithIntercept,
  formatForStudent,
  formatToResolution,
  formatFitted,
  formatWithUncertainty,
  gluedStackStiffness,
  midspanDeflectionM,
  parallelStiffness,
  permanentSetCm,
  proportionalityVerdict,
  readingUncertaintyCm,
  secondMomentRectangleM4,
  secondMomentRoundM4,
  seriesStiffness,
  sideBySideStiffness,
  stiffnessNPerCm,
  stiffnessRatio,
  stiffnessWithUncertainty,
  weightN,
  youngsModulusFromTestPa,
  type AnalysisResult,
  type DesignCheckInput,
} from "../../app/lib/science";
import { readStrd } from "../fixtures/nist-strd";

// ─────────────── NIST StRD fixtures: parsed from the files, nothing typed in by hand ───────────────

/** |actual − certified| ≤ 1e-9 × |certified| */
function expectRelative(actual: number | null, certified: number, rel = 1e-9): void {
  expect(actual).not.toBeNull();
  expect(Math.abs((actual as number) - certified)).toBeLessThanOrEqual(rel * Math.abs(certified));
}

describe("NIST StRD linear regression (source: NIST ITL Statistical Reference Datasets, files in tests/fixtures/nist-strd)", () => {
  const norris = readStrd("Norris.dat");
  const noInt1 = readStrd("NoInt1.dat");

  it("reads the fixtures as the headers describe them", () => {
    expect(norris.x).toHaveLength(36);
    expect(noInt1.x).toHaveLength(11);
    expect(norris.parameters.B1.estimate).toBe(1.00211681802045);
    expect(norris.parameters.B1.sd).toBe(0.429796848199937e-3);
    expect(noInt1.residualSD).toBe(3.56753034006338);
    expect(noInt1.r2).toBe(0.999365492298663);
  });

  it("Norris (with intercept): slope, intercept, both standard errors, residual SD (n − 2) and centred R² to 1e-9 relative", () => {
    const fit = fitWithIntercept(norris.x.map((x, i) => ({ deformationCm: x, forceN: norris.y[i] })));
    expect(fit.n).toBe(36);
    expectRelative(fit.slope, norris.parameters.B1.estimate);
    expectRelative(fit.intercept, norris.parameters.B0.estimate);
    expectRelative(fit.slopeSE, norris.parameters.B1.sd);
    expectRelative(fit.interceptSE, norris.parameters.B0.sd);
    expectRelative(fit.residualSD, norris.residualSD);
    expectRelative(fit.r2, norris.r2);
  });

  it("NoInt1 (through the origin): slope, its standard error, residual SD (n − 1) and uncentred R² to 1e-9 relative", () => {
    const fit = fitThroughOrigin(noInt1.x.map((x, i) => ({ deformationCm: x, forceN: noInt1.y[i] })));
    expect(fit.n).toBe(11);
    expectRelative(fit.slope, noInt1.parameters.B1.estimate);
    expectRelative(fit.slopeSE, noInt1.parameters.B1.sd);
    expectRelative(fit.residualSD, noInt1.residualSD);
    expectRelative(fit.r2, noInt1.r2);
  });

  it("the same certified values come out of analyseReadings (the POST /api/analysis computation)", () => {
    const norrisResult = analyseReadings({
      mode: "bend",
      resolutionCm: 0.1,
      points: norris.x.map((x, i) => ({ forceN: norris.y[i], deformationCm: x })),
    });
    const w = norrisResult.fit.withIntercept;
    expectRelative(w.slope, norris.parameters.B1.estimate);
    expectRelative(w.intercept, norris.parameters.B0.estimate);
    expectRelative(w.slopeSE, norris.parameters.B1.sd);
    expectRelative(w.interceptSE, norris.parameters.B0.sd);
    expectRelative(w.residualSD, norris.residualSD);
    expectRelative(w.r2, norris.r2);

    const noIntResult = analyseReadings({
      mode: "stretch",
      resolutionCm: 0.1,
      points: noInt1.x.map((x, i) => ({ forceN: noInt1.y[i], deformationCm: x })),
    });
    const o = noIntResult.fit.throughOrigin;
    expectRelative(o.slope, noInt1.parameters.B1.estimate);
    expectRelative(o.slopeSE, noInt1.parameters.B1.sd);
    expectRelative(o.residualSD, noInt1.residualSD);
    expectRelative(o.r2, noInt1.r2);
  });
});

describe("fits on small and degenerate data", () => {
  it("a perfect line through the origin: slope exact, zero residuals, R² = 1", () => {
    const pts = [1, 2, 3, 4].map((f) => ({ forceN: f, deformationCm: f / 2 }));
    const o = fitThroughOrigin(pts);
    expect(o.slope).toBeCloseTo(2, 12);
    expect(o.residualSD).toBeCloseTo(0, 12);
    expect(o.r2).toBeCloseTo(1, 12);
  });

  it("hand-worked three-point example with a free intercept (invented data)", () => {
    // x = 1, 2, 3; y = 2, 3, 5. x̄ = 2, ȳ = 10/3, Sxx = 2, Sxy = 3 → slope 1.5, intercept 1/3;
    // residuals 1/6, −1/3, 1/6 → RSS = 1/6, s = √(1/6), SE(slope) = s/√2, SE(intercept) = s·√(1/3 + 4/2).
    const f = fitWithIntercept([
      { deformationCm: 1, forceN: 2 },
      { deformationCm: 2, forceN: 3 },
      { deformationCm: 3, forceN: 5 },
    ]);
    expect(f.slope).toBeCloseTo(1.5, 12);
    expect(f.intercept).toBeCloseTo(1 / 3, 12);
    expect(f.residualSD).toBeCloseTo(Math.sqrt(1 / 6), 12);
    expect(f.slopeSE).toBeCloseTo(Math.sqrt(1 / 6) / Math.sqrt(2), 12);
    expect(f.interceptSE).toBeCloseTo(Math.sqrt(1 / 6) * Math.sqrt(1 / 3 + 2), 12);
    // Syy = (4 + 9 + 25) − 3·(10/3)² = 38 − 100/3 = 14/3 → R² = 1 − (1/6)/(14/3) = 27/28
    expect(f.r2).toBeCloseTo(27 / 28, 12);
  });

  it("no points, one point, two points: nulls where a value cannot be computed, never NaN", () => {
    expect(fitThroughOrigin([])).toEqual({ n: 0, slope: null, slopeSE: null, residualSD: null, r2: null });
    const one = fitThroughOrigin([{ deformationCm: 2, forceN: 4 }]);
    expect(one.slope).toBe(2);
    expect(one.slopeSE).toBeNull();
    expect(one.residualSD).toBeNull();
    const two = fitWithIntercept([
      { deformationCm: 1, forceN: 1 },
      { deformationCm: 2, forceN: 3 },
    ]);
    expect(two.slope).toBeCloseTo(2, 12);
    expect(two.intercept).toBeCloseTo(-1, 12);
    expect(two.slopeSE).toBeNull();
    expect(two.interceptSE).toBeNull();
    expect(two.residualSD).toBeNull();
    expect(fitWithIntercept([{ deformationCm: 1, forceN: 1 }]).slope).toBeNull();
  });

  it("all deformations zero, or all the same: no slope", () => {
    const zeros = [1, 2, 3].map((f) => ({ forceN: f, deformationCm: 0 }));
    expect(fitThroughOrigin(zeros).slope).toBeNull();
    expect(fitWithIntercept(zeros).slope).toBeNull();
    const same = [1, 2, 3].map((f) => ({ forceN: f, deformationCm: 1.5 }));
    expect(fitWithIntercept(same).slope).toBeNull();
    // through the origin it is still defined: Σxy/Σx² = (1.5 × 6)/(3 × 1.5²) = 2 N ÷ 1.5 cm
    expect(fitThroughOrigin(same).slope).toBeCloseTo(2 / 1.5, 12);
  });

  it("all forces zero: slope 0, R² null (no variation to explain)", () => {
    const flat = [1, 2, 3].map((d) => ({ forceN: 0, deformationCm: d }));
    expect(fitThroughOrigin(flat).slope).toBe(0);
    expect(fitThroughOrigin(flat).r2).toBeNull();
    expect(fitWithIntercept(flat).r2).toBeNull();
  });
});

describe("deformation, stiffness of one reading, permanent set", () => {
  it("bend: unloaded − loaded; stretch: loaded − unloaded (sign per mode)", () => {
    expect(deformationCm("bend", 22.0, 21.5)).toBe(0.5);
    expect(deformationCm("stretch", 10.0, 12.5)).toBe(2.5);
    expect(deformationCm("bend", 20.0, 20.4)).toBe(-0.4); // a beam pushed up reads negative
  });

  it("cleans binary noise from the difference of two readings", () => {
    expect(20.3 - 19.9).not.toBe(0.4); // the raw floating-point difference
    expect(deformationCm("bend", 20.3, 19.9)).toBe(0.4);
    expect(deformationCm("stretch", 0.1, 0.3)).toBe(0.2);
  });

  it("stiffness = force ÷ deformation, null when the deformation is 0", () => {
    expect(stiffnessNPerCm(3, 1.5)).toBe(2);
    expect(stiffnessNPerCm(3, 0)).toBeNull();
    expect(stiffnessNPerCm(0, 0)).toBeNull();
  });

  it("permanent set uses the same sign rule as the deformation", () => {
    expect(permanentSetCm("bend", 30.0, 29.7)).toBe(0.3);
    expect(permanentSetCm("stretch", 10.0, 10.4)).toBe(0.4);
    expect(permanentSetCm("bend", 30.0, 30.0)).toBe(0);
  });
});

describe("proportionality verdict (our written rule, see proportionalityVerdict)", () => {
  it("exact proportional readings (invented): proportional", () => {
    const v = proportionalityVerdict(
      [0, 1, 2, 3, 4, 5].map((f) => ({ forceN: f, deformationCm: f / 2 })),
      0.1,
    );
    expect(v.kind).toBe("proportional");
    expect(v.proportional).toBe(true);
    expect(v.reason).toMatch(/through the origin/);
  });

  it("readings off by less than one ruler step (invented): still proportional", () => {
    // deformations 0.5, 1.0, 1.5, 2.1, 2.5 cm at 1–5 N; by hand the line through the origin is
    // k = 27.9/14.16 = 1.970 N/cm and the farthest reading (2.1 cm) is 0.070 cm from it.
    const v = proportionalityVerdict(
      [0.5, 1.0, 1.5, 2.1, 2.5].map((d, i) => ({ forceN: i + 1, deformationCm: d })),
      0.1,
    );
    expect(v.kind).toBe("proportional");
    expect(v.largestMissThroughOriginCm).toBeCloseTo(2.1 - 4 / (27.9 / 14.16), 10);
  });

  it("a band with 0.5 cm of slack (invented): linear, not proportional, and says where it meets zero force", () => {
    const v = proportionalityVerdict(
      [1, 2, 3, 4, 5].map((f) => ({ forceN: f, deformationCm: f / 2 + 0.5 })),
      0.1,
    );
    expect(v.kind).toBe("linear-not-proportional");
    expect(v.proportional).toBe(false);
    expect(v.originOffsetCm).toBeCloseTo(0.5, 10);
    expect(v.reason).toMatch(/misses the origin/);
    expect(v.reason).toMatch(/0\.50 cm/);
  });

  it("clause (b) alone: the origin line passes within a step, but the line meets zero force 0.15 cm away (invented)", () => {
    const pts = [6, 7, 8, 9, 10].map((f) => ({ forceN: f, deformationCm: Number((f / 2 + 0.15).toFixed(2)) }));
    const v = proportionalityVerdict(pts, 0.1);
    expect(v.largestMissThroughOriginCm as number).toBeLessThan(0.1);
    expect(v.originOffsetCm).toBeCloseTo(0.15, 9);
    expect(v.kind).toBe("linear-not-proportional");
    // With a coarser ruler (0.2 cm steps) the same offset is within one step: proportional.
    expect(proportionalityVerdict(pts, 0.2).kind).toBe("proportional");
  });

  it("a verdict decided by less than half a ruler step says it is a close call (invented readings)", () => {
    // 0–6 N against readings 25.0, 24.6, 24.3, 23.9, 23.4, 23.0, 22.5 cm. By hand: ΣFx = 36.5 and
    // Σx² = 14.67, so k = 2.488 N/cm; 3 N on that line is 1.206 cm, 0.106 cm from the 1.1 cm read,
    // just over one 0.1 cm step.
    const deformations = [0, 0.4, 0.7, 1.1, 1.6, 2.0, 2.5];
    const v = proportionalityVerdict(deformations.map((d, f) => ({ forceN: f, deformationCm: d })), 0.1);
    expect(v.kind).toBe("linear-not-proportional");
    expect(v.largestMissThroughOriginCm).toBeCloseTo(3 / (36.5 / 14.67) - 1.1, 9);
    expect(v.reason).toMatch(/close call/);
    // The band with 0.5 cm of slack is no close call.
    expect(proportionalityVerdict([1, 2, 3, 4, 5].map((f) => ({ forceN: f, deformationCm: f / 2 + 0.5 })), 0.1).reason).not.toMatch(/close call/);
  });

  it("a piece that yields (invented): not linear", () => {
    // Free line by hand: x̄ = 1.9, Sxx = 25.75 − 5·1.9² = 7.7, Sxy = 37 − 5·1.9·3 = 8.5, so
    // slope b1 = 8.5/7.7 = 1.104 N/cm, intercept b0 = 3 − 1.9·b1 = 0.903 N. The farthest reading
    // is the first: 1 N on that line is at (1 − b0)/b1 = 0.088 cm, 0.41 cm from the 0.5 cm read.
    const v = proportionalityVerdict(
      [0.5, 1.0, 1.5, 2.5, 4.0].map((d, i) => ({ forceN: i + 1, deformationCm: d })),
      0.1,
    );
    const b1 = 8.5 / 7.7;
    const b0 = 3 - 1.9 * b1;
    expect(v.kind).toBe("not-linear");
    expect(v.largestMissWithInterceptCm).toBeCloseTo(0.5 - (1 - b0) / b1, 9);
    expect(v.reason).toMatch(/curves/);
  });

  it("too few points, or force not rising with deformation", () => {
    expect(proportionalityVerdict([{ forceN: 1, deformationCm: 0.5 }], 0.1).kind).toBe("too-few-points");
    expect(
      proportionalityVerdict(
        [
          { forceN: 0, deformationCm: 0 },
          { forceN: 1, deformationCm: 0 },
          { forceN: 2, deformationCm: 0.5 },
        ],
        0.1,
      ).kind,
    ).toBe("too-few-points");
    expect(
      proportionalityVerdict(
        [
          { forceN: 1, deformationCm: -1 },
          { forceN: 2, deformationCm: -2 },
        ],
        0.1,
      ).kind,
    ).toBe("no-increase");
  });

  it("a reading exactly one step off counts as within, despite binary noise (20.0 − 19.9 = 0.10000000000000142)", () => {
    // One point sits 20.0 − 19.9 cm (one 0.1 cm step, computed raw) beside the exact line x = F/2.
    const pts = [
      { forceN: 2, deformationCm: 1 },
      { forceN: 4, deformationCm: 2 },
      { forceN: 6, deformationCm: 3 },
      { forceN: 8, deformationCm: 4 },
    ];
    expect(elasticLimit([{ forceN: 1, permanentSetCm: 20.0 - 19.9 }], 0.1).elasticLimitN).toBe(1);
    expect(proportionalityVerdict(pts, 0.1).kind).toBe("proportional");
  });
});

describe("elastic limit and breaking load", () => {
  // Invented: a strip loaded 1–6 N, read after each unload; resolution 0.1 cm.
  const steps = [
    { forceN: 1, permanentSetCm: 0 },
    { forceN: 2, permanentSetCm: 0 },
    { forceN: 3, permanentSetCm: permanentSetCm("bend", 30.0, 29.9) }, // one step: came back
    { forceN: 4, permanentSetCm: 0.3 },
    { forceN: 5, permanentSetCm: 0.1 }, // after a permanent set nothing counts
    { forceN: 6, permanentSetCm: null, broke: true },
  ];

  it("elastic limit = largest force that came back within one step, before the first permanent set", () => {
    expect(elasticLimit(steps, 0.1)).toEqual({ elasticLimitN: 3, firstPermanentSetAtN: 4, firstPermanentSetCm: 0.3, limitReached: true });
  });

  it("no permanent set at all: the largest force tested; no return readings: null", () => {
    expect(elasticLimit(steps.slice(0, 3), 0.1).elasticLimitN).toBe(3);
    expect(elasticLimit([{ forceN: 1, permanentSetCm: null }], 0.1).elasticLimitN).toBeNull();
  });

  it("the first return already shows a set: elastic limit below the smallest load (null)", () => {
    expect(elasticLimit([{ forceN: 1, permanentSetCm: 0.5 }], 0.1)).toEqual({
      elasticLimitN: null,
      firstPermanentSetAtN: 1,
      firstPermanentSetCm: 0.5,
      limitReached: true,
    });
  });

  it("stops at a break", () => {
    expect(elasticLimit([{ forceN: 1, permanentSetCm: 0 }, { forceN: 2, permanentSetCm: null, broke: true }, { forceN: 3, permanentSetCm: 0 }], 0.1).elasticLimitN).toBe(1);
  });

  it("breaking load = the force of the first point marked broke", () => {
    expect(breakingLoadN(steps)).toBe(6);
    expect(breakingLoadN([{ forceN: 7, broke: true }, { forceN: 8, broke: true }])).toBe(7);
    expect(breakingLoadN([{ forceN: 7 }])).toBeNull();
  });
});

describe("specimens together", () => {
  it("stiffness ratio, null when dividing by zero", () => {
    expect(stiffnessRatio(6, 2)).toBe(3);
    expect(stiffnessRatio(2, 6)).toBeCloseTo(1 / 3, 15);
    expect(stiffnessRatio(2, 0)).toBeNull();
  });

  it("side by side: n × k; glued stack: n³ × k (bending stiffness goes with thickness cubed)", () => {
    expect(sideBySideStiffness(1.5, 4)).toBe(6);
    expect(gluedStackStiffness(1.5, 2)).toBe(12);
    // The glued stack agrees with the beam formula: a strip twice as thick has 2³ times the I.
    expect(secondMomentRectangleM4(0.02, 0.01) / secondMomentRectangleM4(0.02, 0.005)).toBeCloseTo(8, 12);
    expect(gluedStackStiffness(1, 3)).toBe(27);
  });

  it("in series: 1/k = Σ 1/kᵢ; in parallel: Σ kᵢ", () => {
    expect(seriesStiffness([4, 4])).toBe(2);
    expect(seriesStiffness([2, 6])).toBeCloseTo(1.5, 15);
    expect(seriesStiffness([])).toBeNull();
    expect(seriesStiffness([3, 0])).toBeNull();
    expect(parallelStiffness([2, 6])).toBe(8);
  });
});

describe("beams (SI units)", () => {
  it("second moments of area: b·h³/12 and π·d⁴/64", () => {
    expect(secondMomentRectangleM4(0.02, 0.005)).toBeCloseTo((0.02 * 0.005 ** 3) / 12, 25);
    // 1 cm round dowel: π × (0.01 m)⁴ / 64 = 4.908 738 521… × 10⁻¹⁰ m⁴
    expect(secondMomentRoundM4(0.01)).toBeCloseTo(4.908738521234052e-10, 20);
    expect(() => secondMomentRectangleM4(0, 0.01)).toThrow(RangeError);
    expect(() => secondMomentRoundM4(Number.NaN)).toThrow(RangeError);
  });

  // Source: USDA Forest Products Laboratory, Wood Handbook (FPL-GTR-190, 2010), Table 5-3a:
  // northern red oak at 12 % moisture content, modulus of elasticity 12.5 GPa (cited from memory).
  const RED_OAK_E_PA = 12.5e9;

  it("Wood Handbook red oak strip: deflection by the formula, checked by hand, and E recovered from it", () => {
    // A 2.0 cm × 0.50 cm red oak strip on a 40 cm span with 10 N at midspan (an invented test).
    // By hand: I = 0.02 × 0.005³ / 12 = 2.083 × 10⁻¹⁰ m⁴; 48·E·I = 48 × 12.5e9 × 2.083e-10 = 125 N·m²;
    // δ = F·L³ / (48·E·I) = 10 × 0.064 / 125 = 5.12 × 10⁻³ m.
    const I = secondMomentRectangleM4(0.02, 0.005);
    const delta = midspanDeflectionM(10, 0.4, RED_OAK_E_PA, I);
    expect(delta).toBeCloseTo(5.12e-3, 15);
    expect(youngsModulusFromTestPa(10, 0.4, I, delta) / RED_OAK_E_PA).toBeCloseTo(1, 12);
    expect(beamStiffnessNPerM(0.4, RED_OAK_E_PA, I)).toBeCloseTo(125 / 0.064, 9);
  });

  it("how width, thickness and span change stiffness: width¹, thickness³, span⁻³", () => {
    expect(beamStiffnessScale({ width: 2 })).toBe(2);
    expect(beamStiffnessScale({ thickness: 2 })).toBe(8);
    expect(beamStiffnessScale({ span: 2 })).toBe(1 / 8);
    expect(beamStiffnessScale({ width: 3, thickness: 0.5, span: 0.5 })).toBeCloseTo(3, 12);
    // The scale agrees with the formula itself.
    const k1 = beamStiffnessNPerM(0.4, RED_OAK_E_PA, secondMomentRectangleM4(0.02, 0.005));
    const k2 = beamStiffnessNPerM(0.6, RED_OAK_E_PA, secondMomentRectangleM4(0.03, 0.004));
    expect(k2 / k1).toBeCloseTo(beamStiffnessScale({ width: 1.5, thickness: 0.8, span: 1.5 }), 12);
  });
});

describe("weight from mass, and the OpenStax Hooke's-law worked example", () => {
  it("g is 9.81 N/kg and weight = m·g", () => {
    expect(G_N_PER_KG).toBe(9.81);
    expect(weightN(0.5)).toBeCloseTo(4.905, 12);
  });

  // Source: OpenStax, College Physics, §16.1 "Hooke's Law: Stress and Strain Revisited", Example
  // "How stiff are car springs?" (cited from memory): an 80.0 kg person makes a car settle
  // 1.20 cm; k = 6.53 × 10⁴ N/m. The book takes g = 9.80 m/s².
  it("reproduces k = 6.53 × 10⁴ N/m with the book's g = 9.80 m/s²", () => {
    const kNPerCm = stiffnessNPerCm(weightN(80.0, 9.8), 1.2) as number;
    const kNPerM = kNPerCm * 100;
    expect(Number(kNPerM.toPrecision(3))).toBe(6.53e4);
  });

  it("with Bendwise's g = 9.81 N/kg the same example gives 6.54 × 10⁴ N/m (exercises must use one g)", () => {
    const kNPerM = (stiffnessNPerCm(weightN(80.0), 1.2) as number) * 100;
    expect(Number(kNPerM.toPrecision(3))).toBe(6.54e4);
  });
});

describe("reading uncertainty carried into stiffness", () => {
  it("one reading: resolution/(2√3) (GUM, JCGM 100:2008 §F.2.2.1); a deformation: √2 times that", () => {
    expect(readingUncertaintyCm(0.1)).toBeCloseTo(0.1 / Math.sqrt(12), 15);
    // √2 · r/(2√3) = r/√6
    expect(deformationUncertaintyCm(readingUncertaintyCm(0.1))).toBeCloseTo(0.1 / Math.sqrt(6), 15);
  });

  it("relative uncertainties add in quadrature (GUM §5.1.6): 3 % and 4 % make 5 %", () => {
    const r = stiffnessWithUncertainty(10, 0.3, 2, 0.08);
    expect(r?.stiffnessNPerCm).toBe(5);
    expect(r?.relativeUncertainty).toBeCloseTo(0.05, 15);
    expect(r?.uncertaintyNPerCm).toBeCloseTo(0.25, 14);
    expect(stiffnessWithUncertainty(10, 0.3, 0, 0.08)).toBeNull();
  });
});

describe("design check (SI units)", () => {
  // Wood Handbook northern red oak E = 12.5 GPa again (from memory); strip 2.0 cm × 0.50 cm, span 40 cm.
  // One strip: k = 48·E·I/L³ = 125/0.064 = 1953.125 N/m.
  const base: DesignCheckInput = {
    youngsModulusPa: 12.5e9,
    stripWidthM: 0.02,
    stripThicknessM: 0.005,
    spanM: 0.4,
    stripCount: 1,
    arrangement: "side-by-side",
    loadN: 10,
    deflectionLimitM: 0.005,
    safetyFactor: 1.5,
  };

  it("one strip fails: 15 N factored load deflects 7.68 mm, over a 5 mm limit", () => {
    const r = designCheck(base);
    expect(r.factoredLoadN).toBe(15);
    expect(r.deflectionAtFactoredLoadM).toBeCloseTo(15 / 1953.125, 15);
    expect(r.deflectionAtFactoredLoadM).toBeCloseTo(7.68e-3, 15);
    expect(r.passes).toBe(false);
    expect(r.marginM).toBeCloseTo(0.005 - 0.00768, 15);
  });

  it("two strips side by side halve it (3.84 mm, passes); glued, an eighth (0.96 mm)", () => {
    const side = designCheck({ ...base, stripCount: 2 });
    expect(side.deflectionAtFactoredLoadM).toBeCloseTo(3.84e-3, 15);
    expect(side.passes).toBe(true);
    const glued = designCheck({ ...base, stripCount: 2, arrangement: "glued-stack" });
    expect(glued.deflectionAtFactoredLoadM).toBeCloseTo(0.96e-3, 15);
    expect(glued.stiffnessNPerM).toBeCloseTo(8 * 1953.125, 9);
  });

  it("bad input is reported, never thrown", () => {
    const r = designCheck({ ...base, youngsModulusPa: -1, stripCount: 1.5, safetyFactor: 0.5 });
    expect(r.passes).toBe(false);
    expect(r.problems).toHaveLength(3);
    expect(r.deflectionAtFactoredLoadM).toBeNull();
  });
});

describe("analyseReadings (the POST /api/analysis answer)", () => {
  /** Every number in the answer is finite: no NaN, no Infinity (JSON would turn them into null). */
  function expectAllFinite(result: AnalysisResult): void {
    const walk = (v: unknown): void => {
      if (typeof v === "number") expect(Number.isFinite(v)).toBe(true);
      else if (Array.isArray(v)) v.forEach(walk);
      else if (v && typeof v === "object") Object.values(v).forEach(walk);
    };
    walk(result);
    expect(JSON.parse(JSON.stringify(result))).toEqual(result);
  }

  it("a full bend series from readings (invented): deformations, stiffnesses, fits, elastic limit, breaking load", () => {
    const result = analyseReadings({
      mode: "bend",
      unloadedCm: 30.0,
      resolutionCm: 0.1,
      points: [
        { forceN: 0, readingCm: 30.0 },
        { forceN: 1, readingCm: 29.5, returnReadingCm: 30.0 },
        { forceN: 2, readingCm: 29.0, returnReadingCm: 30.0 },
        { forceN: 3, readingCm: 28.5, returnReadingCm: 29.9 },
        { forceN: 4, readingCm: 27.8, returnReadingCm: 29.7 },
        { forceN: 5, readingCm: 26.0, broke: true },
      ],
    });
    expect(result.points.map((p) => p.deformationCm)).toEqual([0, 0.5, 1, 1.5, 2.2, 4]);
    expect(result.points.map((p) => p.stiffnessNPerCm)).toEqual([null, 2, 2, 2, 4 / 2.2, 5 / 4]);
    expect(result.points.map((p) => p.permanentSetCm)).toEqual([null, 0, 0, 0.1, 0.3, null]);
    expect(result.elasticLimitN).toBe(3);
    expect(result.breakingLoadN).toBe(5);
    // The broke point is left out: the fit equals a fit of the first five points alone.
    const firstFive = result.points.slice(0, 5).map((p) => ({ forceN: p.forceN, deformationCm: p.deformationCm as number }));
    expect(result.fit.throughOrigin.slope).toBe(fitThroughOrigin(firstFive).slope);
    expect(result.fit.withIntercept.intercept).toBe(fitWithIntercept(firstFive).intercept);
    expect(result.notes.join(" ")).toMatch(/broke at 5 N/);
    expect(result.notes.join(" ")).toMatch(/permanent set of 0\.3 cm/);
    expectAllFinite(result);
  });

  it("stretch mode: loaded − unloaded", () => {
    const result = analyseReadings({
      mode: "stretch",
      unloadedCm: 10.0,
      resolutionCm: 0.1,
      points: [
        { forceN: 1, readingCm: 10.4 },
        { forceN: 2, readingCm: 10.8 },
        { forceN: 3, readingCm: 11.2 },
      ],
    });
    expect(result.points.map((p) => p.deformationCm)).toEqual([0.4, 0.8, 1.2]);
    expect(result.fit.throughOrigin.slope).toBeCloseTo(2.5, 12);
    expect(result.proportional).toBe(true);
  });

  it("all deformations zero: nulls and a note, no NaN, no throw", () => {
    const result = analyseReadings({
      mode: "bend",
      resolutionCm: 0.1,
      points: [
        { forceN: 1, deformationCm: 0 },
        { forceN: 2, deformationCm: 0 },
      ],
    });
    expect(result.fit.throughOrigin).toEqual({ slope: null, slopeSE: null, residualSD: null, r2: null });
    expect(result.fit.withIntercept.slope).toBeNull();
    expect(result.proportional).toBe(false);
    expect(result.notes.join(" ")).toMatch(/Every deformation is 0/);
    expectAllFinite(result);
  });

  it("fewer than two unbroken points: no line, a note", () => {
    const result = analyseReadings({
      mode: "bend",
      resolutionCm: 0.1,
      points: [
        { forceN: 1, deformationCm: 0.5 },
        { forceN: 2, deformationCm: 3, broke: true },
      ],
    });
    // One point is not a series: both fits are all null (fitThroughOrigin alone would give 2 N/cm).
    expect(result.fit.throughOrigin).toEqual({ slope: null, slopeSE: null, residualSD: null, r2: null });
    expect(Object.values(result.fit.withIntercept).every((v) => v === null)).toBe(true);
    expect(result.breakingLoadN).toBe(2);
    expect(result.notes.join(" ")).toMatch(/Fewer than two unbroken points/);
    expectAllFinite(result);
  });

  it("two points: the free line exists but its standard errors are null, and a note says why", () => {
    const result = analyseReadings({
      mode: "bend",
      resolutionCm: 0.1,
      points: [
        { forceN: 1, deformationCm: 0.5 },
        { forceN: 2, deformationCm: 1.0 },
      ],
    });
    expect(result.fit.withIntercept.slope).toBeCloseTo(2, 12);
    expect(result.fit.withIntercept.slopeSE).toBeNull();
    expect(result.fit.withIntercept.interceptSE).toBeNull();
    expect(result.fit.withIntercept.residualSD).toBeNull();
    expect(result.notes.join(" ")).toMatch(/at least three are needed/);
    expectAllFinite(result);
  });

  it("a reading and a disagreeing deformation: the reading wins, a note flags it", () => {
    const result = analyseReadings({
      mode: "bend",
      unloadedCm: 20,
      resolutionCm: 0.1,
      points: [
        { forceN: 1, readingCm: 19.5, deformationCm: 0.9 },
        { forceN: 2, readingCm: 19.0, deformationCm: 1.0 },
      ],
    });
    expect(result.points.map((p) => p.deformationCm)).toEqual([0.5, 1]);
    expect(result.notes.filter((n) => n.includes("does not match"))).toHaveLength(1);
  });

  it("readings without an unloaded reading (should not pass validation): null deformations and a note, no throw", () => {
    const result = analyseReadings({
      mode: "bend",
      resolutionCm: 0.1,
      points: [
        { forceN: 1, readingCm: 19.5 },
        { forceN: 2, readingCm: 19.0 },
      ],
    });
    expect(result.points.every((p) => p.deformationCm === null)).toBe(true);
    expect(result.notes.join(" ")).toMatch(/no unloaded reading/);
    expectAllFinite(result);
  });
});

describe("formatForStudent (NIST SP 811 §7.2: a space between number and unit)", () => {
  it("writes three significant figures, a space, and powers of ten a student can read", () => {
    expect(formatForStudent(2.04567, "N/cm")).toBe("2.05 N/cm");
    expect(formatForStudent(65333, "N/m")).toBe("6.53 × 10^4 N/m");
    expect(formatForStudent(2)).toBe("2.00");
    expect(formatForStudent(Number.NaN, "N")).toBe("—");
  });
});

describe("readings no lab can give (invented readings)", () => {
  it("names a negative force, a force beyond a classroom scale, a reading beyond any ruler, and a load that moved the piece the wrong way", () => {
    const problems = implausibleReadings({
      mode: "bend",
      unloadedCm: 24,
      resolutionCm: 0.1,
      points: [
        { forceN: 1, readingCm: 23.7 },
        { forceN: 2, readingCm: 30 },
        { forceN: 3, readingCm: 1e5 },
        { forceN: -2, readingCm: 23.2 },
        { forceN: 500, readingCm: 22.9 },
        { forceN: 0.5, readingCm: 24.1 },
      ],
    });
    expect(problems.map((p) => [p.point, p.field])).toEqual([[1, "readingCm"], [2, "readingCm"], [3, "forceN"], [4, "forceN"]]);
    expect(problems[0].problem).toMatch(/loaded reading 30.0 cm is above the unloaded reading 24.0 cm, but a bending piece moves down/);
    expect(problems[1].problem).toMatch(/100000 cm is more than any ruler/);
    expect(problems[2].problem).toMatch(/cannot be below 0 N/);
    expect(problems[3].problem).toMatch(/500 N is more than a classroom spring scale reads/);
  });

  it("allows one ruler mark the wrong way (reading error), and a stretched band getting longer", () => {
    expect(implausibleReadings({ mode: "bend", unloadedCm: 24, resolutionCm: 0.1, points: [{ forceN: 0.5, readingCm: 24.1 }] })).toEqual([]);
    expect(implausibleReadings({ mode: "stretch", unloadedCm: 10, resolutionCm: 0.1, points: [{ forceN: 2, readingCm: 12.5 }] })).toEqual([]);
    expect(implausibleReadings({ mode: "stretch", unloadedCm: 10, resolutionCm: 0.1, points: [{ forceN: 2, readingCm: 8 }] })[0].problem).toMatch(
      /shorter than the unloaded length 10.0 cm, but a stretched piece gets longer/,
    );
    expect(implausibleReadings({ mode: "bend", unloadedCm: 5000, resolutionCm: 0.1, points: [{ forceN: 2, readingCm: 20 }] })).toEqual([
      { point: null, field: "unloadedCm", problem: expect.stringMatching(/^the unloaded reading 5000 cm is more than any ruler/) },
    ]);
  });
});

describe("rounding residue and precision shown to students", () => {
  // Invented readings exactly on F = 2.5 N/cm × deformation (hand-worked: 0.4 cm per newton).
  const perfect = {
    mode: "bend" as const,
    unloadedCm: 25.0,
    resolutionCm: 0.1,
    points: [
      { forceN: 0, readingCm: 25.0 },
      { forceN: 1, readingCm: 24.6 },
      { forceN: 2, readingCm: 24.2 },
      { forceN: 3, readingCm: 23.8 },
    ],
  };

  it("readings on a perfect line: intercept and every standard error exactly 0, R² exactly 1", () => {
    const result = analyseReadings(perfect);
    expect(result.fit.throughOrigin.slope).toBeCloseTo(2.5, 12);
    expect(result.fit.throughOrigin.slopeSE).toBe(0);
    expect(result.fit.throughOrigin.r2).toBe(1);
    expect(result.fit.withIntercept.intercept).toBe(0);
    expect(result.fit.withIntercept.interceptSE).toBe(0);
    expect(result.fit.withIntercept.slopeSE).toBe(0);
    expect(result.notes.join(" ")).toMatch(/meets zero deformation at 0\.00 N\./);
    expect(result.notes.join(" ")).not.toMatch(/10\^-1/);
  });

  it("weights of 100 g masses on a perfect line (the lesson table): intercept 0, not 4.44 × 10^-16", () => {
    // Invented: 0.98 N per 100 g (g = 9.81 N/kg, rounded as a student would), 0.2 cm each.
    const result = analyseReadings({
      mode: "bend",
      unloadedCm: 20.0,
      resolutionCm: 0.1,
      points: [0.98, 1.96, 2.94, 3.92].map((f, i) => ({ forceN: f, readingCm: [19.8, 19.6, 19.4, 19.2][i] })),
    });
    expect(result.fit.withIntercept.intercept).toBe(0);
    expect(formatForStudent(result.fit.withIntercept.intercept!)).toBe("0.00");
  });

  it("real scatter is kept: an intercept of a few hundredths of a newton is not snapped", () => {
    // hand-worked three-point example above: intercept 1/3
    const f = fitWithIntercept([
      { deformationCm: 1, forceN: 2 },
      { deformationCm: 2, forceN: 3 },
      { deformationCm: 3, forceN: 5 },
    ]);
    expect(f.intercept).toBeCloseTo(1 / 3, 12);
    expect(f.interceptSE).toBeGreaterThan(0);
  });

  it("formatWithUncertainty: the error to 2 significant figures, the value to its decimal place; an error of 0 stays short", () => {
    // JCGM 100:2008 (GUM) §7.2.6: an uncertainty is quoted to at most two significant digits.
    expect(formatWithUncertainty(0.03448, 0.04712, "N")).toBe("0.034 N (± 0.047)");
    expect(formatWithUncertainty(2.4987, 0.0213, "N/cm")).toBe("2.499 N/cm (± 0.021)");
    expect(formatWithUncertainty(2.5, 0, "N/cm")).toBe("2.50 N/cm (± 0.00)");
    expect(formatWithUncertainty(0, 0, "N")).toBe("0.00 N (± 0.00)");
    expect(formatWithUncertainty(-0.0004, 0.013, "N")).toBe("0.000 N (± 0.013)");
    expect(formatWithUncertainty(2.5, null, "N/cm")).toBe("2.50 N/cm (± —)");
    expect(formatWithUncertainty(null, null, "N")).toBe("—");
  });

  it("the notes give a fitted slope and intercept to the same places as the table beside them (formatFitted)", () => {
    expect(formatFitted(0.03448, 0.04712, "N")).toBe("0.034 N");
    expect(formatFitted(2.5, null, "N/cm")).toBe("2.50 N/cm");
    // Invented readings with scatter: the notes' numbers are the table's, without the "± …".
    const result = analyseReadings({
      mode: "bend",
      unloadedCm: 20,
      resolutionCm: 0.1,
      points: [1, 2, 3, 4, 5].map((forceN, i) => ({ forceN, readingCm: [19.6, 19.1, 18.8, 18.3, 17.9][i] })),
    });
    const { throughOrigin: origin, withIntercept: free } = result.fit;
    const notes = result.notes.join(" ");
    expect(notes).toContain(`Stiffness from the line through the origin: ${formatFitted(origin.slope, origin.slopeSE, "N/cm")}.`);
    expect(notes).toContain(`has slope ${formatFitted(free.slope, free.slopeSE, "N/cm")} and meets zero deformation at ${formatFitted(free.intercept, free.interceptSE, "N")}.`);
    expect(formatWithUncertainty(free.intercept, free.interceptSE, "N").startsWith(formatFitted(free.intercept, free.interceptSE, "N") + " (± ")).toBe(true);
  });

  it("formatToResolution: readings keep the ruler's decimals (lesson 1: 18.0 cm, not 18 cm)", () => {
    // Common practice, no source: a reading is written to the smallest step it was read to.
    expect(formatToResolution(38, 0.1)).toBe("38.0");
    expect(formatToResolution(2, 0.1)).toBe("2.0");
    expect(formatToResolution(0, 0.1)).toBe("0.0");
    expect(formatToResolution(-0, 0.1)).toBe("0.0");
    expect(formatToResolution(19.55, 0.1)).toBe("19.55");
    expect(formatToResolution(20, 1)).toBe("20");
    expect(formatToResolution(19.5, 0.25)).toBe("19.50");
    expect(formatToResolution(0.30000000000000004, 0.1)).toBe("0.3");
  });
});

describe("elastic limit not reached (invented readings)", () => {
  it("came back after every load: the largest load, flagged as not reached", () => {
    const r = elasticLimit([{ forceN: 1, permanentSetCm: 0 }, { forceN: 2, permanentSetCm: 0.1 }, { forceN: 3, permanentSetCm: 0 }], 0.1);
    expect(r).toEqual({ elasticLimitN: 3, firstPermanentSetAtN: null, firstPermanentSetCm: null, limitReached: false });
  });

  it("a break counts as going past the limit", () => {
    expect(elasticLimit([{ forceN: 1, permanentSetCm: 0 }, { forceN: 2, permanentSetCm: null, broke: true }], 0.1).limitReached).toBe(true);
  });

  it("analyseReadings says the limit was not reached and is at least the largest load", () => {
    const result = analyseReadings({
      mode: "bend",
      unloadedCm: 20.0,
      resolutionCm: 0.1,
      points: [0.98, 1.96, 2.94, 3.92].map((f, i) => ({ forceN: f, readingCm: [19.8, 19.6, 19.4, 19.2][i], returnReadingCm: [20.0, 20.0, 19.9, 20.0][i] })),
    });
    expect(result.elasticLimitN).toBe(3.92);
    expect(result.elasticLimitReached).toBe(false);
    expect(result.notes.join(" ")).toMatch(/elastic limit was not reached: it is at least 3\.92 N/);
  });

  it("with a permanent set the limit was reached", () => {
    const result = analyseReadings({
      mode: "bend",
      unloadedCm: 20.0,
      resolutionCm: 0.1,
      points: [
        { forceN: 1, readingCm: 19.6, returnReadingCm: 20 },
        { forceN: 2, readingCm: 19.2, returnReadingCm: 19.7 },
      ],
    });
    expect(result.elasticLimitN).toBe(1);
    expect(result.elasticLimitReached).toBe(true);
  });
});

describe("one force throughout (invented readings: the spring scale read 3 N each time)", () => {
  const sameForce = {
    mode: "bend" as const,
    unloadedCm: 25.0,
    resolutionCm: 0.1,
    points: [24.0, 23.9, 24.1].map((r) => ({ forceN: 3, readingCm: r })),
  };

  it("analyseReadings fits no line and says why, instead of a stiffness and 'the graph curves'", () => {
    const result = analyseReadings(sameForce);
    expect(result.fit.throughOrigin.slope).toBeNull();
    expect(result.fit.withIntercept.slope).toBeNull();
    expect(result.proportional).toBe(false);
    const notes = result.notes.join(" ");
    expect(notes).toMatch(/Every reading has the same force/);
    expect(notes).not.toMatch(/Stiffness from the line|graph curves/);
  });

  it("proportionalityVerdict: no increase, in words", () => {
    const v = proportionalityVerdict([1, 1.1, 0.9].map((d) => ({ forceN: 3, deformationCm: d })), 0.1);
    expect(v.kind).toBe("no-increase");
    expect(v.reason).toMatch(/same force/);
  });
});
