// A force–deformation chart drawn as SVG (on the server and in the browser alike): the points, the best
// line through the origin and the best line with a free intercept.
import { useId } from "react";
import type { AnalysisResult, Mode } from "~/lib/science";
import { analyseReadings } from "~/lib/science";
import { parseCsv } from "./data-table";

const W = 520;
const H = 320;
const PAD = { left: 56, right: 20, top: 20, bottom: 48 };

/** A round step for about five gridlines up to `value` (1, 2, 2.5 or 5 times a power of ten). */
function niceStep(value: number): number {
  const rough = value / 5;
  const base = 10 ** Math.floor(Math.log10(rough));
  for (const step of [1, 2, 2.5, 5]) if (rough <= step * base) return step * base;
  return 10 * base;
}

/** The axis's end and its gridlines: the first whole step at or past `value` (5.5 cm → 0, 2, 4, 6; not 0 to 10). */
export function chartAxis(value: number): { max: number; ticks: number[] } {
  if (!(value > 0)) return { max: 1, ticks: [0, 0.2, 0.4, 0.6, 0.8, 1] };
  const step = niceStep(value);
  const count = Math.ceil(value / step - 1e-9);
  return { max: count * step, ticks: Array.from({ length: count + 1 }, (_, i) => Number((i * step).toPrecision(6))) };
}

/**
 * `lines`: the analysis the two lines come from when it is not `analysis` itself (a chart whose lines
 * use only the loads up to `linesUpToN`, as a lesson draws the elastic range; the later points are hollow).
 */
export function ForceChartFromAnalysis({ analysis, title, lines = analysis, linesUpToN }: { analysis: AnalysisResult; title: string; lines?: AnalysisResult; linesUpToN?: number }) {
  const points = analysis.points.filter((p) => p.deformationCm !== null) as { forceN: number; deformationCm: number }[];
  const xAxis = chartAxis(Math.max(0, ...points.map((p) => p.deformationCm)) * 1.05);
  const yAxis = chartAxis(Math.max(0, ...points.map((p) => p.forceN)) * 1.05);
  const [xMax, yMax] = [xAxis.max, yAxis.max];
  // The step it broke at is drawn apart: it is left out of both lines.
  const brokeAt = analysis.breakingLoadN === null ? -1 : points.findIndex((p) => p.forceN === analysis.breakingLoadN);
  const x = (cm: number) => PAD.left + (cm / xMax) * (W - PAD.left - PAD.right);
  const y = (n: number) => H - PAD.bottom - (n / yMax) * (H - PAD.top - PAD.bottom);
  // One clip area per chart (a page can show several): an id React makes the same on server and browser.
  const clipId = `plot-area-${useId().replace(/[^A-Za-z0-9_-]/g, "")}`;
  const origin = lines.fit.throughOrigin.slope;
  const free = lines.fit.withIntercept;
  const pastLines = (p: { forceN: number }) => linesUpToN !== undefined && p.forceN > linesUpToN;
  const describe = `${points.length} points. ${
    origin !== null ? `Best line through the origin: slope ${origin.toPrecision(3)} N/cm.` : ""
  } ${free.slope !== null && free.intercept !== null ? `Best line with intercept: slope ${free.slope.toPrecision(3)} N/cm, intercept ${free.intercept.toPrecision(3)} N.` : ""}`;
  return (
    <figure className="my-6">
      <svg viewBox={`0 0 ${W} ${H}`} className="w-full max-w-xl" role="img" aria-label={`${title}. ${describe}`}>
        <rect x="0" y="0" width={W} height={H} fill="#fff" />
        {xAxis.ticks.map((t) => (
          <g key={`x${t}`}>
            <line x1={x(t)} x2={x(t)} y1={PAD.top} y2={H - PAD.bottom} stroke="#e7e1d4" />
            <text x={x(t)} y={H - PAD.bottom + 18} fontSize="12" textAnchor="middle" fill="#46524f">{t}</text>
          </g>
        ))}
        {yAxis.ticks.map((t) => (
          <g key={`y${t}`}>
            <line x1={PAD.left} x2={W - PAD.right} y1={y(t)} y2={y(t)} stroke="#e7e1d4" />
            <text x={PAD.left - 8} y={y(t) + 4} fontSize="12" textAnchor="end" fill="#46524f">{t}</text>
          </g>
        ))}
        <line x1={PAD.left} x2={W - PAD.right} y1={y(0)} y2={y(0)} stroke="#46524f" />
        <line x1={x(0)} x2={x(0)} y1={PAD.top} y2={H - PAD.bottom} stroke="#46524f" />
        <text x={(W + PAD.left) / 2} y={H - 8} fontSize="13" textAnchor="middle" fill="#1c2726">Deformation (cm)</text>
        <text x={16} y={(H - PAD.bottom) / 2} fontSize="13" textAnchor="middle" fill="#1c2726" transform={`rotate(-90 16 ${(H - PAD.bottom) / 2})`}>Force (N)</text>
        {/* The fitted lines stay inside the plot: a line with a free intercept can leave it at the top or the bottom. */}
        <defs>
          <clipPath id={clipId}>
            <rect x={PAD.left} y={PAD.top} width={W - PAD.left - PAD.right} height={H - PAD.top - PAD.bottom} />
          </clipPath>
        </defs>
        {origin !== null && (
          <line x1={x(0)} y1={y(0)} x2={x(Math.min(xMax, yMax / origin))} y2={y(Math.min(yMax, origin * xMax))} stroke="#0d5c57" strokeWidth="2.5" clipPath={`url(#${clipId})`} />
        )}
        {free.slope !== null && free.intercept !== null && (
          <line x1={x(0)} y1={y(free.intercept)} x2={x(xMax)} y2={y(free.intercept + free.slope * xMax)} stroke="#a8401a" strokeWidth="2" strokeDasharray="7 5" clipPath={`url(#${clipId})`} />
        )}
        {points.map((p, i) =>
          i === brokeAt ? (
            <path key={i} d={`M${x(p.deformationCm) - 6} ${y(p.forceN) - 6}l12 12m0 -12l-12 12`} stroke="#a8401a" strokeWidth="3" />
          ) : pastLines(p) ? (
            <circle key={i} cx={x(p.deformationCm)} cy={y(p.forceN)} r="4.5" fill="#fff" stroke="#1c2726" strokeWidth="2" />
          ) : (
            <circle key={i} cx={x(p.deformationCm)} cy={y(p.forceN)} r="5" fill="#1c2726" />
          ),
        )}
      </svg>
      <figcaption className="mt-2 font-ui text-[length:var(--text-step--1)] text-ink-soft">
        <span className="font-bold">{title}.</span> Solid line: best line through the origin. Dashed line: best line with a free intercept.
        {linesUpToN !== undefined ? ` Both lines use the loads up to ${linesUpToN} N; hollow points: the loads past it.` : ""}
        {brokeAt >= 0 ? ` Cross: the load it broke at (${points[brokeAt].forceN} N), left out of both lines.` : ""}
      </figcaption>
    </figure>
  );
}

/** The chart for a CSV data set of a lesson. */
export function ForceChart({ csv, mode = "bend", unloadedCm, resolutionCm = 0.1, title = "Force against deformation", linesUpToN }: {
  csv: string;
  mode?: Mode;
  unloadedCm?: number;
  resolutionCm?: number;
  title?: string;
  /** draw the lines through the loads up to this force only (a lesson showing where the straight part ends) */
  linesUpToN?: number;
}) {
  const { columns, rows } = parseCsv(csv);
  const column = (name: string) => columns.indexOf(name);
  const num = (row: string[], name: string) => (column(name) >= 0 && row[column(name)] !== "" ? Number(row[column(name)]) : undefined);
  const points = rows.map((row) => ({
    forceN: num(row, "forceN") ?? 0,
    readingCm: num(row, "readingCm"),
    deformationCm: num(row, "deformationCm"),
    returnReadingCm: num(row, "returnReadingCm"),
    broke: column("broke") >= 0 ? row[column("broke")] === "true" : undefined,
  }));
  const analysis = analyseReadings({ mode, unloadedCm, resolutionCm, points });
  if (linesUpToN === undefined) return <ForceChartFromAnalysis analysis={analysis} title={title} />;
  const lines = analyseReadings({ mode, unloadedCm, resolutionCm, points: points.filter((p) => p.forceN <= linesUpToN) });
  return <ForceChartFromAnalysis analysis={analysis} lines={lines} linesUpToN={linesUpToN} title={title} />;
}
