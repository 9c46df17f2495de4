// The analysis of /tools/analyse as a report: each reading, both fitted lines, the verdict, the
// elastic limit and breaking load, the notes and the chart.
import { ForceChartFromAnalysis } from "~/components/lesson/force-chart";
import { cautionWords, elasticLimitWords, formatForStudent, formatToResolution, formatWithUncertainty, type AnalysisResult, type ReadingCaution } from "~/lib/science";

/** A force or load as it was given, up to 6 figures: "0.98", "3". */
const plain = (v: number | null) => (v === null ? "—" : String(Number(v.toPrecision(6))));

/**
 * `resolutionCm`: what the ruler was read to; deformations and permanent sets are shown to it (2.0, not 2).
 * `placeOf`: a point (by its index, null for the unloaded reading) named in the page's words, for the cautions.
 */
export function AnalysisReport({
  analysis,
  resolutionCm,
  placeOf = readingPlace,
}: {
  analysis: AnalysisResult;
  resolutionCm: number;
  placeOf?: (point: number | null) => string;
}) {
  const origin = analysis.fit.throughOrigin;
  const free = analysis.fit.withIntercept;
  const show = (v: number | null, unit = "", sig = 4) => (v === null ? "—" : formatForStudent(v, unit, sig));
  const hasReturns = analysis.points.some((p) => p.permanentSetCm !== null);
  const limit = analysis.elasticLimitN;
  return (
    <section aria-labelledby="results" className="font-ui" data-testid="analysis-report">
      <div className="mb-4 flex flex-wrap items-center justify-between gap-3">
        <h2 id="results" className="text-[length:var(--text-step-2)]">What the readings say</h2>
        <PrintButton />
      </div>
      <ReadingCautions cautions={analysis.cautions} placeOf={placeOf} resolutionCm={resolutionCm} then="check it first, then analyse again" />
      <div className="grid gap-6 md:grid-cols-2">
        <div className="min-w-0">
          <EachReadingTable analysis={analysis} resolutionCm={resolutionCm} caption="Each reading" />
          <dl className="grid gap-x-4 sm:grid-cols-[auto_1fr] sm:gap-y-1 [&>dd]:mb-2 sm:[&>dd]:mb-0">
            <dt className="font-bold">Stiffness, line through the origin</dt>
            <dd data-testid="slope-through-origin">{formatWithUncertainty(origin.slope, origin.slopeSE, "N/cm")}</dd>
            {/* The two R² are measured from different places (0 N and the average force), so each
                says which it is instead of inviting a side-by-side comparison. */}
            <dt className="font-bold">R² of the line through the origin</dt>
            <dd data-testid="r2-through-origin">{show(origin.r2, "", 5)}{origin.r2 !== null && " (1 − RSS ÷ ΣF², the R² the lessons use)"}</dd>
            <dt className="font-bold">Line with an intercept</dt>
            <dd>
              slope {formatWithUncertainty(free.slope, free.slopeSE, "N/cm")}, intercept {formatWithUncertainty(free.intercept, free.interceptSE, "N")}
            </dd>
            <dt className="font-bold">R² of the line with an intercept</dt>
            <dd data-testid="r2-with-intercept">
              {show(free.r2, "", 5)}
              {free.r2 !== null && " (measured around the average force, not around 0 N: it cannot be compared with the R² above)"}
            </dd>
            <dt className="font-bold">Proportional?</dt>
            <dd data-testid="proportional">{analysis.proportional ? "Yes" : "No"}</dd>
            <dt className="font-bold">Elastic limit</dt>
            <dd data-testid="elastic-limit">
              {limit !== null
                ? elasticLimitWords(plain(limit), analysis.elasticLimitReached)
                : hasReturns
                  ? "not found in these readings"
                  : "needs readings taken after each unload"}
            </dd>
            <dt className="font-bold">Breaking load</dt>
            <dd>{analysis.breakingLoadN === null ? "did not break" : `${plain(analysis.breakingLoadN)} N`}</dd>
          </dl>
          {analysis.notes.length > 0 && (
            <ul className="mt-4 list-disc pl-5">
              {analysis.notes.map((n) => (
                <li key={n}>{n}</li>
              ))}
            </ul>
          )}
        </div>
        <ForceChartFromAnalysis analysis={analysis} title="Force against deformation" />
      </div>
    </section>
  );
}

/**
 * How a page names a point (by its index, null for the unloaded reading) in a caution: `word` and its
 * number as the page counts it ("Row 4", "Line 5"; `numberOf` when the page's numbers are not the
 * points' own), or "The unloaded reading".
 */
export const pointPlace =
  (word: string, numberOf: (point: number) => number = (point) => point + 1) =>
  (point: number | null) =>
    point === null ? "The unloaded reading" : `${word} ${numberOf(point)}`;

/** A point named plainly when the page has no words of its own: "Reading 4". */
export const readingPlace = pointPlace("Reading");

/**
 * Readings worth a second look (a slipped decimal point, a force that goes back down): a caution above
 * the results, which still use those readings. `then`: what the reader does about it on this page
 * ("check it first, then save again" in a lesson, "… analyse again" in the analyser); none for an
 * adult reading a child's saved readings, who can neither save nor analyse them.
 */
export function ReadingCautions({
  cautions,
  placeOf,
  resolutionCm,
  then,
}: {
  cautions: readonly ReadingCaution[];
  placeOf: (point: number | null) => string;
  resolutionCm: number;
  then?: string;
}) {
  if (cautions.length === 0) return null;
  return (
    <div className="mb-4 rounded border-l-4 border-caution bg-caution-wash p-3 text-ink" data-testid="reading-cautions">
      <p className="font-bold text-caution">Worth a second look</p>
      <p className="mb-1">The results below still use these readings, so one typed wrong pulls the line and every figure after it{then ? `: ${then}.` : "."}</p>
      <ul className="list-disc pl-5">
        {cautions.map((c) => {
          const words = cautionWords(c, placeOf(c.point), resolutionCm);
          return <li key={words}>{words}</li>;
        })}
      </ul>
    </div>
  );
}

function PrintButton() {
  return (
    <button type="button" className="btn btn-quiet print:hidden" onClick={() => window.print()}>
      Print this analysis
    </button>
  );
}

/** Each reading worked out (force as given, deformation and permanent set to the ruler's resolution, stiffness to 3 figures). */
export function EachReadingTable({ analysis, resolutionCm, caption }: { analysis: AnalysisResult; resolutionCm: number; caption: string }) {
  const cm = (v: number | null) => (v === null ? "—" : formatToResolution(v, resolutionCm));
  return (
    <div className="mb-4 overflow-x-auto">
      <table className="w-full border-collapse">
        <caption className="mb-1 text-left font-bold">{caption}</caption>
        <thead>
          <tr>
            <th scope="col" className="border-b-2 border-ink-soft px-2 text-right">Force (N)</th>
            <th scope="col" className="border-b-2 border-ink-soft px-2 text-right">Deformation (cm)</th>
            <th scope="col" className="border-b-2 border-ink-soft px-2 text-right">Stiffness (N/cm)</th>
            <th scope="col" className="border-b-2 border-ink-soft px-2 text-right">Permanent set (cm)</th>
          </tr>
        </thead>
        <tbody>
          {analysis.points.map((p, i) => (
            <tr key={i}>
              <td className="border-b border-rule px-2 text-right tabular-nums">{plain(p.forceN)}</td>
              <td className="border-b border-rule px-2 text-right tabular-nums">{cm(p.deformationCm)}</td>
              <td className="border-b border-rule px-2 text-right tabular-nums">{p.stiffnessNPerCm === null ? "—" : formatForStudent(p.stiffnessNPerCm, "", 3)}</td>
              <td className="border-b border-rule px-2 text-right tabular-nums">{cm(p.permanentSetCm)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
