// Exercise generators for lesson 8 (design challenge: a bridge of strips). Numbers come from each
// student's seed; the expected answers and worked solutions stay on the server. Masses, stiffnesses
// and breaking loads are invented, in the ranges thin basswood strips give; the Young's modulus in the
// beam-formula check is a typical value.
import type { LessonExercises } from "~/lib/exercises";
import {
  designCheck,
  formatForStudent,
  gluedStackStiffness,
  sideBySideStiffness,
  weightN,
} from "~/lib/science";

const fmt = (value: number, sig = 3) => formatForStudent(value, "", sig);
/** A given value written as given: 1.5, 20, 0.25. */
const given = (value: number) => String(Number(value.toPrecision(6)));
const VEHICLES = ["toy truck", "toy bus", "model tractor", "toy fire engine", "wooden toy train"];

export const lesson: LessonExercises = {
  writtenAnswers: ["cer-design"],
  exercises: [
    {
      id: "design-load",
      kind: "number",
      title: "Design load from a mass and a safety factor",
      generate(random) {
        const vehicle = random.pick(VEHICLES);
        const massG = random.uniformStep(150, 500, 10);
        const factor = random.pick([1.5, 2, 2.5, 3]);
        const weight = weightN(massG / 1000);
        const design = weight * factor;
        return {
          prompt: `A ${vehicle} has a mass of ${massG} g. The bridge it crosses is designed with a safety factor of ${factor}.\nWhat is the design load (the weight times the safety factor)? Use g = 9.81 N/kg and give a unit.`,
          hint: "Mass in kg (÷ 1000), then weight = mass × 9.81 N/kg, then multiply by the safety factor.",
          expected: {
            value: design,
            unit: "N",
            tolerance: { relative: 0.02 },
            knownWrongAnswers: [
              {
                code: "forgot-safety-factor",
                value: weight,
                unit: "N",
                hint: "That is the weight alone. The design load is the weight times the safety factor.",
              },
              {
                code: "mass-times-factor",
                value: (massG / 1000) * factor,
                unit: "N",
                hint: "The mass was multiplied by the safety factor, but a mass is not a force. Find the weight first: mass in kg × 9.81 N/kg.",
              },
            ],
          },
          solution: `Weight = ${given(massG / 1000)} kg × 9.81 N/kg = ${fmt(weight)} N. Design load = ${fmt(weight)} N × ${factor} = ${fmt(design)} N.`,
        };
      },
    },
    {
      id: "stiffness-needed",
      kind: "number",
      title: "Stiffness a design needs",
      generate(random) {
        const designLoad = random.uniformStep(3, 10, 0.1);
        const limit = random.pick([0.5, 0.8, 1, 1.2, 1.5, 2]);
        const needed = designLoad / limit;
        return {
          prompt: `A shelf of strips must sag less than ${given(limit)} cm under a design load of ${designLoad.toFixed(1)} N at its middle.\nWhat is the smallest stiffness it may have, in N/cm?`,
          hint: "Stiffness = force ÷ deformation: the design load divided by the largest sag allowed.",
          expected: {
            value: needed,
            unit: "N/cm",
            tolerance: { relative: 0.02 },
            context: { forceN: designLoad, deformationCm: limit },
          },
          solution: `k needed = ${designLoad.toFixed(1)} N ÷ ${given(limit)} cm = ${fmt(needed)} N/cm.`,
        };
      },
    },
    {
      id: "loose-strips-needed",
      kind: "choice",
      title: "Fewest loose strips that pass",
      generate(random) {
        const k = random.uniformStep(1.2, 3, 0.1);
        const count = random.integer(2, 6);
        // A design load that count − 1 strips cannot carry within the limit but count strips can.
        const limit = random.pick([0.5, 1, 1.5]);
        const fraction = random.uniformStep(0.2, 0.8, 0.1);
        const designLoad = Number((k * (count - 1 + fraction) * limit).toFixed(1));
        const needed = designLoad / limit;
        const answer = Math.ceil(needed / k - 1e-9);
        return {
          prompt: `One strip has a stiffness of ${k.toFixed(1)} N/cm on the bridge's span. The bridge must sag less than ${given(limit)} cm under a design load of ${designLoad.toFixed(1)} N.\nWhat is the smallest number of these strips, laid loose side by side, that meets the limit?`,
          hint: "Find the stiffness needed (design load ÷ sag limit), then the smallest n for which n × k reaches it.",
          choices: [1, 2, 3, 4, 5, 6, 7, 8].map((c) => ({ value: String(c), label: `${c} strip${c === 1 ? "" : "s"}` })),
          correctChoice: String(answer),
          solution: `Stiffness needed = ${designLoad.toFixed(1)} N ÷ ${given(limit)} cm = ${fmt(needed)} N/cm. ${answer - 1} strip${answer - 1 === 1 ? "" : "s"}: ${fmt(sideBySideStiffness(k, answer - 1))} N/cm, not enough. ${answer} strips: ${fmt(sideBySideStiffness(k, answer))} N/cm, enough. So ${answer} strips.`,
        };
      },
    },
    {
      id: "sag-table",
      kind: "table",
      title: "Sag of three designs",
      generate(random) {
        const k = random.uniformStep(2, 3.5, 0.1);
        const designLoad = random.uniformStep(3, 6, 0.5);
        const n = random.pick([2, 3]);
        const designs = [
          { label: "1 strip", k },
          { label: `${n} strips loose, side by side`, k: sideBySideStiffness(k, n) },
          { label: `${n} strips glued into one stack`, k: gluedStackStiffness(k, n) },
        ];
        const sags = designs.map((d) => designLoad / d.k);
        return {
          prompt: `One strip has a stiffness of ${k.toFixed(1)} N/cm. Fill in how far each design sags under the design load of ${given(designLoad)} N, with units.`,
          hint: "First each design's stiffness: k, n × k loose, n³ × k glued. Then sag = design load ÷ stiffness.",
          table: {
            columns: ["Design", "Stiffness rule", "Sag under the design load"],
            rows: [
              [designs[0].label, "k", null],
              [designs[1].label, `${n} × k`, null],
              [designs[2].label, `${n}³ × k`, null],
            ],
          },
          cells: sags.map((sag, i) => ({
            value: sag,
            unit: "cm",
            tolerance: { relative: 0.02 },
            context: { forceN: designLoad },
            knownWrongAnswers: [
              {
                code: "multiplied-not-divided",
                value: designLoad * designs[i].k,
                unit: "cm",
                hint: "It looks like the load was multiplied by the stiffness. Sag = load ÷ stiffness.",
              },
            ],
          })),
          solution: designs
            .map((d, i) => `${d.label}: k = ${fmt(d.k)} N/cm, sag = ${given(designLoad)} N ÷ ${fmt(d.k)} N/cm = ${fmt(sags[i])} cm`)
            .join("\n"),
        };
      },
    },
    {
      id: "bundle-safety-factor",
      kind: "ratio",
      title: "Safety factor of a bundle",
      generate(random) {
        const vehicle = random.pick(VEHICLES);
        const oneBreaks = random.uniformStep(4, 8, 0.5);
        const n = random.integer(2, 5);
        const massG = random.uniformStep(200, 600, 10);
        const weight = weightN(massG / 1000);
        const factor = (n * oneBreaks) / weight;
        return {
          prompt: `One strip breaks at ${given(oneBreaks)} N. A bridge of ${n} strips laid loose side by side carries a ${vehicle} of mass ${massG} g.\nEstimating that the loose strips break together at ${n} times one strip's breaking load, what safety factor does the bridge have? Give a plain number.`,
          hint: "Breaking load of the bundle ≈ n × one strip's. The truck's weight = mass in kg × 9.81 N/kg. Safety factor = breaking load ÷ weight.",
          expected: {
            value: factor,
            unit: "",
            tolerance: { relative: 0.02 },
            knownWrongAnswers: [
              {
                code: "mass-not-weight",
                value: (n * oneBreaks) / (massG / 1000),
                unit: "",
                hint: "The breaking load was divided by a mass. Divide by the weight in newtons: mass in kg × 9.81 N/kg.",
              },
              {
                code: "one-strip-only",
                value: oneBreaks / weight,
                unit: "",
                hint: "That uses one strip's breaking load. The bundle of loose strips breaks at about n times that.",
              },
            ],
          },
          solution: `Bundle breaks at about ${n} × ${given(oneBreaks)} N = ${given(n * oneBreaks)} N. Weight = ${given(massG / 1000)} kg × 9.81 N/kg = ${fmt(weight)} N. Safety factor = ${given(n * oneBreaks)} N ÷ ${fmt(weight)} N = ${fmt(factor)}.`,
        };
      },
    },
    {
      id: "heaviest-truck",
      kind: "number",
      title: "Heaviest load a design allows",
      generate(random) {
        const k = random.uniformStep(4, 20, 0.5);
        const limit = random.pick([0.5, 0.8, 1, 1.5]);
        const factor = random.pick([1.5, 2, 2.5, 3]);
        const heaviest = (k * limit) / factor;
        return {
          prompt: `A finished bridge has a stiffness of ${given(k)} N/cm. It must sag less than ${given(limit)} cm with a safety factor of ${factor} on the load.\nWhat is the heaviest vehicle weight it may carry? Give a unit.`,
          hint: "The largest design load = stiffness × sag limit. The vehicle's weight times the safety factor must not exceed it.",
          expected: {
            value: heaviest,
            unit: "N",
            tolerance: { relative: 0.02 },
            knownWrongAnswers: [
              {
                code: "forgot-safety-factor",
                value: k * limit,
                unit: "N",
                hint: "That is the largest design load. The vehicle's weight is the design load divided by the safety factor.",
              },
              {
                code: "multiplied-by-factor",
                value: k * limit * factor,
                unit: "N",
                hint: "The safety factor makes the allowed weight smaller, not bigger: divide by it.",
              },
            ],
          },
          solution: `Largest design load = ${given(k)} N/cm × ${given(limit)} cm = ${fmt(k * limit)} N. Heaviest weight = ${fmt(k * limit)} N ÷ ${factor} = ${fmt(heaviest)} N.`,
        };
      },
    },
    {
      id: "beam-formula-check",
      kind: "number",
      title: "Checking a design with the beam formula",
      generate(random) {
        // A design whose sag at the design load is between 2 and 30 mm and whose bending stress stays
        // below 35 MPa (our own cautious cap for basswood, common practice, no source), so it is one a
        // class could really build and test.
        let n = 2;
        let glued = true;
        let widthMm = 10;
        let thicknessMm = 2;
        let spanCm = 25;
        let loadN = 3;
        let factor = 2;
        for (let attempt = 0; attempt < 60; attempt++) {
          n = random.integer(2, 4);
          glued = random.next() < 0.5;
          widthMm = random.pick([10, 12, 15]);
          thicknessMm = random.pick([1.5, 2]);
          spanCm = random.pick([25, 30]);
          loadN = random.uniformStep(2, 5, 0.5);
          factor = random.pick([1.5, 2]);
          const f = loadN * factor;
          const l = spanCm / 100;
          const b = widthMm / 1000;
          const h = thicknessMm / 1000;
          const stressMpa = glued ? (3 * f * l) / (2 * b * (n * h) ** 2) / 1e6 : (3 * (f / n) * l) / (2 * b * h ** 2) / 1e6;
          const i = glued ? (b * (n * h) ** 3) / 12 : (n * b * h ** 3) / 12;
          const sagMm = ((f * l ** 3) / (48 * 10e9 * i)) * 1000;
          // (and a sag that does not happen to equal the width, which is in the prompt)
          if (stressMpa <= 35 && sagMm >= 2 && sagMm <= 30 && Math.abs(sagMm - widthMm) > 0.5) break;
          if (attempt === 59) {
            n = 3;
            glued = true;
            widthMm = 10;
            thicknessMm = 2;
            spanCm = 25;
            loadN = 3;
            factor = 2;
          }
        }
        const gpa = 10;
        const result = designCheck({
          youngsModulusPa: gpa * 1e9,
          stripWidthM: widthMm / 1000,
          stripThicknessM: thicknessMm / 1000,
          spanM: spanCm / 100,
          stripCount: n,
          arrangement: glued ? "glued-stack" : "side-by-side",
          loadN,
          deflectionLimitM: 0.01,
          safetyFactor: factor,
        });
        const iM4 = result.secondMomentM4 ?? 1e-12;
        const sagM = result.deflectionAtFactoredLoadM ?? 0.001;
        const sagMm = sagM * 1000;
        const iRule = glued ? `b·(${n}h)³/12` : `${n}·b·h³/12`;
        return {
          prompt: `A bridge of ${n} basswood strips (typical Young's modulus ${gpa} GPa), each ${widthMm} mm wide and ${given(thicknessMm)} mm thick, ${glued ? "glued face to face into one stack" : "laid loose side by side"}, spans ${spanCm} cm. It carries ${given(loadN)} N at its middle, with a safety factor of ${factor}.\nUse δ = F·L³ / (48·E·I), with I = ${iRule} and F the design load, to find the sag at the middle, in mm.`,
          hint: "Design load F = load × safety factor. Work in SI (m, N, Pa): find I in m⁴, then δ in m, then change it to mm.",
          expected: { value: sagMm, unit: "mm", tolerance: { relative: 0.03 } },
          solution: `F = ${given(loadN)} N × ${factor} = ${fmt(loadN * factor)} N. I = ${iRule} = ${fmt(iM4)} m⁴.\nδ = ${fmt(loadN * factor)} N × (${given(spanCm / 100)} m)³ ÷ (48 × ${gpa} × 10^9 Pa × ${fmt(iM4)} m⁴) = ${fmt(sagM)} m = ${fmt(sagMm)} mm. ${
            result.passes ? "That is less than 10 mm (1.0 cm): the design passes." : `That is more than 10 mm (1.0 cm): the design fails; it needs ${glued ? "more strips in the stack" : "more strips, or gluing"}.`
          }`,
        };
      },
    },
  ],
};
