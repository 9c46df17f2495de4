// Exercise generators for lesson 4 (bundles side by side, pieces in series). Numbers come from each
// student's seed; the expected answers and worked solutions stay on the server. Stiffnesses are
// invented, in the ranges thin wooden strips, kit springs and rubber bands give.
import type { LessonExercises } from "~/lib/exercises";
import { formatForStudent, seriesStiffness, sideBySideStiffness, stiffnessRatio } from "~/lib/science";

const fmt = (value: number, sig = 3) => formatForStudent(value, "", sig);
const MATERIALS = ["thin balsa strips", "basswood strips", "thin plywood strips", "plastic coffee stirrers", "wooden coffee stirrers"];

export const lesson: LessonExercises = {
  writtenAnswers: ["cer-bundles"],
  exercises: [
    {
      id: "bundle-stiffness",
      kind: "number",
      title: "Stiffness of a bundle side by side",
      generate(random) {
        const material = random.pick(MATERIALS);
        const k = random.uniformStep(0.8, 3.5, 0.1);
        const n = random.integer(2, 6);
        const bundle = sideBySideStiffness(k, n);
        return {
          prompt: `Each of a set of identical ${material} has a stiffness of ${k.toFixed(1)} N/cm on supports 12 cm apart.\nEstimate the stiffness of ${n} of them laid side by side and loaded together. Give a unit.`,
          hint: "Side by side, each strip carries its share of the load at the same deformation, so the stiffnesses add: n × k.",
          expected: {
            value: bundle,
            unit: "N/cm",
            tolerance: { relative: 0.02 },
            knownWrongAnswers: [
              {
                code: "divided-by-count",
                value: k / n,
                unit: "N/cm",
                hint: "That is the stiffness divided by the number of strips: what pieces in series do. Side by side, the strips share the load, so the bundle is stiffer.",
              },
              {
                code: "cubed-count",
                value: k * n ** 3,
                unit: "N/cm",
                hint: "n³ times is for strips glued into one thick stack. Loose strips side by side are only about n times as stiff.",
              },
            ],
          },
          solution: `k(bundle) = n × k = ${n} × ${k.toFixed(1)} N/cm = ${fmt(bundle)} N/cm.`,
        };
      },
    },
    {
      id: "bundle-ratio",
      kind: "ratio",
      title: "How many times as stiff is the bundle?",
      generate(random) {
        const n = random.integer(2, 5);
        const k1 = random.uniformStep(1.5, 3.5, 0.01);
        // A measured bundle is rarely exactly n times as stiff: strips differ a little.
        const kn = Number((k1 * n * random.uniformStep(0.9, 1.08, 0.01)).toFixed(2));
        const ratio = stiffnessRatio(kn, k1)!;
        return {
          prompt: `A single strip's best line through the origin has a slope of ${k1.toFixed(2)} N/cm. A bundle of ${n} of these strips side by side gives ${kn.toFixed(2)} N/cm.\nHow many times as stiff as one strip is the bundle? Give a plain number.`,
          hint: "Divide the bundle's stiffness by the single strip's stiffness. The units cancel, leaving a plain number.",
          expected: { value: ratio, unit: "", tolerance: { relative: 0.02 } },
          solution: `${kn.toFixed(2)} N/cm ÷ ${k1.toFixed(2)} N/cm = ${fmt(ratio)}. The simple rule predicts ${n}; ${
            Math.abs(ratio - n) / n <= 0.05 ? "the measured ratio is close to it." : "the measured ratio is a little off, because real strips are not quite identical."
          }`,
        };
      },
    },
    {
      id: "bundle-deflection",
      kind: "number",
      title: "Deformation of a bundle under a load",
      generate(random) {
        const k = random.uniformStep(1, 3, 0.1);
        const n = random.integer(2, 5);
        const force = random.integer(3, 10);
        const bundle = sideBySideStiffness(k, n);
        const x = force / bundle;
        return {
          prompt: `One strip has a stiffness of ${k.toFixed(1)} N/cm. ${n} of them are laid side by side and a force of ${force} N pulls down on the middle of the bundle.\nHow far does the bundle bend? Give a unit.`,
          hint: "First find the bundle's stiffness (n × k). Then deformation = force ÷ stiffness.",
          expected: {
            value: x,
            unit: "cm",
            tolerance: { relative: 0.02 },
            context: { forceN: force },
            knownWrongAnswers: [
              {
                code: "one-strip-only",
                value: force / k,
                unit: "cm",
                hint: "That is how far one strip alone would bend. The bundle shares the load, so it is stiffer and bends less.",
              },
              {
                code: "multiplied-not-divided",
                value: force * bundle,
                unit: "cm",
                hint: "It looks like the force was multiplied by the stiffness. Deformation = force ÷ stiffness.",
              },
            ],
          },
          solution: `k(bundle) = ${n} × ${k.toFixed(1)} N/cm = ${fmt(bundle)} N/cm.\nDeformation = ${force} N ÷ ${fmt(bundle)} N/cm = ${fmt(x)} cm.`,
        };
      },
    },
    {
      id: "how-many-strips",
      kind: "choice",
      title: "Smallest bundle that is stiff enough",
      generate(random) {
        const k = random.uniformStep(1.2, 3, 0.1);
        const needed = random.integer(2, 6);
        // A target just above what needed − 1 strips give, so that needed strips is the smallest bundle that reaches it.
        const target = Number((k * (needed - 1) + random.uniformStep(0.2, 0.8, 0.1) * k).toFixed(1));
        const count = Math.ceil(target / k - 1e-9);
        return {
          prompt: `A strip has a stiffness of ${k.toFixed(1)} N/cm. A bundle of these strips side by side must reach a stiffness of at least ${target.toFixed(1)} N/cm.\nWhat is the smallest number of strips that does it?`,
          hint: "A bundle of n strips has a stiffness of n × k. Try n = 1, 2, 3, … until n × k reaches the target.",
          choices: [1, 2, 3, 4, 5, 6, 7].map((c) => ({ value: String(c), label: `${c} strip${c === 1 ? "" : "s"}` })),
          correctChoice: String(count),
          solution: `${count - 1} strip${count - 1 === 1 ? "" : "s"}: ${count - 1} × ${k.toFixed(1)} N/cm = ${fmt((count - 1) * k)} N/cm, not enough. ${count} strips: ${count} × ${k.toFixed(1)} N/cm = ${fmt(count * k)} N/cm, which reaches ${target.toFixed(1)} N/cm. So ${count} strips.`,
        };
      },
    },
    {
      id: "series-two",
      kind: "number",
      title: "Two pieces in series",
      generate(random) {
        const k1 = random.uniformStep(0.5, 3, 0.1);
        let k2 = random.uniformStep(0.5, 3, 0.1);
        if (k2 === k1) k2 = Number((k1 + 0.4).toFixed(1));
        const k = seriesStiffness([k1, k2])!;
        const what = random.pick(["two springs from a science kit", "two different rubber bands", "a spring and a rubber band"]);
        return {
          prompt: `${what[0].toUpperCase()}${what.slice(1)} are hooked end to end and the load hangs from the bottom one. Alone, the first has a stiffness of ${k1.toFixed(1)} N/cm and the second ${k2.toFixed(1)} N/cm.\nWhat is the stiffness of the pair in series? Give a unit.`,
          hint: "In series each piece carries the whole force and the stretches add, so 1 ÷ k = 1 ÷ k₁ + 1 ÷ k₂.",
          expected: {
            value: k,
            unit: "N/cm",
            tolerance: { relative: 0.02 },
            knownWrongAnswers: [
              {
                code: "added-like-side-by-side",
                value: k1 + k2,
                unit: "N/cm",
                hint: "Adding the stiffnesses is the rule for pieces side by side. End to end, the stretches add: 1 ÷ k = 1 ÷ k₁ + 1 ÷ k₂.",
              },
              {
                code: "forgot-last-reciprocal",
                value: 1 / k1 + 1 / k2,
                unit: "N/cm",
                hint: "That is 1 ÷ k₁ + 1 ÷ k₂, which is 1 ÷ k (in cm/N). Take its reciprocal to get k.",
              },
              {
                code: "averaged",
                value: (k1 + k2) / 2,
                unit: "N/cm",
                hint: "The series stiffness is not the average: it is less than the softer piece alone.",
              },
            ],
          },
          solution: `1 ÷ k = 1 ÷ ${k1.toFixed(1)} + 1 ÷ ${k2.toFixed(1)} = ${fmt(1 / k1)} + ${fmt(1 / k2)} = ${fmt(1 / k1 + 1 / k2)} cm/N.\nk = 1 ÷ ${fmt(1 / k1 + 1 / k2)} = ${fmt(k)} N/cm, less than either piece alone.`,
        };
      },
    },
    {
      id: "series-stretch-table",
      kind: "table",
      title: "Stretches of two springs in series",
      generate(random) {
        const kA = random.uniformStep(0.8, 2.5, 0.1);
        let kB = random.uniformStep(0.8, 2.5, 0.1);
        if (kB === kA) kB = Number((kA + 0.5).toFixed(1));
        const force = random.integer(2, 6);
        const xA = force / kA;
        const xB = force / kB;
        const total = xA + xB;
        return {
          prompt: `Spring A (stiffness ${kA.toFixed(1)} N/cm) hangs from a rod, and spring B (stiffness ${kB.toFixed(1)} N/cm) hangs from the bottom of A. A force of ${force} N pulls down on the bottom of B.\nFill in the stretch of each spring and of the pair, with units.`,
          hint: "In series each spring carries the whole force: stretch = force ÷ that spring's stiffness. The pair stretches by the sum.",
          table: {
            columns: ["Piece", "Force it carries", "Stretch"],
            rows: [
              ["Spring A", `${force} N`, null],
              ["Spring B", `${force} N`, null],
              ["A and B together", `${force} N`, null],
            ],
          },
          cells: [
            { value: xA, unit: "cm", tolerance: { relative: 0.02 }, context: { forceN: force } },
            { value: xB, unit: "cm", tolerance: { relative: 0.02 }, context: { forceN: force } },
            { value: total, unit: "cm", tolerance: { relative: 0.02 }, context: { forceN: force } },
          ],
          solution: `Spring A: ${force} N ÷ ${kA.toFixed(1)} N/cm = ${fmt(xA)} cm\nSpring B: ${force} N ÷ ${kB.toFixed(1)} N/cm = ${fmt(xB)} cm\nTogether: ${fmt(xA)} cm + ${fmt(xB)} cm = ${fmt(total)} cm (so the pair's stiffness is ${force} N ÷ ${fmt(total)} cm = ${fmt(force / total)} N/cm).`,
        };
      },
    },
  ],
};
