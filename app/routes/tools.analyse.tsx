// /tools/analyse — anyone can paste or type a table of readings and see the same analysis as
// POST /api/analysis: deformations, stiffness of each reading, both fitted lines, the verdict, a chart.
import { useEffect, useRef, useState } from "react";
import { data, Form, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/tools.analyse";
import { db } from "~/db/client.server";
import { AnalysisReport, pointPlace } from "~/components/analysis-report";
import { assertSameOrigin } from "~/lib/auth.server";
import { clientAddress } from "~/lib/auth/throttle.server";
import { oneForceProblem, parseAnalysisRequest } from "~/lib/analysis-request";
import { hitRateLimit } from "~/lib/rate-limit.server";
import { asSentence, cellProblem, echo, parseReadingsText, readCell } from "~/lib/readings-text";
import { analyseReadings, implausibleReadings } from "~/lib/science";
import { ANALYSIS_REQUESTS_PER_MINUTE } from "./api.analysis";
import { keepInTab, readInTab } from "~/lib/tab-storage";
import { SendButton } from "~/components/send-button";

/**
 * The range of "Ruler read to": a ruler or tape measure in this lab is read to its millimetre marks
 * (0.1 cm), to half a mark at best (0.05 cm) or to whole centimetres at worst (1 cm). Finer than
 * 0.01 cm is a caliper's reading, not a ruler's; coarser than 1 cm is no reading of a ruler at all
 * (common practice, no source). The proportionality verdict and the elastic limit are judged against
 * this step, so a wrong one silently changes both.
 */
export const FINEST_RESOLUTION_CM = 0.01;
export const COARSEST_RESOLUTION_CM = 1;

const text = (field: string, most: number, example: string) =>
  z
    .string({ error: `${field} must be typed as text.` })
    .max(most, { error: `${field} is too long: write it in at most ${most} characters, such as ${example}.` });

const formSchema = z.object({
  mode: z.enum(["bend", "stretch"], { error: "Choose what happens to the piece: it bends or it stretches." }).default("bend"),
  secondColumn: z
    .enum(["reading", "deformation"], { error: "Choose what the second column is: the ruler reading or the deformation." })
    .default("reading"),
  unloadedCm: text("The unloaded reading", 40, "21.0").default(""),
  resolutionCm: text("“Ruler read to”", 40, "0.1").default("0.1"),
  readings: z
    .string({ error: "The readings must be typed or pasted as text." })
    .max(60_000, { error: "The readings are too long: paste at most 1000 lines." })
    .default(""),
});
type FormValues = z.infer<typeof formSchema>;

const BLANK: FormValues = { mode: "bend", secondColumn: "reading", unloadedCm: "", resolutionCm: "0.1", readings: "" };

/** Shown in the empty box as a placeholder, and put into it only by "Fill in the example". */
const EXAMPLE = `force (N), loaded reading (cm)
0, 21.0
1, 20.6
2, 20.1
3, 19.7
4, 19.2
5, 18.8`;
const EXAMPLE_UNLOADED = "21.0";

/** Problems naming a line first, in line order; then those about the other fields, as they came. */
function inLineOrder(problems: readonly string[]): string[] {
  const line = (p: string) => Number(/^Line (\d+):/.exec(p)?.[1] ?? Number.POSITIVE_INFINITY);
  return [...new Set(problems)].sort((a, b) => line(a) - line(b));
}

/** The fields as typed (a field that is not text is left blank), for a form refused before reading and the form kept in the tab. */
function typedValues(form: Record<string, unknown>): FormValues {
  const field = (name: keyof FormValues, most: number) => (typeof form[name] === "string" ? (form[name] as string).slice(0, most) : BLANK[name]);
  return {
    mode: form.mode === "stretch" ? "stretch" : "bend",
    secondColumn: form.secondColumn === "deformation" ? "deformation" : "reading",
    unloadedCm: field("unloadedCm", 1000),
    resolutionCm: field("resolutionCm", 1000),
    readings: field("readings", 60_000),
  };
}

export async function action({ request }: Route.ActionArgs) {
  assertSameOrigin(request);
  const limit = await hitRateLimit({ db }, `analysis:${clientAddress(request)}`, ANALYSIS_REQUESTS_PER_MINUTE);
  const form = Object.fromEntries(await request.formData());
  const parsed = formSchema.safeParse(form);
  if (!parsed.success) {
    return data({ values: typedValues(form), problems: parsed.error.issues.map((i) => i.message), lines: [] as number[], analysis: null }, { status: 400 });
  }
  const values = parsed.data;
  if (!limit.allowed) {
    return data({ values, problems: [`Too many analyses from here: try again in ${limit.retryAfter} seconds.`], lines: [] as number[], analysis: null }, { status: 429 });
  }
  const { points, lines, problems } = parseReadingsText(values.readings, values.secondColumn);
  // A line that could not be read may be the one with another force: "one force throughout" would mislead then.
  const oneForceNotClaimed = problems.length > 0 ? `points: ${oneForceProblem(points)}` : null;
  const unloadedText = values.unloadedCm.trim();
  const unloadedCell = unloadedText === "" ? undefined : readCell(unloadedText, "cm", true);
  const unloaded = unloadedCell === undefined ? undefined : unloadedCell.ok ? unloadedCell.value : Number.NaN;
  if (values.secondColumn === "reading" && unloaded === undefined) problems.push("Give the unloaded reading: deformations are worked out from it.");
  if (unloadedCell !== undefined && !unloadedCell.ok) problems.push(asSentence(cellProblem("unloaded reading", unloadedText, "cm", unloadedCell)));
  const resolutionText = values.resolutionCm.trim();
  const resolutionCm = resolutionText === "" ? Number.NaN : Number(resolutionText.replace(",", "."));
  if (Number.isFinite(resolutionCm) && (resolutionCm < FINEST_RESOLUTION_CM || resolutionCm > COARSEST_RESOLUTION_CM)) {
    problems.push(resolutionProblem(resolutionText));
  }
  const checked = parseAnalysisRequest({ mode: values.mode, unloadedCm: unloaded, resolutionCm, points });
  if (checked.ok) {
    for (const i of implausibleReadings(checked.data)) {
      problems.push(i.point === null ? asSentence(i.problem) : `Line ${lines[i.point] ?? i.point + 1}: ${i.problem}`);
    }
  }
  if (problems.length > 0 || !checked.ok) {
    // A field already named by its own problem is not named twice.
    const named = ["unloaded reading", "Ruler read to"].filter((field) => problems.some((p) => p.includes(field)));
    const fromChecks = checked.ok
      ? []
      : checked.errors
          .filter((e) => e !== oneForceNotClaimed)
          .map((e) => inFormWords(e, lines))
          .filter((p) => !named.some((field) => p.includes(field)));
    return data({ values, problems: inLineOrder([...problems, ...fromChecks]), lines, analysis: null }, { status: 400 });
  }
  return { values, problems: [] as string[], lines, analysis: analyseReadings(checked.data) };
}

function resolutionProblem(typed: string): string {
  return `“Ruler read to” is ${echo(typed)} cm, but it must be between ${FINEST_RESOLUTION_CM} cm and ${COARSEST_RESOLUTION_CM} cm: the smallest step you read on your ruler, such as 0.1 for millimetre marks.`;
}

/**
 * The analysis checks speak to programmers ("points[2].forceN: forceN must be 0 or more"); this page
 * names the same problems in the words of its own form, with the line of the pasted text.
 */
function inFormWords(error: string, lines: number[]): string {
  const point = /^points\[(\d+)\]\.(\w+): (.*)$/.exec(error);
  if (point) {
    const where = `Line ${lines[Number(point[1])] ?? Number(point[1]) + 1}`;
    if (point[2] === "forceN" && point[3].includes("0 or more")) return `${where}: the force must be 0 or more.`;
    return `${where}: a number could not be read.`;
  }
  if (error.startsWith("unloadedCm:")) {
    return error.includes("needed")
      ? "Give the unloaded reading: deformations are worked out from it."
      : "The unloaded reading is not a number.";
  }
  if (error.startsWith("resolutionCm:")) return `“Ruler read to” needs a number in centimetres, between ${FINEST_RESOLUTION_CM} and ${COARSEST_RESOLUTION_CM}, such as 0.1.`;
  if (error.startsWith("points: give at least")) return "Give at least two loading steps, one per line: the force, then the reading.";
  if (error.startsWith("points: give at most")) return "Paste at most 1000 loading steps.";
  // Problems already in plain words (one force throughout): without the field's name, as a sentence.
  const words = error.replace(/^[\w.[\]]+: /, "");
  return words.charAt(0).toUpperCase() + words.slice(1);
}

/** Where this tab keeps the form while it is open (sessionStorage: never sent, gone with the tab). */
const KEPT_FORM_KEY = "bendwise:analyse-form";

/** The form kept in this tab, or null when there is none or it cannot be read (read without zod: zod stays on the server). */
function keptForm(): FormValues | null {
  const kept = readInTab(KEPT_FORM_KEY);
  return typeof kept === "object" && kept !== null ? typedValues(kept as Record<string, unknown>) : null;
}

export default function AnalyseReadings({ actionData }: Route.ComponentProps) {
  const [values, setValues] = useState<FormValues>(actionData?.values ?? BLANK);
  // What was typed before a reload comes back once the page is in the browser (the server cannot know it).
  useEffect(() => {
    const kept = actionData ? null : keptForm();
    if (kept) setValues(kept);
  }, []); // once, on the first render in the browser
  const change = (patch: Partial<FormValues>) =>
    setValues((v) => {
      const next = { ...v, ...patch };
      keepInTab(KEPT_FORM_KEY, next);
      return next;
    });
  const analysis = actionData?.analysis ?? null;
  const lines = actionData?.lines ?? [];
  const busy = useNavigation().state !== "idle";
  const readingsBox = useRef<HTMLTextAreaElement>(null);
  return (
    <div className="mx-auto max-w-5xl px-5 py-10">
      <h1 className="mb-2 text-[length:var(--text-step-3)]">Analyse your readings</h1>
      <p className="prose-reading mb-6 text-ink-soft">
        Paste or type one loading step per line, from the smallest load up: the force in newtons, then the ruler reading in
        centimetres, and — if you took them — the reading after the load came off and the word “broke” where the piece broke.
        Nothing you type leaves this browser until you press Analyse, and nothing is saved on our side; this tab keeps what you
        typed until you close it, press Clear or sign out.
      </p>
      <Form method="post" className="card mb-8 grid gap-4 font-ui print:hidden md:grid-cols-2">
        <div className="md:row-span-4">
          <label htmlFor="readings" className="mb-1 block font-bold">Readings</label>
          <textarea
            ref={readingsBox}
            id="readings"
            name="readings"
            rows={12}
            className="field font-mono placeholder:text-ink-soft"
            value={values.readings}
            onChange={(e) => change({ readings: e.target.value })}
            placeholder={`For example:\n${EXAMPLE}`}
            aria-describedby="readings-help"
            spellCheck={false}
          />
          <p id="readings-help" className="mt-1 text-ink-soft">The grey example is only a placeholder: it is never analysed.</p>
          <div className="mt-2 flex flex-wrap gap-3">
            <button
              type="button"
              className="btn btn-quiet"
              onClick={() => change({ mode: "bend", secondColumn: "reading", unloadedCm: EXAMPLE_UNLOADED, resolutionCm: "0.1", readings: EXAMPLE })}
            >
              Fill in the example
            </button>
            <button type="button" className="btn btn-quiet" onClick={() => {
                keepInTab(KEPT_FORM_KEY, null);
                setValues(BLANK);
                readingsBox.current?.focus();
              }}
            >
              Clear
            </button>
          </div>
        </div>
        <fieldset>
          <legend className="mb-1 font-bold">What happens to the piece?</legend>
          <label className="mr-4 inline-flex items-center gap-2">
            <input type="radio" name="mode" value="bend" checked={values.mode === "bend"} onChange={() => change({ mode: "bend" })} className="h-5 w-5" /> It bends (reading goes down)
          </label>
          <label className="inline-flex items-center gap-2">
            <input type="radio" name="mode" value="stretch" checked={values.mode === "stretch"} onChange={() => change({ mode: "stretch" })} className="h-5 w-5" /> It stretches (length goes up)
          </label>
        </fieldset>
        <fieldset>
          <legend className="mb-1 font-bold">The second column is</legend>
          <label className="mr-4 inline-flex items-center gap-2">
            <input type="radio" name="secondColumn" value="reading" checked={values.secondColumn === "reading"} onChange={() => change({ secondColumn: "reading" })} className="h-5 w-5" /> the ruler reading
          </label>
          <label className="inline-flex items-center gap-2">
            <input type="radio" name="secondColumn" value="deformation" checked={values.secondColumn === "deformation"} onChange={() => change({ secondColumn: "deformation" })} className="h-5 w-5" /> the deformation
          </label>
        </fieldset>
        <div className="grid grid-cols-2 gap-3">
          <label className="block">
            <span className="mb-1 block font-bold">Unloaded reading (cm)</span>
            <input name="unloadedCm" className="field placeholder:text-ink-soft" inputMode="decimal" placeholder={`e.g. ${EXAMPLE_UNLOADED}`} value={values.unloadedCm} onChange={(e) => change({ unloadedCm: e.target.value })} />
          </label>
          <label className="block">
            <span className="mb-1 block font-bold">Ruler read to (cm)</span>
            <input name="resolutionCm" className="field" inputMode="decimal" value={values.resolutionCm} onChange={(e) => change({ resolutionCm: e.target.value })} />
          </label>
        </div>
        <div>
          <SendButton className="btn" busy={busy}>
            {busy ? "Working it out…" : "Analyse"}
          </SendButton>
        </div>
      </Form>
      {actionData && actionData.problems.length > 0 && (
        <div role="alert" className="mb-8 rounded bg-ember-wash p-4 font-ui">
          <p className="font-bold text-danger">Please fix these and try again:</p>
          <ul className="list-disc pl-5">
            {actionData.problems.map((p) => (
              <li key={p}>{p}</li>
            ))}
          </ul>
        </div>
      )}
      {analysis && actionData && (
        <AnalysisReport
          analysis={analysis}
          resolutionCm={Number(actionData.values.resolutionCm.replace(",", ".")) || 0.1}
          placeOf={pointPlace("Line", (point) => lines[point] ?? point + 1)}
        />
      )}
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Analyse your readings — Bendwise" }];
