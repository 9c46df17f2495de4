// The student's own readings: a table saved to the server, analysed by the science module (the same
// analysis as POST /api/analysis), with its chart.
import { useEffect, useRef, useState } from "react";
import { useFetcher } from "react-router";
import type { SavedReadings } from "~/lib/course.server";
import type { ReadingsCell } from "~/lib/analysis-request";
import { analyseReadings, elasticLimitWords, formatForStudent, formatToResolution, type Mode } from "~/lib/science";
import { pointPlace, ReadingCautions } from "~/components/analysis-report";
import { ForceChartFromAnalysis } from "./force-chart";
import { useLesson } from "./lesson-context";
import { SendButton } from "~/components/send-button";
import { SlidingBox } from "~/components/sliding-box";
import { keepInTab, readInTab } from "~/lib/tab-storage";

/** A cell a problem is about: a red border and wash, besides aria-invalid (colour is not the only sign: the list names the row). */
const BAD_CELL = "border-danger bg-ember-wash";
/** A saved reading a caution of the analysis names (worth a second look, not an error): amber, named in the list too. */
const LOOK_CELL = "border-caution bg-caution-wash";
/** Wide enough for "37.25 cm" as typed, with a little less padding than other fields. */
const cellClass = (bad: boolean, worthALook = false) => `field w-24 px-2 sm:w-28 ${bad ? BAD_CELL : worthALook ? LOOK_CELL : ""}`;
/** A saved point named as the table's row (the saved rows are the table's rows, closed up). */
const rowPlace = pointPlace("Row");

interface Row {
  forceN: string;
  readingCm: string;
  returnReadingCm: string;
  broke: boolean;
}

const emptyRow = (): Row => ({ forceN: "", readingCm: "", returnReadingCm: "", broke: false });
const text = (n: number | undefined) => (n === undefined || n === null ? "" : String(n));
/** A saved reading as the student read it: to the ruler's resolution, so 38.0 stays 38.0 (not 38). */
export const readingText = (n: number | null | undefined, resolutionCm: number) =>
  n === undefined || n === null ? "" : formatToResolution(n, resolutionCm);

/** The table's rows from the saved readings (forces as given, readings to the resolution), at least 6. */
export function rowsFrom(saved: SavedReadings | undefined): Row[] {
  const resolution = saved?.resolutionCm ?? 0.1;
  const rows = (saved?.points ?? []).map((p) => ({
    forceN: text(p.forceN),
    readingCm: readingText(p.readingCm, resolution),
    returnReadingCm: readingText(p.returnReadingCm, resolution),
    broke: Boolean(p.broke),
  }));
  while (rows.length < 6) rows.push(emptyRow());
  return rows;
}

/**
 * A table typed but not saved yet, kept in the tab: a phone can drop the page while the child takes
 * the set-up photo or reads the next mark, and a reload or the way back through the course brings it
 * back. It is kept with the saved readings it started from, so a save made since (another tab) wins.
 */
interface TabCopy {
  from: string;
  material: string;
  unloaded: string;
  rows: Row[];
}
const copyKey = (slug: string, id: string) => `bendwise-readings:${slug}:${id}`;
const savedFingerprint = (saved: SavedReadings | undefined) => (saved ? JSON.stringify([saved.material, saved.unloadedCm, saved.points]) : "");

function readCopy(key: string, saved: SavedReadings | undefined): TabCopy | null {
  const copy = readInTab(key) as Partial<TabCopy> | null;
  const isRow = (r: unknown): r is Row => typeof r === "object" && r !== null && ["forceN", "readingCm", "returnReadingCm"].every((k) => typeof (r as Record<string, unknown>)[k] === "string");
  if (!copy || copy.from !== savedFingerprint(saved) || typeof copy.material !== "string" || typeof copy.unloaded !== "string") return null;
  if (!Array.isArray(copy.rows) || copy.rows.length > 40 || !copy.rows.every(isRow)) return null;
  return { from: copy.from, material: copy.material, unloaded: copy.unloaded, rows: copy.rows.map((r) => ({ ...r, broke: Boolean(r.broke) })) };
}

/**
 * `example`: what the lesson has the student test here, shown as the example in "What you tested".
 * `title`: the table's heading; a lesson with two tables gives each its own (screen readers list them by it).
 */
export function ReadingsEntry({
  id,
  mode = "bend",
  resolutionCm = 0.1,
  example = "a plastic ruler",
  title = "Your readings",
}: {
  id: string;
  mode?: Mode;
  resolutionCm?: number;
  example?: string;
  title?: string;
}) {
  const { state, canAnswer, slug } = useLesson();
  const saved = state.readings[id];
  const fetcher = useFetcher<{ readingsId?: string; errors?: string[]; cells?: ReadingsCell[]; saved?: boolean }>();
  const [rows, setRows] = useState<Row[]>(() => rowsFrom(saved));
  const [unloaded, setUnloaded] = useState(readingText(saved?.unloadedCm, saved?.resolutionCm ?? resolutionCm));
  const [material, setMaterial] = useState(saved?.material ?? "");
  // Typed since the last save: the analysis below is then about the saved readings, not the table.
  const [edited, setEdited] = useState(false);
  // "Add a row" takes the keyboard to the new row's force, instead of leaving it on a button the new
  // row has pushed down.
  const table = useRef<HTMLTableSectionElement>(null);
  const [addedRow, setAddedRow] = useState<number | null>(null);
  useEffect(() => {
    if (addedRow !== null) table.current?.querySelectorAll<HTMLInputElement>('input[name="forceN"]')[addedRow]?.focus();
  }, [addedRow]);
  const errors = fetcher.data?.readingsId === id ? fetcher.data.errors : undefined;
  // The cells the problems are about, marked until the next save.
  const badCells = (errors?.length ?? 0) > 0 ? (fetcher.data?.cells ?? []) : [];
  const isBad = (row: number | null, column: ReadingsCell["column"]) => badCells.some((c) => c.row === row && c.column === column);
  const errorsId = `readings-${id}-problems`;
  const markIf = (bad: boolean) => (bad ? { "aria-invalid": true as const, "aria-describedby": errorsId } : {});
  const savedNow = fetcher.data?.readingsId === id && fetcher.data.saved === true;
  // Once a save is answered, the table shows what was saved, rows closed up, so "Row 4" in the
  // analysis below is the table's fourth row. Once per answer: later edits are never overwritten.
  const shownAnswer = useRef<unknown>(null);
  useEffect(() => {
    if (!savedNow || shownAnswer.current === fetcher.data) return;
    shownAnswer.current = fetcher.data;
    setEdited(false);
    if (saved) {
      setRows(rowsFrom(saved));
      setUnloaded(readingText(saved.unloadedCm, saved.resolutionCm));
    }
  }, [savedNow, fetcher.data, saved]);
  // What was typed and not saved is kept in the tab, and put back when the page opens again.
  const tabKey = copyKey(slug, id);
  const [putBack, setPutBack] = useState(false);
  useEffect(() => {
    if (!canAnswer) return;
    const copy = readCopy(tabKey, saved);
    if (!copy) return keepInTab(tabKey, null);
    setMaterial(copy.material);
    setUnloaded(copy.unloaded);
    setRows(copy.rows);
    setEdited(true);
    setPutBack(true);
  }, []); // once, when the table opens (after hydration, so the server's page and the first render agree)
  useEffect(() => {
    if (!canAnswer) return;
    if (edited) keepInTab(tabKey, { from: savedFingerprint(saved), material, unloaded, rows } satisfies TabCopy);
    else if (savedNow) keepInTab(tabKey, null);
  }, [edited, material, unloaded, rows, savedNow, tabKey, saved, canAnswer]);
  const update = (i: number, patch: Partial<Row>) => {
    setEdited(true);
    setRows((rs) => rs.map((r, j) => (j === i ? { ...r, ...patch } : r)));
  };
  const analysis = saved
    ? analyseReadings({ mode: saved.mode, unloadedCm: saved.unloadedCm ?? undefined, resolutionCm: saved.resolutionCm, points: saved.points })
    : null;
  const loadedLabel = mode === "bend" ? "Loaded reading (cm)" : "Loaded length (cm)";
  // The cells the analysis's cautions name, while the table still shows the saved rows.
  const lookAt = (row: number | null, column: "reading" | "force") =>
    !edited &&
    (analysis?.cautions ?? []).some((c) =>
      c.kind === "far-from-others" ? column === "reading" && (c.point === null ? row === null : c.point + 1 === row) : column === "force" && c.point + 1 === row,
    );

  return (
    <section id={`readings-${id}`} className="card my-8 scroll-mt-6 font-ui" aria-labelledby={`readings-${id}-title`}>
      <h3 id={`readings-${id}-title`} className="mb-2 font-reading text-[length:var(--text-step-1)]">
        {title}
      </h3>
      <p className="mb-3 text-ink-soft">
        Read the ruler to {resolutionCm} cm. Leave a row empty to skip it. Tick “broke” for the load at which the piece broke.
      </p>
      <fetcher.Form method="post">
        <input type="hidden" name="intent" value="save-readings" />
        <input type="hidden" name="readingsId" value={id} />
        <input type="hidden" name="mode" value={mode} />
        <input type="hidden" name="resolutionCm" value={resolutionCm} />
        <div className="mb-3 grid gap-3 sm:grid-cols-2">
          <label className="block">
            <span className="mb-1 block font-bold">What you tested</span>
            <input name="material" className="field" maxLength={80} value={material} onChange={(e) => {
                setEdited(true);
                setMaterial(e.target.value);
              }} disabled={!canAnswer} placeholder={`e.g. ${example}`} />
          </label>
          <label className="block">
            <span className="mb-1 block font-bold">{mode === "bend" ? "Unloaded reading (cm)" : "Unloaded length (cm)"}</span>
            <input name="unloadedCm" className={`field ${isBad(null, "unloaded") ? BAD_CELL : lookAt(null, "reading") ? LOOK_CELL : ""}`} {...markIf(isBad(null, "unloaded"))} inputMode="decimal" value={unloaded} onChange={(e) => {
                setEdited(true);
                setUnloaded(e.target.value);
              }} disabled={!canAnswer} required />
          </label>
        </div>
        {/* On a narrow screen the table may be wider than its box: then it says it slides sideways. */}
        <SlidingBox label={`The table of ${title.charAt(0).toLowerCase()}${title.slice(1)}`} hintTestId="readings-slide-hint">
          <table className="border-collapse" aria-labelledby={`readings-${id}-title`}>
            <thead>
              <tr>
                <th scope="col" className="px-1 text-right">Row</th>
                <th scope="col" className="px-2 text-left">Force (N)</th>
                <th scope="col" className="px-2 text-left">{loadedLabel}</th>
                <th scope="col" className="px-2 text-left">After unloading (cm)</th>
                <th scope="col" className="px-2 text-left">Broke</th>
              </tr>
            </thead>
            <tbody ref={table}>
              {rows.map((row, i) => (
                <tr key={i}>
                  <th scope="row" className="px-1 text-right font-normal tabular-nums text-ink-soft">{i + 1}</th>
                  <td className="px-1 py-1">
                    <input name="forceN" aria-label={`Force, row ${i + 1}`} className={cellClass(isBad(i + 1, "force"), lookAt(i + 1, "force"))} {...markIf(isBad(i + 1, "force"))} inputMode="decimal" value={row.forceN} onChange={(e) => update(i, { forceN: e.target.value })} disabled={!canAnswer} />
                  </td>
                  <td className="px-1 py-1">
                    <input name="readingCm" aria-label={`${loadedLabel}, row ${i + 1}`} className={cellClass(isBad(i + 1, "reading"), lookAt(i + 1, "reading"))} {...markIf(isBad(i + 1, "reading"))} inputMode="decimal" value={row.readingCm} onChange={(e) => update(i, { readingCm: e.target.value })} disabled={!canAnswer} />
                  </td>
                  <td className="px-1 py-1">
                    <input name="returnReadingCm" aria-label={`Reading after unloading, row ${i + 1}`} className={cellClass(isBad(i + 1, "return"))} {...markIf(isBad(i + 1, "return"))} inputMode="decimal" value={row.returnReadingCm} onChange={(e) => update(i, { returnReadingCm: e.target.value })} disabled={!canAnswer} />
                  </td>
                  <td className="px-1 py-1 text-center">
                    <input type="checkbox" aria-label={`Broke at this load, row ${i + 1}`} className="h-5 w-5" checked={row.broke} onChange={(e) => update(i, { broke: e.target.checked })} disabled={!canAnswer} />
                    <input type="hidden" name="broke" value={row.broke ? "1" : "0"} />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </SlidingBox>
        {canAnswer && (
          <div className="mt-3 flex flex-wrap gap-3">
            <button type="button" className="btn btn-quiet" onClick={() => {
                setRows((rs) => [...rs, emptyRow()]);
                setAddedRow(rows.length);
              }}
              disabled={rows.length >= 40}
            >
              Add a row
            </button>
            <SendButton className="btn" busy={fetcher.state !== "idle"}>
              {fetcher.state !== "idle" ? "Saving…" : "Save and analyse"}
            </SendButton>
          </div>
        )}
      </fetcher.Form>
      <div aria-live="polite">
        {errors && errors.length > 0 && (
          <div className="mt-3 rounded bg-ember-wash p-3 text-danger" role="alert">
            <p className="font-bold">Nothing was saved yet. Please fix{badCells.length > 0 ? " (the cells concerned are marked in red)" : ""}:</p>
            <ul id={errorsId} className="list-disc pl-5 text-ink">
              {errors.map((e) => (
                <li key={e}>{e}</li>
              ))}
            </ul>
          </div>
        )}
        {savedNow ? (
          <p className="mt-3 text-ok font-bold">Saved.</p>
        ) : putBack && edited ? (
          <p className="mt-3 rounded bg-caution-wash p-3 text-ink" data-testid="readings-put-back">
            We put back the readings you typed here before, which were not saved yet. Check them, then press “Save and analyse” to keep them.
          </p>
        ) : null}
      </div>
      {analysis && saved && (
        <ReadingsAnalysis analysis={analysis} title={title} resolutionCm={saved.resolutionCm} stale={edited || (errors !== undefined && errors.length > 0)} />
      )}
    </section>
  );
}

/**
 * The analysis of the saved readings. `stale`: the table has unsaved changes or a save just failed,
 * so the heading says these numbers come from the last saved readings, not the ones on screen.
 */
export function ReadingsAnalysis({
  analysis,
  title,
  stale = false,
  whose = "your",
  resolutionCm = 0.1,
}: {
  analysis: ReturnType<typeof analyseReadings>;
  title: string;
  stale?: boolean;
  /** what the ruler was read to, for writing a reading in a caution as it was read */
  resolutionCm?: number;
  /** whose readings, for the heading: "your" for the student, "Juno's" for the parent */
  whose?: string;
}) {
  const origin = analysis.fit.throughOrigin;
  const free = analysis.fit.withIntercept;
  return (
    <div className="mt-5" data-testid="readings-analysis">
      <h4 className="mb-2 font-bold">{stale ? `From ${whose} last saved readings` : `What ${whose} readings say`}</h4>
      {stale && (
        <p className="mb-2 text-ink-soft" data-testid="readings-analysis-stale">
          These results are worked out from the readings you last saved, not from the numbers in the table above. Save to update them.
        </p>
      )}
      <ReadingCautions cautions={analysis.cautions} placeOf={rowPlace} resolutionCm={resolutionCm} then={whose === "your" ? "check it first, then save again" : undefined} />
      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
        <dt>Stiffness (best line through the origin)</dt>
        <dd data-testid="stiffness-through-origin">{origin.slope !== null ? `${formatForStudent(origin.slope)} N/cm` : "—"}</dd>
        <dt>R² of that line</dt>
        <dd>{origin.r2 !== null ? formatForStudent(origin.r2, "", 4) : "—"}</dd>
        <dt>Best line with an intercept</dt>
        <dd>
          {free.slope !== null && free.intercept !== null
            ? `slope ${formatForStudent(free.slope)} N/cm, intercept ${formatForStudent(free.intercept)} N`
            : "—"}
        </dd>
        <dt>Proportional?</dt>
        <dd>{analysis.proportional ? "Yes, within the ruler's resolution" : "No"}</dd>
        {analysis.elasticLimitN !== null && (
          <>
            <dt>Elastic limit</dt>
            <dd data-testid="elastic-limit">
              {elasticLimitWords(formatForStudent(analysis.elasticLimitN), analysis.elasticLimitReached)}
            </dd>
          </>
        )}
        {analysis.breakingLoadN !== null && (
          <>
            <dt>Breaking load</dt>
            <dd>{formatForStudent(analysis.breakingLoadN)} N</dd>
          </>
        )}
      </dl>
      {analysis.notes.length > 0 && (
        <ul className="mt-2 list-disc pl-5 text-ink-soft">
          {analysis.notes.map((n) => (
            <li key={n}>{n}</li>
          ))}
        </ul>
      )}
      <ForceChartFromAnalysis analysis={analysis} title={title} />
    </div>
  );
}
