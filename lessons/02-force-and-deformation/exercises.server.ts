// Exercise generators for lesson 2. Numbers come from each student's seed; the expected answers and
// worked solutions stay on the server. Readings are invented, in the ranges a thin basswood strip gives.
import type { LessonExercises } from "~/lib/exercises";
import { formatForStudent, stiffnessNPerCm } from "~/lib/science";

// Ruler readings and deformations to 0.1 cm, as the ruler gives them.
const cm = (value: number) => `${value.toFixed(1)} cm`;

export const lesson: LessonExercises = {
  writtenAnswers: ["cer-stiffness"],
  exercises: [
    {
      id: "deformation-from-readings",
      kind: "number",
      title: "Deformation from two readings",
      generate(random) {
        const unloaded = random.uniformStep(15, 25, 0.1);
        const drop = random.uniformStep(0.4, 2.5, 0.1);
        const loaded = Number((unloaded - drop).toFixed(1));
        const force = random.integer(2, 9);
        return {
          prompt: `A strip rests on two supports. Its unloaded reading is ${cm(unloaded)}. With ${force} N pulling down on its middle, the ruler reads ${cm(loaded)}.\nWhat is the deformation? Give a unit.`,
          hint: "Deformation = unloaded reading − loaded reading.",
          expected: {
            value: drop,
            unit: "cm",
            tolerance: { absolute: 0.05 },
            context: { forceN: force, deformationCm: drop, loadedReadingCm: loaded },
          },
          solution: `Deformation = ${cm(unloaded)} − ${cm(loaded)} = ${cm(drop)}.`,
        };
      },
    },
    {
      id: "stiffness-one-reading",
      kind: "number",
      title: "Stiffness of one reading",
      generate(random) {
        const force = random.integer(2, 9);
        const deformation = random.uniformStep(0.5, 3, 0.1);
        const k = stiffnessNPerCm(force, deformation)!;
        return {
          prompt: `A load of ${force} N bends a strip by ${cm(deformation)}.\nWhat is the stiffness of this reading, in N/cm?`,
          hint: "Stiffness = force ÷ deformation. Newtons divided by centimetres gives N/cm.",
          expected: {
            value: k,
            unit: "N/cm",
            tolerance: { relative: 0.02 },
            context: { forceN: force, deformationCm: deformation },
          },
          solution: `k = F ÷ Δx = ${force} N ÷ ${cm(deformation)} = ${formatForStudent(k)} N/cm.`,
        };
      },
    },
    {
      id: "complete-the-table",
      kind: "table",
      title: "Deformations in a table",
      generate(random) {
        const unloaded = random.uniformStep(16, 22, 0.1);
        const perNewton = random.uniformStep(0.3, 0.6, 0.1);
        const forces = [2, 4, 6];
        const deformations = forces.map((f) => Number((f * perNewton).toFixed(1)));
        const readings = deformations.map((d) => Number((unloaded - d).toFixed(1)));
        return {
          prompt: `The unloaded reading of a strip is ${cm(unloaded)}. Fill in the deformation for each load (with units).`,
          hint: "For each row: unloaded reading − loaded reading.",
          table: {
            columns: ["Force", "Loaded reading", "Deformation"],
            rows: forces.map((f, i) => [`${f} N`, cm(readings[i]), null]),
          },
          cells: deformations.map((d, i) => ({
            value: d,
            unit: "cm",
            tolerance: { absolute: 0.05 },
            context: { forceN: forces[i], deformationCm: d, loadedReadingCm: readings[i] },
          })),
          solution: forces
            .map((f, i) => `${f} N: ${cm(unloaded)} − ${cm(readings[i])} = ${cm(deformations[i])}`)
            .join("\n"),
        };
      },
    },
    {
      id: "force-for-deformation",
      kind: "number",
      title: "Force for a given deformation",
      generate(random) {
        const k = random.uniformStep(1.5, 4, 0.5);
        const deformation = random.uniformStep(0.8, 2.4, 0.2);
        const force = k * deformation;
        return {
          prompt: `A strip has a stiffness of ${formatForStudent(k)} N/cm. If it behaves the same at every load, what force bends it by ${cm(deformation)}?`,
          hint: "Turn k = F ÷ Δx around: F = k × Δx.",
          expected: { value: force, unit: "N", tolerance: { relative: 0.02 } },
          solution: `F = k × Δx = ${formatForStudent(k)} N/cm × ${cm(deformation)} = ${formatForStudent(force)} N.`,
        };
      },
    },
    {
      id: "stiffness-in-n-per-m",
      kind: "number",
      title: "Stiffness in N/m",
      generate(random) {
        const k = random.uniformStep(1.2, 6, 0.2);
        return {
          prompt: `A strip's stiffness is ${formatForStudent(k)} N/cm. Write it in N/m.`,
          hint: "There are 100 cm in 1 m, so each N/cm is 100 N/m.",
          expected: { value: k * 100, unit: "N/m", tolerance: { relative: 0.01 }, unitRequired: true },
          solution: `${formatForStudent(k)} N/cm × 100 cm/m = ${formatForStudent(k * 100)} N/m.`,
        };
      },
    },
    {
      id: "same-stiffness-choice",
      kind: "choice",
      title: "Same stiffness at every load?",
      generate(random) {
        const k = random.uniformStep(2, 3, 0.5);
        // Loads of 3, 6 and 9 N give whole ruler marks (0.1 cm) for k = 2, 2.5 and 3 N/cm, so the
        // readings are no finer than a ruler can give.
        const forces = [3, 6, 9];
        // Either every reading gives the same stiffness, or the last one bends more than its share.
        const softens = random.next() < 0.5;
        const deformations = forces.map((f, i) => Number(((f / k) * (softens && i === 2 ? 1.3 : 1)).toFixed(1)));
        const stiffnesses = forces.map((f, i) => f / deformations[i]);
        return {
          prompt: `Three readings of one strip: ${forces.map((f, i) => `${f} N bends it ${deformations[i].toFixed(1)} cm`).join("; ")}.\nIs the stiffness the same for all three readings (within about 5 %)?`,
          hint: "Work out force ÷ deformation for each reading and compare the three.",
          choices: [
            { value: "same", label: "Yes, about the same for all three" },
            { value: "different", label: "No, one of them is clearly different" },
          ],
          correctChoice: softens ? "different" : "same",
          solution: `Stiffness of each reading: ${stiffnesses.map((s) => `${formatForStudent(s)} N/cm`).join(", ")}. ${
            softens ? "The last one is clearly lower: the strip bent more than its share at the largest load." : "All three agree, so the stiffness is the same at these loads."
          }`,
        };
      },
    },
  ],
};
