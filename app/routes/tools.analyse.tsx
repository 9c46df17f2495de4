// /tools/analyse — anyone can paste or type a table of readings and see the same analysis as
// POST /api/analysis: deformations, stiffness of each reading, both fitted lines, the verdict, a chart.
import { data, Form, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/tools.analyse";
import { db } from "~/db/client.server";
import { AnalysisReport } from "~/components/analysis-report";
import { assertSameOrigin } from "~/lib/auth.server";
import { clientAddress } from "~/lib/auth/throttle.server";
import { oneForceProblem, parseAnalysisRequest } from "~/lib/analysis-request";
import { hitRateLimit } from "~/lib/rate-limit.server";
import { asSentence, cellProblem, parseReadingsText, readCell } from "~/lib/readings-text";
import { analyseReadings, implausibleReadings } from "~/lib/science";
import { ANALYSIS_REQUESTS_PER_MINUTE } from "./api.analysis";
import { SendButton } from "~/components/send-button";

const formSchema = z.object({
  mode: z.enum(["bend", "stretch"]).default("bend"),
  secondColumn: z.enum(["reading", "deformation"]).default("reading"),
  unloadedCm: z.string().max(40).default(""),
  resolutionCm: z.string().max(40).default("0.1"),
  readings: z.string().max(60_000, "That is too much text: paste at most 1000 lines.").default(""),
});
type FormValues = z.infer<typeof formSchema>;

const EXAMPLE = `force (N), loaded reading (cm)
0, 21.0
1, 20.6
2, 20.1
3, 19.7
4, 19.2
5, 18.8`;

export async function action({ request }: Route.ActionArgs) {
  assertSameOrigin(request);
  const limit = await hitRateLimit({ db }, `analysis:${clientAddress(request)}`, ANALYSIS_REQUESTS_PER_MINUTE);
  const parsed = formSchema.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) return data({ values: null, problems: parsed.error.issues.map((i) => i.message), analysis: null }, { status: 400 });
  const values = parsed.data;
  if (!limit.allowed) {
    return data({ values, problems: [`Too many analyses from here: try again in ${limit.retryAfter} seconds.`], analysis: null }, { status: 429 });
  }
  const { points, lines, problems } = parseReadingsText(values.readings, values.secondColumn);
  // A line that could not be read may be the one with another force: "one force throughout" would mislead then.
  const oneForceNotClaimed = problems.length > 0 ? `points: ${oneForceProblem(points)}` : null;
  const unloadedText = values.unloadedCm.trim();
  const unloadedCell = unloadedText === "" ? undefined : readCell(unloadedText, "cm", true);
  const unloaded = unloadedCell === undefined ? undefined : unloadedCell.ok ? unloadedCell.value : Number.NaN;
  if (values.secondColumn === "reading" && unloaded === undefined) problems.push("Give the unloaded reading: deformations are worked out from it.");
  if (unloadedCell !== undefined && !unloadedCell.ok) problems.push(asSentence(cellProblem("unloaded reading", unloadedText, "cm", unloadedCell)));
  const checked = parseAnalysisRequest({
    mode: values.mode,
    unloadedCm: unloaded,
    resolutionCm: Number(values.resolutionCm.replace(",", ".")),
    points,
  });
  if (checked.ok) {
    for (const i of implausibleReadings(checked.data)) {
      problems.push(i.point === null ? asSentence(i.problem) : `Line ${lines[i.point] ?? i.point + 1}: ${i.problem}`);
    }
  }
  if (problems.length > 0 || !checked.ok) {
    const unloadedNamed = problems.some((p) => p.includes("unloaded reading"));
    const fromChecks = checked.ok
      ? []
      : checked.errors
          .filter((e) => e !== oneForceNotClaimed)
          .map((e) => inFormWords(e, lines))
          .filter((p) => !(unloadedNamed && p.includes("unloaded reading")));
    const all = [...new Set([...problems, ...fromChecks])];
    return data({ values, problems: all, analysis: null }, { status: 400 });
  }
  return { values, problems: [] as string[], analysis: analyseReadings(checked.data) };
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
  if (error.startsWith("resolutionCm:")) return "“Ruler read to” needs a number above 0 in centimetres, such as 0.1.";
  if (error.startsWith("points: give at least")) return "Give at least two loading steps, one per line: the force, then the reading.";
  if (error.startsWith("points: give at most")) return "Paste at most 1000 loading steps.";
  // Problems already in plain words (one force throughout): without the field's name, as a sentence.
  const words = error.replace(/^[\w.[\]]+: /, "");
  return words.charAt(0).toUpperCase() + words.slice(1);
}

export default function AnalyseReadings({ actionData }: Route.ComponentProps) {
  const values: FormValues = actionData?.values ?? { mode: "bend", secondColumn: "reading", unloadedCm: "21.0", resolutionCm: "0.1", readings: EXAMPLE };
  const analysis = actionData?.analysis ?? null;
  const busy = useNavigation().state !== "idle";
  return (
    <div className="mx-auto max-w-5xl px-5 py-10">
      <h1 className="mb-2 text-[length:var(--text-step-3)]">Analyse your readings</h1>
      <p className="prose-reading mb-6 text-ink-soft">
        Paste or type one loading step per line: the force in newtons, then the ruler reading in centimetres, and — if you
        took them — the reading after the load came off and the word “broke” where the piece broke. Nothing you type here is saved.
      </p>
      <Form method="post" className="card mb-8 grid gap-4 font-ui print:hidden md:grid-cols-2">
        <label className="block md:row-span-4">
          <span className="mb-1 block font-bold">Readings</span>
          <textarea name="readings" rows={12} className="field font-mono" defaultValue={values.readings} spellCheck={false} />
        </label>
        <fieldset>
          <legend className="mb-1 font-bold">What happens to the piece?</legend>
          <label className="mr-4 inline-flex items-center gap-2">
            <input type="radio" name="mode" value="bend" defaultChecked={values.mode === "bend"} className="h-5 w-5" /> It bends (reading goes down)
          </label>
          <label className="inline-flex items-center gap-2">
            <input type="radio" name="mode" value="stretch" defaultChecked={values.mode === "stretch"} className="h-5 w-5" /> It stretches (length goes up)
          </label>
        </fieldset>
        <fieldset>
          <legend className="mb-1 font-bold">The second column is</legend>
          <label className="mr-4 inline-flex items-center gap-2">
            <input type="radio" name="secondColumn" value="reading" defaultChecked={values.secondColumn === "reading"} className="h-5 w-5" /> the ruler reading
          </label>
          <label className="inline-flex items-center gap-2">
            <input type="radio" name="secondColumn" value="deformation" defaultChecked={values.secondColumn === "deformation"} className="h-5 w-5" /> the deformation
          </label>
        </fieldset>
        <div className="grid grid-cols-2 gap-3">
          <label className="block">
            <span className="mb-1 block font-bold">Unloaded reading (cm)</span>
            <input name="unloadedCm" className="field" inputMode="decimal" defaultValue={values.unloadedCm} />
          </label>
          <label className="block">
            <span className="mb-1 block font-bold">Ruler read to (cm)</span>
            <input name="resolutionCm" className="field" inputMode="decimal" defaultValue={values.resolutionCm} />
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
      {analysis && <AnalysisReport analysis={analysis} resolutionCm={Number(values.resolutionCm.replace(",", ".")) || 0.1} />}
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Analyse your readings — Bendwise" }];
