// Exercise generators for lesson 7 (the home lab). The water exercises are seeded per student; the
// own-data exercises are checked against the analysis of the student's own saved readings (the
// <ReadingsEntry> each one names), and wait until those readings exist.
import type { ExerciseInstance, GeneratorContext, LessonExercises } from "~/lib/exercises";
import { G_N_PER_KG, formatForStudent, stiffnessNPerCm, weightN } from "~/lib/science";

const fmt = (value: number, sig = 3) => formatForStudent(value, "", sig);
/** A value the student entered, written as entered (up to 6 figures): 0.98, 24, 23.7. */
const given = (value: number) => String(Number(value.toPrecision(6)));
/** A ruler reading or a deformation in cm, with at least the ruler's tenth: 38.0, not 38 (as lesson 1 teaches). */
const cmReading = (value: number) => {
  const text = given(value);
  return text.includes(".") ? text : `${text}.0`;
};

type OwnData = NonNullable<GeneratorContext["ownData"]>;

const RULER = { id: "ruler-readings", name: "plastic ruler", table: "the plastic ruler's readings table" } as const;
const STIRRER = { id: "stirrer-readings", name: "wooden paint stirrer", table: "the paint stirrer's readings table" } as const;
type Strip = typeof RULER | typeof STIRRER;

const WAITING_SOLUTION = "The worked solution uses your own readings; it appears once they are saved.";

/** The instance an own-data exercise shows until the readings it needs are saved. */
function waiting(strip: Strip, what: string): ExerciseInstance {
  return {
    prompt: `This question uses your own readings of the ${strip.name}. Save ${strip.table} first: the unloaded reading and at least two loads with a deformation. Then ${what}`,
    hint: `Fill in ${strip.table} above and press "Save and analyse".`,
    waitingForReadings: true,
    solution: WAITING_SOLUTION,
  };
}

/** Unbroken loaded points with a force and a deformation above 0, in order of force. */
function usablePoints(data: OwnData) {
  return data.points
    .filter(
      (p): p is typeof p & { deformationCm: number } =>
        p.deformationCm !== null &&
        p.deformationCm > 0 &&
        p.forceN > 0 &&
        Number.isFinite(p.deformationCm) &&
        (data.breakingLoadN === null || p.forceN < data.breakingLoadN),
    )
    .sort((a, b) => a.forceN - b.forceN);
}

/** The ruler reading that goes with a deformation (for naming the "gave the reading" slip), or undefined. */
function readingFor(data: OwnData, deformationCm: number): number | undefined {
  if (data.unloadedCm === null) return undefined;
  const reading = data.mode === "stretch" ? data.unloadedCm + deformationCm : data.unloadedCm - deformationCm;
  return Number.isFinite(reading) && reading > 0 ? Number(reading.toFixed(6)) : undefined;
}

/** The stiffness from the best line through the origin, when the readings give one above 0. */
function slopeOf(data: OwnData): number | null {
  const k = data.fit.throughOrigin.slope;
  return k !== null && Number.isFinite(k) && k > 0 ? k : null;
}

export const lesson: LessonExercises = {
  writtenAnswers: ["cer-home-lab"],
  exercises: [
    {
      id: "water-weight",
      kind: "number",
      title: "Weight of some water",
      generate(random) {
        const millilitres = random.pick([150, 250, 330, 350, 400, 450, 500, 550, 600, 650, 700, 750, 850]);
        const massKg = millilitres / 1000;
        const weight = weightN(massKg);
        return {
          prompt: `A bottle hanging from a strip holds ${millilitres} mL of water (100 mL of water has a mass of about 100 g).\nWhat is the weight of the water in newtons? Use g = 9.81 N/kg.`,
          hint: "First the mass in kilograms: mL of water → g → kg (÷ 1000). Then weight = mass × 9.81 N/kg.",
          expected: {
            value: weight,
            unit: "N",
            tolerance: { relative: 0.02 },
            knownWrongAnswers: [
              {
                code: "mass-number-as-newtons",
                value: massKg,
                unit: "N",
                hint: "That is the mass in kilograms with N after it. A mass is not a force: weight in N = mass in kg × 9.81 N/kg.",
              },
              {
                code: "grams-not-kilograms",
                value: millilitres * G_N_PER_KG,
                unit: "N",
                hint: "The mass was used in grams. Change it to kilograms first (÷ 1000), then multiply by 9.81 N/kg.",
              },
            ],
          },
          solution: `${millilitres} mL of water ≈ ${millilitres} g = ${given(massKg)} kg. Weight = ${given(massKg)} kg × 9.81 N/kg = ${fmt(weight)} N.`,
        };
      },
    },
    {
      id: "water-force-table",
      kind: "table",
      title: "Forces from amounts of water",
      generate(random) {
        const step = random.pick([50, 75, 100, 120, 125, 150, 200, 250]);
        // At most 1 litre in the bottle, the lesson's limit.
        const start = Math.min(random.integer(1, 3), Math.floor(1000 / step) - 2);
        const volumes = [start, start + 1, start + 2].map((i) => i * step);
        const forces = volumes.map((v) => weightN(v / 1000));
        return {
          prompt: `You add water to the hanging bottle ${step} mL at a time (100 mL of water has a mass of about 100 g). Fill in the force for each amount of water, in newtons, with g = 9.81 N/kg.`,
          hint: "For each row: mL → g → kg (÷ 1000), then × 9.81 N/kg.",
          table: {
            columns: ["Water added", "Mass", "Force"],
            rows: volumes.map((v) => [`${v} mL`, `${v} g`, null]),
          },
          cells: forces.map((f) => ({ value: f, unit: "N", tolerance: { relative: 0.02 } })),
          solution: volumes.map((v, i) => `${v} mL: ${given(v / 1000)} kg × 9.81 N/kg = ${fmt(forces[i])} N`).join("\n"),
        };
      },
    },
    {
      id: "own-ruler-largest-deformation",
      kind: "own-data",
      readingsId: RULER.id,
      title: "Your ruler: deformation at the largest load",
      generate(_random, { ownData }) {
        const what = "find the deformation at your largest load.";
        if (!ownData) return waiting(RULER, what);
        const points = usablePoints(ownData);
        if (points.length === 0 || ownData.unloadedCm === null) return waiting(RULER, what);
        const top = points[points.length - 1];
        const reading = readingFor(ownData, top.deformationCm);
        return {
          prompt: `Look at your saved readings of the ${RULER.name}. What was its deformation at your largest load, ${given(top.forceN)} N? Give a unit.`,
          hint: "Deformation = unloaded reading − loaded reading, using the row with your largest force.",
          expected: {
            value: top.deformationCm,
            unit: "cm",
            tolerance: { absolute: 0.05 },
            context: { forceN: top.forceN, deformationCm: top.deformationCm, loadedReadingCm: reading },
          },
          solution:
            reading !== undefined && ownData.mode === "bend"
              ? `Deformation = ${cmReading(ownData.unloadedCm)} cm − ${cmReading(reading)} cm = ${cmReading(top.deformationCm)} cm.`
              : `From your readings, the deformation at ${given(top.forceN)} N is ${cmReading(top.deformationCm)} cm.`,
        };
      },
    },
    {
      id: "own-ruler-largest-stiffness",
      kind: "own-data",
      readingsId: RULER.id,
      title: "Your ruler: stiffness of the largest-load reading",
      generate(_random, { ownData }) {
        const what = "find the stiffness of the reading at your largest load.";
        if (!ownData) return waiting(RULER, what);
        const points = usablePoints(ownData);
        if (points.length === 0) return waiting(RULER, what);
        const top = points[points.length - 1];
        const k = stiffnessNPerCm(top.forceN, top.deformationCm)!;
        return {
          prompt: `Using the reading of the ${RULER.name} at your largest load (${given(top.forceN)} N), what is the stiffness of that one reading, in N/cm?`,
          hint: "Stiffness of one reading = force ÷ deformation. Find the deformation first: unloaded reading − loaded reading.",
          expected: {
            value: k,
            unit: "N/cm",
            tolerance: { relative: 0.03 },
            context: { forceN: top.forceN, deformationCm: top.deformationCm, loadedReadingCm: readingFor(ownData, top.deformationCm) },
          },
          solution: `k = ${given(top.forceN)} N ÷ ${cmReading(top.deformationCm)} cm = ${fmt(k)} N/cm.`,
        };
      },
    },
    {
      id: "own-ruler-predict",
      kind: "own-data",
      readingsId: RULER.id,
      title: "Your ruler: predicting a bend",
      generate(random, { ownData }) {
        const force = random.uniformStep(1.5, 5, 0.5);
        const what = `predict the bend under ${given(force)} N.`;
        if (!ownData) return waiting(RULER, what);
        const k = slopeOf(ownData);
        if (k === null) return waiting(RULER, what);
        const x = force / k;
        return {
          prompt: `Use the stiffness of your ${RULER.name} from the best line through the origin of your readings (shown under your table). How far would your ruler bend under a load of ${given(force)} N? Give a unit.`,
          hint: "Deformation = force ÷ stiffness, with the stiffness from your best line through the origin.",
          expected: {
            value: x,
            unit: "cm",
            tolerance: { relative: 0.03 },
            context: { forceN: force },
            knownWrongAnswers: [
              {
                code: "multiplied-not-divided",
                value: force * k,
                unit: "cm",
                hint: "It looks like the force was multiplied by the stiffness. Deformation = force ÷ stiffness.",
              },
            ],
          },
          solution: `Your best line through the origin gives k = ${fmt(k)} N/cm. Deformation = ${given(force)} N ÷ ${fmt(k)} N/cm = ${fmt(x)} cm.`,
        };
      },
    },
    {
      id: "own-stirrer-force-for-bend",
      kind: "own-data",
      readingsId: STIRRER.id,
      title: "Your stirrer: force for a given bend",
      generate(random, { ownData }) {
        const bend = random.uniformStep(0.3, 1.2, 0.1);
        const what = `find the force that would bend it by ${bend.toFixed(1)} cm.`;
        if (!ownData) return waiting(STIRRER, what);
        const k = slopeOf(ownData);
        if (k === null) return waiting(STIRRER, what);
        const force = k * bend;
        return {
          prompt: `Use the stiffness of your ${STIRRER.name} from the best line through the origin of your readings (shown under your table). What force would bend it by ${bend.toFixed(1)} cm? Give a unit.`,
          hint: "Turn k = F ÷ Δx around: F = k × Δx.",
          expected: {
            value: force,
            unit: "N",
            tolerance: { relative: 0.03 },
            knownWrongAnswers: [
              {
                code: "divided-not-multiplied",
                value: bend / k,
                unit: "N",
                hint: "Force = stiffness × deformation. It looks like a division was done instead.",
              },
            ],
          },
          solution: `Your best line through the origin gives k = ${fmt(k)} N/cm. F = ${fmt(k)} N/cm × ${bend.toFixed(1)} cm = ${fmt(force)} N.`,
        };
      },
    },
    {
      id: "own-stirrer-stiffness",
      kind: "own-data",
      readingsId: STIRRER.id,
      title: "Your stirrer: stiffness of the largest-load reading",
      generate(_random, { ownData }) {
        const what = "find the stiffness of the reading at your largest load.";
        if (!ownData) return waiting(STIRRER, what);
        const points = usablePoints(ownData);
        if (points.length === 0) return waiting(STIRRER, what);
        const top = points[points.length - 1];
        const k = stiffnessNPerCm(top.forceN, top.deformationCm)!;
        const slope = slopeOf(ownData);
        return {
          prompt: `Using the reading of the ${STIRRER.name} at your largest load (${given(top.forceN)} N), what is the stiffness of that one reading, in N/cm? Then compare it with the stiffness from your best line.`,
          hint: "Stiffness of one reading = force ÷ deformation. Find the deformation first: unloaded reading − loaded reading.",
          expected: {
            value: k,
            unit: "N/cm",
            tolerance: { relative: 0.03 },
            context: { forceN: top.forceN, deformationCm: top.deformationCm, loadedReadingCm: readingFor(ownData, top.deformationCm) },
          },
          solution: `k = ${given(top.forceN)} N ÷ ${cmReading(top.deformationCm)} cm = ${fmt(k)} N/cm.${
            slope !== null ? ` Your best line through the origin gives ${fmt(slope)} N/cm; the line uses every reading, so it is the better value for the stirrer.` : ""
          }`,
        };
      },
    },
  ],
};
