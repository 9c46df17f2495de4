// Exercise generators for lesson 3 (proportional or not). Numbers come from each student's seed;
// the expected answers and worked solutions stay on the server. Readings are invented, in the
// ranges a balsa or plastic strip on supports 15 cm apart gives.
import type { LessonExercises } from "~/lib/exercises";
import type { SeededRandom } from "~/lib/seeded-random";
import { fitThroughOrigin, formatForStudent, proportionalityVerdict, type ProportionalityKind } from "~/lib/science";

const cm1 = (value: number) => `${value.toFixed(1)} cm`;
const tenth = (value: number) => Number(value.toFixed(1));
const fmt = (value: number, sig = 3) => formatForStudent(value, "", sig);

/**
 * Three or four loads and their deformations (cm, to 0.1 cm), roughly proportional with a little
 * rounding scatter. The stiffness is chosen so every deformation lies between 0.5 and 4 cm, where a
 * scatter of one ruler step is small beside the reading.
 */
function nearlyProportional(random: SeededRandom, count: 3 | 4) {
  const forces = count === 3 ? random.pick([[2, 4, 6], [1, 3, 5], [2, 5, 8], [3, 6, 9]]) : random.pick([[1, 2, 3, 4], [2, 4, 6, 8], [1, 3, 5, 7]]);
  const lowest = Math.ceil((forces[forces.length - 1] / 4) * 10) / 10;
  const highest = Math.floor((forces[0] / 0.5) * 10) / 10;
  const k = random.uniformStep(lowest, Math.max(lowest, highest), 0.1);
  const deformations = forces.map((f) => Math.max(0.5, tenth(f / k + random.pick([-0.1, 0, 0, 0.1]))));
  return { k, forces, deformations };
}

export const lesson: LessonExercises = {
  writtenAnswers: ["cer-proportional"],
  exercises: [
    {
      id: "products-table",
      kind: "table",
      title: "Sums for the best line",
      generate(random) {
        const { forces, deformations } = nearlyProportional(random, 3);
        const products = forces.map((f, i) => f * deformations[i]);
        const squares = deformations.map((x) => x * x);
        return {
          prompt: `Three readings of a strip: ${forces.map((f, i) => `${f} N gives a deformation of ${cm1(deformations[i])}`).join("; ")}.\nFill in F × x (in N·cm) and x² (in cm²) for each reading, with units.`,
          hint: "F × x: multiply the force by the deformation. x²: multiply the deformation by itself. Keep the units: N × cm = N·cm, cm × cm = cm².",
          table: {
            columns: ["Force F", "Deformation x", "F × x", "x²"],
            rows: forces.map((f, i) => [`${f} N`, cm1(deformations[i]), null, null]),
          },
          cells: forces.flatMap((_, i) => [
            { value: products[i], unit: "N*cm", tolerance: { relative: 0.02 } },
            { value: squares[i], unit: "cm^2", tolerance: { relative: 0.02 } },
          ]),
          solution: forces
            .map((f, i) => `${f} N × ${cm1(deformations[i])} = ${fmt(products[i])} N·cm; (${cm1(deformations[i])})² = ${fmt(squares[i])} cm²`)
            .join("\n"),
        };
      },
    },
    {
      id: "slope-through-origin",
      kind: "number",
      title: "Stiffness from the best line through the origin",
      generate(random) {
        const { forces, deformations } = nearlyProportional(random, 4);
        const fit = fitThroughOrigin(forces.map((f, i) => ({ forceN: f, deformationCm: deformations[i] })));
        const sumFx = forces.reduce((s, f, i) => s + f * deformations[i], 0);
        const sumXx = deformations.reduce((s, x) => s + x * x, 0);
        const k = fit.slope ?? sumFx / sumXx;
        return {
          prompt: `Four readings of a strip (force, deformation): ${forces.map((f, i) => `(${f} N, ${cm1(deformations[i])})`).join(", ")}.\nUse k = Σ(F × x) ÷ Σ(x²) to find the slope of the best line through the origin. Give a unit.`,
          hint: "Make two sums: add up force × deformation for every reading, and add up deformation² for every reading. Then divide the first sum by the second.",
          expected: {
            value: k,
            unit: "N/cm",
            tolerance: { relative: 0.02 },
            knownWrongAnswers: [
              {
                code: "sums-upside-down",
                value: sumXx / sumFx,
                unit: "N/cm",
                hint: "That is Σ(x²) ÷ Σ(F × x), the fraction turned upside down. Σ(F × x) goes on top.",
              },
            ],
          },
          solution: `Σ(F × x) = ${forces.map((f, i) => `${f} × ${deformations[i].toFixed(1)}`).join(" + ")} = ${fmt(sumFx)} N·cm.\nΣ(x²) = ${deformations.map((x) => `${x.toFixed(1)}²`).join(" + ")} = ${fmt(sumXx)} cm².\nk = ${fmt(sumFx)} N·cm ÷ ${fmt(sumXx)} cm² = ${fmt(k)} N/cm.`,
        };
      },
    },
    {
      id: "r-squared",
      kind: "ratio",
      title: "R² from the misses",
      generate(random) {
        const maxForce = random.pick([5, 6, 7, 8]);
        let sumF2 = 0;
        for (let f = 1; f <= maxForce; f++) sumF2 += f * f;
        const rss = random.uniformStep(0.1, 4, 0.05);
        const r2 = 1 - rss / sumF2;
        const forces = Array.from({ length: maxForce }, (_, i) => i + 1);
        return {
          prompt: `A strip was loaded with ${forces.join(", ")} N. The squared misses from the best line through the origin add up to RSS = ${rss.toFixed(2)} N², and the squared forces add up to ΣF² = ${sumF2} N².\nWhat is R²? Give it as a decimal to at least 3 decimal places (it has no unit).`,
          hint: "R² = 1 − RSS ÷ ΣF². Divide first, then take the result away from 1.",
          expected: {
            value: r2,
            unit: "",
            tolerance: { absolute: 0.0015 },
            knownWrongAnswers: [
              {
                code: "forgot-one-minus",
                value: rss / sumF2,
                unit: "",
                hint: "That is RSS ÷ ΣF², the part that the line misses. R² is 1 minus that.",
              },
            ],
          },
          solution: `R² = 1 − RSS ÷ ΣF² = 1 − ${rss.toFixed(2)} ÷ ${sumF2} = 1 − ${fmt(rss / sumF2)} = ${r2.toFixed(4)}.`,
        };
      },
    },
    {
      id: "predict-deformation",
      kind: "number",
      title: "Predicting from the best line",
      generate(random) {
        const k = random.uniformStep(1.2, 4.5, 0.1);
        const force = random.uniformStep(1.5, 8.5, 0.5);
        const x = force / k;
        return {
          prompt: `The best line through the origin for a strip has a slope of ${k.toFixed(1)} N/cm, and the readings were proportional.\nPredict the deformation under a force of ${force.toFixed(1)} N. Give a unit.`,
          hint: "The line is F = k × x. Turn it round: x = F ÷ k.",
          expected: {
            value: x,
            unit: "cm",
            tolerance: { relative: 0.02 },
            context: { forceN: force },
            knownWrongAnswers: [
              {
                code: "multiplied-not-divided",
                value: force * k,
                unit: "cm",
                hint: "It looks like the force was multiplied by the slope. Deformation = force ÷ stiffness.",
              },
            ],
          },
          solution: `x = F ÷ k = ${force.toFixed(1)} N ÷ ${k.toFixed(1)} N/cm = ${fmt(x)} cm.`,
        };
      },
    },
    {
      id: "zero-force-crossing",
      kind: "number",
      title: "Where a free line crosses zero force",
      generate(random) {
        const slope = random.uniformStep(1.5, 4, 0.1);
        const offset = random.uniformStep(0.3, 1.5, 0.1);
        const crossing = offset / slope;
        const plus = random.next() < 0.5;
        return {
          prompt: `A straight line drawn freely through a strip's readings (not forced through the origin) is F = ${slope.toFixed(1)} N/cm × x ${plus ? "+" : "−"} ${offset.toFixed(1)} N.\nAt what deformation x does this line give zero force? Give the size of the deformation with a unit.`,
          hint: `Set F = 0 and solve for x: ${slope.toFixed(1)} N/cm × x = ${offset.toFixed(1)} N (leaving out the sign).`,
          expected: {
            value: crossing,
            unit: "cm",
            tolerance: { relative: 0.02 },
            knownWrongAnswers: [
              {
                code: "multiplied-not-divided",
                value: offset * slope,
                unit: "cm",
                hint: "It looks like the two numbers were multiplied. Divide the force by the slope: N ÷ (N/cm) = cm.",
              },
              {
                code: "divided-wrong-way",
                value: slope / offset,
                unit: "cm",
                hint: "The division went the wrong way. x = force ÷ slope, which gives cm.",
              },
            ],
          },
          solution: `At F = 0: ${slope.toFixed(1)} N/cm × x = ${offset.toFixed(1)} N, so x = ${offset.toFixed(1)} N ÷ ${slope.toFixed(1)} N/cm = ${fmt(crossing)} cm (${plus ? "on the negative side of 0" : "on the positive side of 0"}).\n${crossing > 0.1 ? "That is more than one ruler step (0.1 cm) from the origin: the readings are linear, but not proportional." : "That is within one ruler step (0.1 cm) of the origin."}`,
        };
      },
    },
    {
      id: "doubling-ratio",
      kind: "ratio",
      title: "Does double the force give double the deformation?",
      generate(random) {
        const lowForce = random.integer(2, 4);
        const proportional = random.next() < 0.5;
        // Either a proportional strip, or one whose readings carry a fixed offset (a slack loop, an
        // unzeroed scale): then the deformation at double the force falls short of double by the offset.
        const extra = proportional ? 0 : random.uniformStep(0.3, 0.8, 0.1);
        const low = random.uniformStep(0.8, 2, 0.1) + extra;
        const high = tenth(2 * low - extra);
        const lowText = cm1(low);
        const ratio = high / tenth(low);
        return {
          prompt: `At ${lowForce} N a strip's deformation is ${lowText}. At ${2 * lowForce} N it is ${cm1(high)}.\nHow many times as large is the deformation at ${2 * lowForce} N as at ${lowForce} N? Give a plain number.`,
          hint: "Divide the larger deformation by the smaller one. For a proportional strip the answer would be 2.",
          expected: { value: ratio, unit: "", tolerance: { relative: 0.02 } },
          solution: `${cm1(high)} ÷ ${lowText} = ${fmt(ratio)}. The force doubled; ${
            proportional
              ? "the deformation doubled too, as for a proportional strip."
              : `double ${lowText} would be ${cm1(2 * low)}, but the reading is ${cm1(high)}: the deformation did not double, so these readings are not proportional.`
          }`,
        };
      },
    },
    {
      id: "linear-or-proportional",
      kind: "choice",
      title: "Proportional, linear or curved?",
      generate(random) {
        const intended = random.pick(["proportional", "linear-not-proportional", "not-linear"] as const);
        const k = random.uniformStep(1.5, 3, 0.5);
        const forces = [1, 2, 3, 4, 5, 6];
        const offset = random.uniformStep(0.4, 0.7, 0.1);
        const bend = random.uniformStep(0.012, 0.02, 0.002);
        const deformations = forces.map((f) => {
          if (intended === "proportional") return tenth(f / k);
          if (intended === "linear-not-proportional") return tenth(offset + f / k);
          return tenth((f / k) * (1 + bend * f * f));
        });
        const verdict = proportionalityVerdict(
          forces.map((f, i) => ({ forceN: f, deformationCm: deformations[i] })),
          0.1,
        );
        const labels: Record<string, string> = {
          proportional: "Proportional: a straight line through the origin fits",
          "linear-not-proportional": "Linear but not proportional: a straight line fits, but it misses the origin",
          "not-linear": "Not linear: the points curve away from any straight line",
        };
        const correct: ProportionalityKind = verdict.kind;
        return {
          prompt: `A strip was loaded 1 N at a time, and its deformations were read to 0.1 cm: ${forces.map((f, i) => `${f} N: ${cm1(deformations[i])}`).join(", ")}.\nWhich describes these readings best? (Sketch the points, or compare how much the deformation grows for each extra newton.)`,
          hint: "Work out how much the deformation grows from one newton to the next. Steady growth means a straight line; then check where that line would be at 0 N.",
          choices: [
            { value: "proportional", label: labels.proportional },
            { value: "linear-not-proportional", label: labels["linear-not-proportional"] },
            { value: "not-linear", label: labels["not-linear"] },
          ],
          correctChoice: correct,
          solution: `Growth per extra newton: ${deformations
            .slice(1)
            .map((x, i) => cm1(tenth(x - deformations[i])))
            .join(", ")}. ${verdict.reason}`,
        };
      },
    },
  ],
};
