// Exercise generators for lesson 5 (elastic, permanent, broken). Numbers come from each student's
// seed; the expected answers and worked solutions stay on the server. Readings are invented, in the
// ranges a thin balsa strip or craft stick gives when loaded towards breaking.
import type { LessonExercises } from "~/lib/exercises";
import { G_N_PER_KG, elasticLimit, formatForStudent, permanentSetCm } from "~/lib/science";

const cm1 = (value: number) => `${value.toFixed(1)} cm`;
const tenth = (value: number) => Number(value.toFixed(1));
const fmt = (value: number, sig = 3) => formatForStudent(value, "", sig);
const RESOLUTION_CM = 0.1;
/** A given value written as given: 6.5, 12, 0.25. */
const given = (value: number) => String(Number(value.toPrecision(6)));

export const lesson: LessonExercises = {
  writtenAnswers: ["cer-elastic-limit"],
  exercises: [
    {
      id: "permanent-set",
      kind: "number",
      title: "Permanent set from a return reading",
      generate(random) {
        const reference = random.uniformStep(16, 22, 0.1);
        const force = random.integer(5, 9);
        const set = random.uniformStep(0.2, 0.9, 0.1);
        const returned = tenth(reference - set);
        const loaded = tenth(reference - random.uniformStep(2, 4, 0.1));
        const value = permanentSetCm("bend", reference, returned);
        return {
          prompt: `A strip's reference reading is ${cm1(reference)}. With ${force} N on its middle the ruler reads ${cm1(loaded)}. After the load is taken off, the ruler reads ${cm1(returned)}.\nWhat is the permanent set? Give a unit.`,
          hint: "Permanent set = reference reading − return reading. The reading with the load on does not come into it.",
          expected: {
            value,
            unit: "cm",
            tolerance: { absolute: 0.05 },
            // No loaded reading in the context: the checker's general slip for it speaks of a deformation.
            context: { forceN: force },
            knownWrongAnswers: [
              {
                code: "loaded-reading-as-set",
                value: loaded,
                unit: "cm",
                hint: "That is the ruler reading with the load on. The permanent set is read after the load is taken off: reference reading − return reading.",
              },
              {
                code: "used-loaded-reading",
                value: tenth(reference - loaded),
                unit: "cm",
                hint: "That is the deformation with the load on. The permanent set is what is left after the load is taken off: reference reading − return reading.",
              },
              {
                code: "return-reading-as-set",
                value: returned,
                unit: "cm",
                hint: "That is the return reading itself. The permanent set is how far it is from the reference reading.",
              },
            ],
          },
          solution: `Permanent set = ${cm1(reference)} − ${cm1(returned)} = ${cm1(value)}.`,
        };
      },
    },
    {
      id: "return-table",
      kind: "table",
      title: "Permanent set after each load",
      generate(random) {
        const reference = random.uniformStep(17, 22, 0.1);
        const start = random.integer(3, 5);
        const forces = [start, start + 1, start + 2];
        const first = random.pick([0, 0.1]);
        const growth = random.uniformStep(0.2, 0.4, 0.1);
        const sets = [first, tenth(first + growth), tenth(first + 2.5 * growth)];
        const returns = sets.map((s) => tenth(reference - s));
        return {
          prompt: `A strip's reference reading is ${cm1(reference)}. After each load is taken off, the ruler is read again. Fill in the permanent set after each load, with units.`,
          hint: "For each row: reference reading − return reading.",
          table: {
            columns: ["Load", "Return reading", "Permanent set"],
            rows: forces.map((f, i) => [`${f} N`, cm1(returns[i]), null]),
          },
          cells: sets.map((s, i) => ({
            value: s,
            unit: "cm",
            tolerance: { absolute: 0.05 },
            context: { forceN: forces[i] },
            knownWrongAnswers: [
              {
                code: "return-reading-as-set",
                value: returns[i],
                unit: "cm",
                hint: "That is the return reading itself. The permanent set is how far it is from the reference reading: reference reading − return reading.",
              },
            ],
          })),
          solution: forces.map((f, i) => `${f} N: ${cm1(reference)} − ${cm1(returns[i])} = ${cm1(sets[i])}`).join("\n"),
        };
      },
    },
    {
      id: "came-back-choice",
      kind: "choice",
      title: "Did it come back?",
      generate(random) {
        const reference = random.uniformStep(16, 22, 0.1);
        const force = random.integer(2, 9);
        const cameBack = random.next() < 0.5;
        const set = cameBack ? random.pick([0, 0.1]) : random.uniformStep(0.2, 0.6, 0.1);
        const returned = tenth(reference - set);
        return {
          prompt: `A strip's reference reading is ${cm1(reference)}, on a ruler read to 0.1 cm. After a load of ${force} N is taken off, the ruler reads ${cm1(returned)}.\nUsing the rule of this lesson (within one ruler step counts as coming back), what happened at ${force} N?`,
          hint: "Find the permanent set (reference − return reading) and compare it with one ruler step, 0.1 cm.",
          choices: [
            { value: "elastic", label: "It came back: the strip behaved elastically at this load" },
            { value: "permanent", label: "It took a permanent set: this load was past the elastic limit" },
          ],
          correctChoice: cameBack ? "elastic" : "permanent",
          solution: `Permanent set = ${cm1(reference)} − ${cm1(returned)} = ${cm1(set)}. ${
            cameBack
              ? "That is within one ruler step (0.1 cm), so the strip came back: elastic at this load."
              : "That is more than one ruler step (0.1 cm), so the strip did not come back: a permanent set."
          }`,
        };
      },
    },
    {
      id: "elastic-limit",
      kind: "number",
      title: "Elastic limit from return readings",
      generate(random) {
        const reference = random.uniformStep(17, 22, 0.1);
        const limit = random.integer(3, 6);
        const forces = Array.from({ length: limit + 3 }, (_, i) => i + 1);
        const growth = random.uniformStep(0.2, 0.3, 0.1);
        // Within the elastic range the set stays 0, or reaches one ruler step (0.1 cm) and stays there;
        // past the limit it grows with every load.
        const firstTenth = random.integer(1, limit + 1);
        const sets = forces.map((f) => (f <= limit ? (f >= firstTenth ? 0.1 : 0) : tenth(growth * (f - limit) + 0.1 * (f - limit - 1))));
        const returns = sets.map((s) => tenth(reference - s));
        const result = elasticLimit(
          forces.map((f, i) => ({ forceN: f, permanentSetCm: permanentSetCm("bend", reference, returns[i]) })),
          RESOLUTION_CM,
        );
        const answer = result.elasticLimitN ?? limit;
        const firstSet = result.firstPermanentSetAtN ?? limit + 1;
        return {
          prompt: `A strip's reference reading is ${cm1(reference)}, on a ruler read to 0.1 cm. Return readings after each load: ${forces.map((f, i) => `${f} N → ${cm1(returns[i])}`).join(", ")}.\nWhat is the strip's elastic limit? Give a unit.`,
          hint: "Work out the permanent set after each load. The elastic limit is the largest load before the first one whose set is more than one ruler step (0.1 cm).",
          expected: {
            value: answer,
            unit: "N",
            tolerance: { absolute: 0.01 },
            knownWrongAnswers: [
              {
                code: "first-permanent-load",
                value: firstSet,
                unit: "N",
                hint: "That is the first load after which the strip did NOT come back. The elastic limit is the last load after which it did.",
              },
            ],
          },
          solution: `Permanent set after each load: ${forces.map((f, i) => `${f} N: ${cm1(sets[i])}`).join(", ")}.\nUp to ${answer} N every set is within 0.1 cm; after ${firstSet} N it is ${cm1(sets[firstSet - 1])}. Elastic limit = ${answer} N.`,
        };
      },
    },
    {
      id: "safe-load",
      kind: "number",
      title: "Safe working load",
      generate(random) {
        const breaking = random.uniformStep(6, 40, 0.5);
        const factor = random.pick([1.5, 2, 2.5, 3, 4]);
        const safe = breaking / factor;
        return {
          prompt: `Tests show that a shelf bracket made of strips breaks at ${given(breaking)} N. The design uses a safety factor of ${factor}.\nWhat is the largest load it should be given? Give a unit.`,
          hint: "Safe working load = breaking load ÷ safety factor.",
          expected: {
            value: safe,
            unit: "N",
            tolerance: { relative: 0.01 },
            knownWrongAnswers: [
              {
                code: "multiplied-by-factor",
                value: breaking * factor,
                unit: "N",
                hint: "That is more than the breaking load! The safe load is the breaking load divided by the safety factor.",
              },
            ],
          },
          solution: `Safe working load = ${given(breaking)} N ÷ ${factor} = ${fmt(safe)} N.`,
        };
      },
    },
    {
      id: "safety-factor",
      kind: "ratio",
      title: "Safety factor of a design",
      generate(random) {
        const breaking = random.uniformStep(8, 30, 0.5);
        const load = random.uniformStep(2, 7, 0.5);
        const factor = breaking / load;
        return {
          prompt: `A model footbridge breaks at ${given(breaking)} N. The heaviest load it will ever carry is ${given(load)} N.\nWhat safety factor does it have? Give a plain number.`,
          hint: "Safety factor = breaking load ÷ largest expected load. Newtons divided by newtons leaves no unit.",
          expected: { value: factor, unit: "", tolerance: { relative: 0.02 } },
          solution: `Safety factor = ${given(breaking)} N ÷ ${given(load)} N = ${fmt(factor)}.`,
        };
      },
    },
    {
      id: "needed-breaking-load",
      kind: "number",
      title: "Breaking load a design needs",
      generate(random) {
        const mass = random.uniformStep(0.2, 1.5, 0.05);
        const load = Number((mass * G_N_PER_KG).toPrecision(3));
        const factor = random.pick([2, 2.5, 3, 4]);
        const needed = load * factor;
        return {
          prompt: `A bookend made of strips must hold books pushing on it with ${fmt(load)} N. The class agrees on a safety factor of ${factor}.\nWhat is the smallest breaking load the bookend may have? Give a unit.`,
          hint: "Turn safety factor = breaking load ÷ expected load around: breaking load = expected load × safety factor.",
          expected: {
            value: needed,
            unit: "N",
            tolerance: { relative: 0.02 },
            knownWrongAnswers: [
              {
                code: "divided-by-factor",
                value: load / factor,
                unit: "N",
                hint: "That is smaller than the load itself. The design must survive more than the expected load: multiply by the safety factor.",
              },
            ],
          },
          solution: `Breaking load needed = ${fmt(load)} N × ${factor} = ${fmt(needed)} N.`,
        };
      },
    },
  ],
};
