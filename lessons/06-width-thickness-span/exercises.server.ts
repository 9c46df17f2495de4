// Exercise generators for lesson 6 (width, thickness and span). Numbers come from each student's
// seed; the expected answers and worked solutions stay on the server. Sizes and loads are invented;
// the Young's moduli are typical values (real pieces vary, wood especially).
import type { LessonExercises } from "~/lib/exercises";
import type { SeededRandom } from "~/lib/seeded-random";
import {
  beamStiffnessNPerM,
  beamStiffnessScale,
  formatForStudent,
  gluedStackStiffness,
  midspanDeflectionM,
  secondMomentRectangleM4,
  sideBySideStiffness,
  youngsModulusFromTestPa,
} from "~/lib/science";

const fmt = (value: number, sig = 3) => formatForStudent(value, "", sig);
/** A given value written as given: 1.5, 20, 0.25. */
const given = (value: number) => String(Number(value.toPrecision(6)));
const M4_PER_MM4 = 1e-12;

/** "A basswood", "An aluminium": the start of a sentence. */
const withArticle = (word: string) => `${/^[aeiou]/i.test(word) ? "An" : "A"} ${word}`;

/**
 * Typical moduli (GPa) of materials a class might test (real pieces vary), and a bending stress
 * (MPa) kept well below where each would break or stay bent, so the invented loads stay elastic.
 * The stress caps are our own cautious round numbers (common practice, no source).
 */
const MATERIALS = [
  { name: "basswood", gpa: 10, maxStressMpa: 25 },
  { name: "pine", gpa: 9, maxStressMpa: 25 },
  { name: "acrylic plastic", gpa: 3, maxStressMpa: 30 },
  { name: "aluminium", gpa: 70, maxStressMpa: 50 },
] as const;

/** Largest bending stress (MPa) at the middle of a simply supported strip with a central load: (F·L/4)·(h/2)/I. */
const bendingStressMpa = (forceN: number, spanM: number, thicknessM: number, iM4: number) =>
  ((forceN * spanM) / 4) * (thicknessM / 2) / iM4 / 1e6;

/**
 * Two spans (cm) and a bend (cm) at the first whose bend at the second is one a ruler can read (at
 * least 0.1 cm) and the beam formula still fits (at most a tenth of the new span). Drawn again until
 * it is; most draws are at once.
 */
function plausibleSpanChange(random: SeededRandom) {
  for (let attempt = 0; attempt < 60; attempt++) {
    const from = random.pick([15, 20, 25, 30]);
    let to = random.pick([10, 15, 20, 25, 30, 35, 40]);
    if (to === from) to = from + 10;
    const deflection = random.uniformStep(0.4, 1.5, 0.1);
    const scale = 1 / beamStiffnessScale({ span: to / from });
    const newDeflection = deflection * scale;
    if (newDeflection >= 0.1 && newDeflection <= to / 10) return { from, to, deflection, scale, newDeflection };
  }
  const scale = 1 / beamStiffnessScale({ span: 25 / 20 });
  return { from: 20, to: 25, deflection: 1, scale, newDeflection: scale };
}

/**
 * A strip (width, thickness in mm, span in cm) and a load (N) whose midspan deflection is between
 * 2 and 20 mm and under a tenth of the span: a bend a ruler can read and the beam formula still fits.
 */
function plausibleBeam(random: SeededRandom) {
  for (let attempt = 0; attempt < 60; attempt++) {
    const material = random.pick(MATERIALS);
    const widthMm = random.pick([10, 12, 15, 20, 25, 30]);
    const thicknessMm = random.pick([1, 1.5, 2, 2.5, 3, 4, 5]);
    const spanCm = random.pick([20, 25, 30, 35, 40]);
    const forceN = random.uniformStep(1, 10, 0.5);
    const iM4 = secondMomentRectangleM4(widthMm / 1000, thicknessMm / 1000);
    const deflectionM = midspanDeflectionM(forceN, spanCm / 100, material.gpa * 1e9, iM4);
    const stress = bendingStressMpa(forceN, spanCm / 100, thicknessMm / 1000, iM4);
    if (deflectionM >= 0.002 && deflectionM <= 0.02 && deflectionM <= spanCm / 100 / 10 && stress <= material.maxStressMpa) {
      return { material, widthMm, thicknessMm, spanCm, forceN, iM4, deflectionM };
    }
  }
  const material = MATERIALS[0];
  const iM4 = secondMomentRectangleM4(0.02, 0.003);
  return { material, widthMm: 20, thicknessMm: 3, spanCm: 30, forceN: 3, iM4, deflectionM: midspanDeflectionM(3, 0.3, 10e9, iM4) };
}

export const lesson: LessonExercises = {
  writtenAnswers: ["cer-glued-stack"],
  exercises: [
    {
      id: "second-moment",
      kind: "number",
      title: "Second moment of area of a strip",
      generate(random) {
        const b = random.pick([8, 10, 12, 15, 18, 20, 25, 30]);
        const h = random.pick([1, 1.5, 2, 2.5, 3, 4, 5, 6]);
        const iMm4 = secondMomentRectangleM4(b / 1000, h / 1000) / M4_PER_MM4;
        return {
          prompt: `A strip is ${b} mm wide and ${given(h)} mm thick, and it bends in the direction of its thickness.\nWhat is its second moment of area I = b·h³/12, in mm⁴?`,
          hint: "Cube the thickness (h × h × h), multiply by the width, then divide by 12. mm × mm³ = mm⁴.",
          expected: {
            value: iMm4,
            unit: "mm^4",
            tolerance: { relative: 0.02 },
            knownWrongAnswers: [
              {
                code: "width-and-thickness-swapped",
                value: (h * b ** 3) / 12,
                unit: "mm^4",
                hint: "Width and thickness are swapped. The thickness h, in the direction of bending, is the one that is cubed.",
              },
              {
                code: "forgot-twelve",
                value: b * h ** 3,
                unit: "mm^4",
                hint: "That is b·h³. Divide by 12.",
              },
              {
                code: "squared-not-cubed",
                value: (b * h ** 2) / 12,
                unit: "mm^4",
                hint: "The thickness is cubed (h × h × h), not squared.",
              },
            ],
          },
          solution: `I = b·h³/12 = ${b} mm × (${given(h)} mm)³ ÷ 12 = ${b} × ${given(h ** 3)} ÷ 12 mm⁴ = ${fmt(iMm4)} mm⁴.`,
        };
      },
    },
    {
      id: "thickness-factor",
      kind: "ratio",
      title: "Thicker strip, how much stiffer?",
      generate(random) {
        const from = random.pick([1, 1.5, 2, 3]);
        const factor = random.pick([1.5, 2, 2.5, 3]);
        const to = from * factor;
        const material = random.pick(MATERIALS).name;
        const scale = beamStiffnessScale({ thickness: factor });
        return {
          prompt: `${withArticle(material)} strip ${given(from)} mm thick is swapped for one of the same width and length but ${given(to)} mm thick.\nHow many times as stiff is the new strip? Give a plain number.`,
          hint: "Stiffness goes with thickness cubed. Find how many times as thick the new strip is, then cube that number.",
          expected: {
            value: scale,
            unit: "",
            tolerance: { relative: 0.02 },
            knownWrongAnswers: [
              { code: "not-cubed", value: factor, unit: "", hint: "That is how many times as thick it is. Stiffness goes with thickness cubed." },
              { code: "squared-not-cubed", value: factor ** 2, unit: "", hint: "Stiffness goes with thickness cubed, not squared." },
            ],
          },
          solution: `${given(to)} mm ÷ ${given(from)} mm = ${given(factor)} times as thick. Stiffness goes with thickness³: ${given(factor)}³ = ${fmt(scale)} times as stiff.`,
        };
      },
    },
    {
      id: "glued-vs-loose",
      kind: "ratio",
      title: "Glued stack against loose bundle",
      generate(random) {
        const n = random.integer(2, 5);
        const k = random.uniformStep(0.5, 2.5, 0.1);
        const loose = sideBySideStiffness(k, n);
        const glued = gluedStackStiffness(k, n);
        const ratio = glued / loose;
        return {
          prompt: `One strip has a stiffness of ${given(k)} N/cm. ${n} of these strips are tested twice: lying loosely on top of each other, and glued face to face into one thick strip.\nHow many times as stiff as the loose ${n} is the glued stack? Give a plain number.`,
          hint: "Loose strips act like strips side by side: n × k. Glued, they make one strip n times as thick: n³ × k. Divide one by the other.",
          expected: {
            value: ratio,
            unit: "",
            tolerance: { relative: 0.02 },
            knownWrongAnswers: [
              { code: "compared-with-one-strip", value: n ** 3, unit: "", hint: "That compares the glued stack with one strip. Compare it with the loose bundle of the same strips (n × k)." },
              { code: "thickness-not-cubed", value: 1, unit: "", hint: "Gluing does not just add the strips up: the stack is one piece n times as thick, and stiffness goes with thickness cubed." },
            ],
          },
          solution: `Loose: ${n} × ${given(k)} N/cm = ${fmt(loose)} N/cm. Glued: ${n}³ × ${given(k)} N/cm = ${fmt(glued)} N/cm.\n${fmt(glued)} ÷ ${fmt(loose)} = ${fmt(ratio)}, that is ${n}³ ÷ ${n} = ${n}².`,
        };
      },
    },
    {
      id: "span-change",
      kind: "number",
      title: "A longer or shorter span",
      generate(random) {
        const { from, to, deflection, scale, newDeflection } = plausibleSpanChange(random);
        return {
          prompt: `A strip on supports ${from} cm apart bends ${deflection.toFixed(1)} cm under a load at its middle. The supports are moved to ${to} cm apart, and the same load is hung at the middle again.\nHow far does it bend now? Give a unit.`,
          hint: "The bend goes with the span cubed: multiply by (new span ÷ old span)³.",
          expected: {
            value: newDeflection,
            unit: "cm",
            tolerance: { relative: 0.02 },
            knownWrongAnswers: [
              {
                code: "span-not-cubed",
                value: deflection * (to / from),
                unit: "cm",
                hint: "The bend does not simply grow with the span: it grows with the span cubed.",
              },
              {
                code: "ratio-upside-down",
                value: deflection * (from / to) ** 3,
                unit: "cm",
                hint: "The span ratio is upside down. A longer span must give a bigger bend: multiply by (new span ÷ old span)³.",
              },
            ],
          },
          solution: `(${to} cm ÷ ${from} cm)³ = ${fmt(to / from)}³ = ${fmt(scale)}. New bend = ${deflection.toFixed(1)} cm × ${fmt(scale)} = ${fmt(newDeflection)} cm.`,
        };
      },
    },
    {
      id: "stiffest-change",
      kind: "choice",
      title: "Which change stiffens the strip most?",
      generate(random) {
        let widthFactor = 2;
        let thicknessFactor = 1.5;
        let spanFactor = 0.75;
        let gains = [0, 0, 0];
        for (let attempt = 0; attempt < 30; attempt++) {
          widthFactor = random.pick([2, 3, 4, 5]);
          thicknessFactor = random.pick([1.25, 1.5, 2]);
          spanFactor = random.pick([0.5, 0.6, 0.7, 0.8]);
          gains = [
            beamStiffnessScale({ width: widthFactor }),
            beamStiffnessScale({ thickness: thicknessFactor }),
            beamStiffnessScale({ span: spanFactor }),
          ];
          const sorted = [...gains].sort((a, b) => b - a);
          if (sorted[0] - sorted[1] > 0.3) break; // a clear winner, never a tie
        }
        const values = ["width", "thickness", "span"];
        const best = values[gains.indexOf(Math.max(...gains))];
        const percentShorter = Math.round((1 - spanFactor) * 100);
        return {
          prompt: `A shelf strip bends too much. You may make exactly one of these changes:\n(a) make it ${widthFactor} times as wide; (b) make it ${given(thicknessFactor)} times as thick; (c) move the supports closer, so the span is ${percentShorter} % shorter.\nWhich change makes it stiffest?`,
          hint: "Stiffness goes with width × thickness³ ÷ span³. Work out the factor for each change on its own.",
          choices: [
            { value: "width", label: `(a) ${widthFactor} times as wide` },
            { value: "thickness", label: `(b) ${given(thicknessFactor)} times as thick` },
            { value: "span", label: `(c) a span ${percentShorter} % shorter` },
          ],
          correctChoice: best,
          solution: `(a) width × ${widthFactor}: ${fmt(gains[0])} times as stiff. (b) thickness × ${given(thicknessFactor)}: ${given(thicknessFactor)}³ = ${fmt(gains[1])} times. (c) span × ${given(spanFactor)}: 1 ÷ ${given(spanFactor)}³ = ${fmt(gains[2])} times. The biggest is (${best === "width" ? "a" : best === "thickness" ? "b" : "c"}).`,
        };
      },
    },
    {
      id: "midspan-deflection",
      kind: "number",
      title: "Predicting a bend with the beam formula",
      generate(random) {
        const beam = plausibleBeam(random);
        const { material, widthMm, thicknessMm, spanCm, forceN, iM4, deflectionM } = beam;
        const deflectionMm = deflectionM * 1000;
        return {
          prompt: `${withArticle(material.name)} strip (typical Young's modulus ${material.gpa} GPa) is ${widthMm} mm wide and ${given(thicknessMm)} mm thick. It rests on supports ${spanCm} cm apart, with a load of ${given(forceN)} N at its middle.\nUse δ = F·L³ / (48·E·I) with I = b·h³/12 to predict the bend at the middle, in mm.`,
          hint: "Convert everything to SI first: mm to m (÷ 1000), cm to m (÷ 100), GPa to Pa (× 10⁹). Find I in m⁴, then δ in m, then change δ to mm.",
          expected: {
            value: deflectionMm,
            unit: "mm",
            tolerance: { relative: 0.03 },
            context: { forceN },
          },
          solution: `I = ${given(widthMm / 1000)} m × (${given(thicknessMm / 1000)} m)³ ÷ 12 = ${fmt(iM4)} m⁴.\nδ = ${given(forceN)} N × (${given(spanCm / 100)} m)³ ÷ (48 × ${material.gpa} × 10^9 Pa × ${fmt(iM4)} m⁴) = ${fmt(deflectionM)} m = ${fmt(deflectionMm)} mm.`,
        };
      },
    },
    {
      id: "youngs-modulus",
      kind: "number",
      title: "Young's modulus from a bending test",
      generate(random) {
        // A wood strip whose true modulus lies in the typical range; the bend is read with a ruler to 0.1 cm.
        for (let attempt = 0; attempt < 40; attempt++) {
          const trueGpa = random.uniformStep(7, 13, 0.5);
          const widthMm = random.pick([10, 15, 20, 25]);
          const thicknessMm = random.pick([1.5, 2, 2.5]);
          const spanCm = random.pick([25, 30, 35, 40]);
          const forceN = random.integer(2, 10);
          const iM4 = secondMomentRectangleM4(widthMm / 1000, thicknessMm / 1000);
          const readCm = Number((((forceN / beamStiffnessNPerM(spanCm / 100, trueGpa * 1e9, iM4)) * 100)).toFixed(1));
          if (readCm < 0.8 || readCm > 3 || bendingStressMpa(forceN, spanCm / 100, thicknessMm / 1000, iM4) > 25) continue;
          const ePa = youngsModulusFromTestPa(forceN, spanCm / 100, iM4, readCm / 100);
          const eGpa = ePa / 1e9;
          return {
            prompt: `A wooden strip ${widthMm} mm wide and ${given(thicknessMm)} mm thick rests on supports ${spanCm} cm apart. A load of ${forceN} N at its middle bends it ${readCm.toFixed(1)} cm.\nUse E = F·L³ / (48·I·δ) with I = b·h³/12 to find the wood's Young's modulus, in GPa.`,
            hint: "Work in SI: widths and thicknesses in m, the span and the bend in m. E comes out in Pa; divide by 10⁹ for GPa.",
            expected: { value: eGpa, unit: "GPa", tolerance: { relative: 0.03 } },
            solution: `I = ${given(widthMm / 1000)} m × (${given(thicknessMm / 1000)} m)³ ÷ 12 = ${fmt(iM4)} m⁴.\nE = ${forceN} N × (${given(spanCm / 100)} m)³ ÷ (48 × ${fmt(iM4)} m⁴ × ${given(readCm / 100)} m) = ${fmt(ePa)} Pa = ${fmt(eGpa)} GPa. (A bend read to 0.1 cm makes this good to a few per cent at best.)`,
          };
        }
        const iM4 = secondMomentRectangleM4(0.02, 0.002);
        const ePa = youngsModulusFromTestPa(4, 0.25, iM4, 0.013);
        return {
          prompt: `A wooden strip 20 mm wide and 2 mm thick rests on supports 25 cm apart. A load of 4 N at its middle bends it 1.3 cm.\nUse E = F·L³ / (48·I·δ) with I = b·h³/12 to find the wood's Young's modulus, in GPa.`,
          hint: "Work in SI: widths and thicknesses in m, the span and the bend in m. E comes out in Pa; divide by 10⁹ for GPa.",
          expected: { value: ePa / 1e9, unit: "GPa", tolerance: { relative: 0.03 } },
          solution: `I = 0.02 m × (0.002 m)³ ÷ 12 = ${fmt(iM4)} m⁴.\nE = 4 N × (0.25 m)³ ÷ (48 × ${fmt(iM4)} m⁴ × 0.013 m) = ${fmt(ePa)} Pa = ${fmt(ePa / 1e9)} GPa.`,
        };
      },
    },
  ],
};
