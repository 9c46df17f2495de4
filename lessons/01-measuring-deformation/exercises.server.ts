// Exercise generators for lesson 1 (measuring deformation). Numbers come from each student's seed;
// the expected answers and worked solutions stay on the server. Readings are invented, in the
// ranges a thin strip on two stacks of books gives with a millimetre ruler.
import type { LessonExercises } from "~/lib/exercises";
import { formatForStudent, stiffnessNPerCm } from "~/lib/science";

/** A ruler reading or a difference of readings, written to the ruler's 0.1 cm. */
const cm1 = (value: number) => `${value.toFixed(1)} cm`;
/** Rounded to one decimal place, cleaned of binary noise (18.3 − 17.1 → 1.2). */
const tenth = (value: number) => Number(value.toFixed(1));
/** A short number without false trailing zeros: 0.1, 0.05, 0.125. */
const short = (value: number) => String(Number(value.toPrecision(3)));
const ordinal = (n: number) => `${n}${n === 1 ? "st" : n === 2 ? "nd" : n === 3 ? "rd" : "th"}`;

const STUDENTS = ["Priya", "Mateo", "Jonas", "Aiko", "Sefa", "Lena", "Tomas", "Nia"];

export const lesson: LessonExercises = {
  writtenAnswers: ["cer-reference-reading"],
  exercises: [
    {
      id: "read-the-ruler",
      kind: "number",
      title: "Reading a millimetre ruler",
      generate(random) {
        const whole = random.integer(12, 24);
        const marks = random.integer(1, 9);
        const reading = tenth(whole + marks / 10);
        return {
          prompt: `A ruler stands upright beside a strip, with its 0 on the table. It has a number at every centimetre and 10 small marks between the numbers.\nThe top edge of the strip lines up with the ${ordinal(marks)} small mark above the ${whole} cm number.\nWhat is the reading? Give a unit.`,
          hint: "Each small mark is 1 mm, which is 0.1 cm. Start at the number below the edge and add 0.1 cm for every small mark.",
          expected: {
            value: reading,
            unit: "cm",
            tolerance: { absolute: 0.05 },
            // The two slips lie 0.01–0.09 cm apart, closer than the answer's tolerance: each is matched
            // only by the exact value it gives, so "17 cm" for 17.1 cm is not read as 17.01 cm.
            knownWrongAnswers: [
              {
                code: "millimetres-as-hundredths",
                value: whole + marks / 100,
                unit: "cm",
                tolerance: { absolute: 0.004 },
                hint: "Each small mark is 1 mm, which is 0.1 cm, not 0.01 cm. Count the marks in tenths of a centimetre.",
              },
              {
                code: "marks-not-counted",
                value: whole,
                unit: "cm",
                tolerance: { absolute: 0.004 },
                hint: "The edge is above the number: add 0.1 cm for each small mark between the number and the edge.",
              },
              {
                code: "counted-down-from-number-above",
                value: whole + 1 - marks / 10,
                unit: "cm",
                hint: "Count the small marks up from the number below the edge, not down from the number above it.",
              },
            ],
          },
          solution: `Each small mark is 1 mm = 0.1 cm. ${marks} ${marks === 1 ? "mark" : "marks"} above ${whole} cm: ${whole} cm + ${marks} × 0.1 cm = ${cm1(reading)}.`,
        };
      },
    },
    {
      id: "half-a-mark",
      kind: "number",
      title: "How far off can a reading be?",
      generate(random) {
        const marksPerCm = random.pick([2, 4, 5, 10] as const);
        const resolution = 1 / marksPerCm;
        const ofDeformation = random.next() < 0.5;
        const answer = ofDeformation ? resolution : resolution / 2;
        const what = ofDeformation
          ? "a deformation worked out from two readings (the reference reading and a loaded reading)"
          : "one reading";
        return {
          prompt: `A ruler has ${marksPerCm} equal marks in every centimetre, and each reading is rounded to the nearest mark.\nAt most, how far off from the true value can ${what} be? Give a unit.`,
          hint: ofDeformation
            ? "First find the gap between two marks (1 cm ÷ the number of marks). Each of the two readings can be off by half a gap, and the two errors can add up."
            : "First find the gap between two marks (1 cm ÷ the number of marks). A reading rounded to the nearest mark is never more than half a gap away.",
          expected: {
            value: answer,
            unit: "cm",
            tolerance: { absolute: 0.006 },
            knownWrongAnswers: ofDeformation
              ? [
                  {
                    code: "one-reading-only",
                    value: resolution / 2,
                    unit: "cm",
                    hint: "That is how far off one reading can be. A deformation uses two readings, and both can be off.",
                  },
                ]
              : [
                  {
                    code: "whole-mark-for-one-reading",
                    value: resolution,
                    unit: "cm",
                    hint: "That is the whole gap between marks. A reading rounded to the nearest mark is at most half a gap away.",
                  },
                ],
          },
          solution: ofDeformation
            ? `Gap between marks (the resolution) = 1 cm ÷ ${marksPerCm} = ${short(resolution)} cm. Each reading can be off by half of that, ${short(resolution / 2)} cm, and the two errors can add up: ${short(resolution / 2)} cm + ${short(resolution / 2)} cm = ${short(answer)} cm, one whole mark.`
            : `Gap between marks (the resolution) = 1 cm ÷ ${marksPerCm} = ${short(resolution)} cm. Rounded to the nearest mark, a reading is at most half a gap away: ${short(resolution)} cm ÷ 2 = ${short(answer)} cm.`,
        };
      },
    },
    {
      id: "parallax-direction",
      kind: "choice",
      title: "Parallax: which way is the error?",
      generate(random) {
        const name = random.pick(STUDENTS);
        const gap = random.integer(1, 4);
        const eyeAbove = random.next() < 0.5;
        const reading = cm1(random.uniformStep(15, 22, 0.1));
        return {
          prompt: `${name} reads the top edge of a strip against a ruler that stands ${gap} cm behind the strip, and writes down ${reading}. ${name}'s eye was a little ${eyeAbove ? "above" : "below"} the level of the edge.\nIs the reading too high, too low, or right?`,
          hint: "Draw the straight line from the eye through the edge of the strip and carry it on until it meets the ruler behind.",
          choices: [
            { value: "too-high", label: "Too high" },
            { value: "too-low", label: "Too low" },
            { value: "right", label: "Right: where the eye is does not matter" },
          ],
          correctChoice: eyeAbove ? "too-low" : "too-high",
          solution: eyeAbove
            ? `The line from ${name}'s eye through the edge slopes downward, so it meets the ruler ${gap} cm behind below the edge's true height. The reading ${reading} is too low. With the eye level with the edge, the line is flat and the reading is right.`
            : `The line from ${name}'s eye through the edge slopes upward, so it meets the ruler ${gap} cm behind above the edge's true height. The reading ${reading} is too high. With the eye level with the edge, the line is flat and the reading is right.`,
        };
      },
    },
    {
      id: "zero-offset",
      kind: "number",
      title: "Correcting a spring scale that was not zeroed",
      generate(random) {
        const name = random.pick(STUDENTS);
        const size = random.uniformStep(0.2, 0.8, 0.1);
        const above = random.next() < 0.5;
        const offset = above ? size : -size;
        const trueForce = random.integer(2, 8);
        const shown = tenth(trueForce + offset);
        const emptyReading = above ? `${size.toFixed(1)} N` : `${size.toFixed(1)} N below the zero mark`;
        return {
          prompt: `${name}'s spring scale cannot be adjusted. Held hook-down with nothing on it, it reads ${emptyReading}.\nPulling down on the middle of a strip, the scale shows ${shown.toFixed(1)} N.\nWhat is the true force on the strip? Give a unit.`,
          hint: "True force = force shown − reading with nothing on the hook. A reading below the zero mark counts as negative.",
          expected: {
            value: trueForce,
            unit: "N",
            tolerance: { absolute: 0.05 },
            knownWrongAnswers: [
              {
                code: "offset-wrong-way",
                value: shown + offset,
                unit: "N",
                hint: "The correction went the wrong way. If the scale reads above zero with nothing on it, every force it shows is too big by that much; below zero, too small.",
              },
              {
                code: "offset-ignored",
                value: shown,
                unit: "N",
                hint: "That is the force the scale shows. Correct it with the reading it gives when nothing is on the hook.",
              },
            ],
          },
          solution: above
            ? `With nothing on it the scale already shows ${size.toFixed(1)} N, so every force it shows is ${size.toFixed(1)} N too big. True force = ${shown.toFixed(1)} N − ${size.toFixed(1)} N = ${trueForce.toFixed(1)} N.`
            : `With nothing on it the scale shows −${size.toFixed(1)} N, so every force it shows is ${size.toFixed(1)} N too small. True force = ${shown.toFixed(1)} N − (−${size.toFixed(1)} N) = ${shown.toFixed(1)} N + ${size.toFixed(1)} N = ${trueForce.toFixed(1)} N.`,
        };
      },
    },
    {
      id: "repeat-readings",
      kind: "table",
      title: "Three people, one reference reading",
      generate(random) {
        const [a, b, c] = random.shuffle(STUDENTS).slice(0, 3);
        const base = random.uniformStep(16, 22, 0.1);
        // Three readings within two marks of each other, not all the same.
        const offsets = random.pick([
          [0, 0.1, -0.1],
          [0, 0.1, 0.2],
          [0, -0.1, 0.1],
          [0.1, 0.1, -0.1],
          [0, 0.2, 0.1],
          [-0.1, 0, 0],
          [0, 0, 0.2],
        ] as const);
        const readings = random.shuffle(offsets).map((o) => tenth(base + o));
        const mean = readings.reduce((s, r) => s + r, 0) / readings.length;
        const spread = tenth(Math.max(...readings) - Math.min(...readings));
        // 49.8 cm ÷ 3 comes out even (16.6 cm); 49.9 cm ÷ 3 = 16.63 cm is rounded to the ruler's 0.1 cm.
        const even = Math.abs(mean * 10 - Math.round(mean * 10)) < 1e-9;
        const meanWorded = even ? cm1(mean) : `${formatForStudent(mean, "cm", 4)}, about ${cm1(mean)} to the ruler's 0.1 cm`;
        return {
          prompt: `${a}, ${b} and ${c} each read the reference height of the same unloaded strip, eyes level, without telling each other: ${a} ${cm1(readings[0])}, ${b} ${cm1(readings[1])}, ${c} ${cm1(readings[2])}.\nFill in the mean of the three readings and their spread (largest − smallest), each with a unit.`,
          hint: "Mean = (sum of the three readings) ÷ 3. Spread = largest reading − smallest reading.",
          table: {
            columns: ["Quantity", "Value"],
            rows: [
              ["Mean of the three readings", null],
              ["Spread (largest − smallest)", null],
            ],
          },
          cells: [
            { value: mean, unit: "cm", tolerance: { absolute: 0.05 } },
            { value: spread, unit: "cm", tolerance: { absolute: 0.05 } },
          ],
          solution: `Mean = (${readings.map((r) => cm1(r)).join(" + ")}) ÷ 3 = ${cm1(readings[0] + readings[1] + readings[2])} ÷ 3 = ${meanWorded}.\nSpread = ${cm1(Math.max(...readings))} − ${cm1(Math.min(...readings))} = ${cm1(spread)}. A spread of one or two marks is normal for careful readers; a bigger one means someone's eye was not level.`,
        };
      },
    },
    {
      id: "stretch-change",
      kind: "number",
      title: "Deformation of a stretched spring",
      generate(random) {
        const unloaded = random.uniformStep(6, 10, 0.1);
        const force = random.integer(2, 8);
        const stretch = random.uniformStep(1, 4.5, 0.1);
        const loaded = tenth(unloaded + stretch);
        return {
          prompt: `A steel spring from a science kit is ${cm1(unloaded)} long with nothing hanging from it. With a force of ${force} N pulling on its end, it is ${cm1(loaded)} long.\nWhat is the deformation (the stretch)? Give a unit.`,
          hint: "For something that stretches, deformation = loaded length − unloaded length. It is the change, not a whole length.",
          expected: {
            value: stretch,
            unit: "cm",
            tolerance: { absolute: 0.05 },
            context: { forceN: force, deformationCm: stretch, totalLengthCm: loaded, unloadedLengthCm: unloaded },
          },
          solution: `Deformation = loaded length − unloaded length = ${cm1(loaded)} − ${cm1(unloaded)} = ${cm1(stretch)}.`,
        };
      },
    },
    {
      id: "stiffness-sig-figs",
      kind: "number",
      title: "Stiffness to sensible significant figures",
      generate(random) {
        const name = random.pick(STUDENTS);
        const force = random.integer(3, 9);
        // Keep values that need rounding and are not a tie at 2 figures (such as 1.25), so the
        // rounding is never a matter of convention.
        let deformation = random.uniformStep(1.1, 2.9, 0.1);
        for (let i = 0; i < 30 && Number((force / deformation).toPrecision(3)) === force / deformation; i++) {
          deformation = random.uniformStep(1.1, 2.9, 0.1);
        }
        if (Number((force / deformation).toPrecision(3)) === force / deformation) deformation = 1.3;
        const k = stiffnessNPerCm(force, deformation)!;
        const display = Number(k.toPrecision(10)).toString();
        const rounded = formatForStudent(k, "", 2);
        return {
          prompt: `${name} pulls with ${force}.0 N and works out a deformation of ${cm1(deformation)} from two ruler readings. The calculator shows ${force} ÷ ${deformation.toFixed(1)} = ${display}.\nWrite the stiffness with its unit, to as many significant figures as the measurements justify.`,
          hint: `A result gets no more significant figures than the least precise measurement. Count the figures in ${force}.0 N and in ${cm1(deformation)}.`,
          expected: {
            value: k,
            unit: "N/cm",
            tolerance: { relative: 0.06 },
            sigFigs: { count: 2, exactRounding: true },
            context: { forceN: force, deformationCm: deformation },
          },
          solution: `Both ${force}.0 N and ${cm1(deformation)} have 2 significant figures, so the stiffness gets 2: ${display} N/cm rounds to ${rounded} N/cm.`,
        };
      },
    },
  ],
};
