// A data set from a lesson's CSV file as a table.
import Papa from "papaparse";
import { SlidingBox } from "~/components/sliding-box";

export function parseCsv(csv: string): { columns: string[]; rows: string[][] } {
  const parsed = Papa.parse<string[]>(csv.trim(), { skipEmptyLines: true });
  const [columns = [], ...rows] = parsed.data;
  return { columns, rows };
}

/** Column names of the readings files, as a student reads them. */
const HEADINGS: Record<string, string> = {
  forceN: "Force (N)",
  readingCm: "Loaded reading (cm)",
  returnReadingCm: "Return reading, load off (cm)",
  deformationCm: "Deformation (cm)",
  broke: "Broke?",
  massG: "Mass (g)",
};

export function DataTable({ csv, caption }: { csv: string; caption?: string }) {
  const { columns, rows } = parseCsv(csv);
  return (
    <div className="my-6">
      <SlidingBox label={caption ?? "Data table"}>
        <table className="min-w-[18rem] border-collapse font-ui text-[length:var(--text-step--1)]">
          {caption && <caption className="mb-2 text-left font-bold">{caption}</caption>}
          <thead>
            <tr>
              {columns.map((c) => (
                <th key={c} scope="col" className="border-b-2 border-ink-soft px-3 py-1 text-right">
                  {HEADINGS[c] ?? c}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {rows.map((row, i) => (
              <tr key={i} className="odd:bg-spruce-wash/50">
                {row.map((cell, j) => (
                  <td key={j} className="border-b border-rule px-3 py-1 text-right tabular-nums">
                    {cell === "true" ? "yes" : cell === "false" ? "" : cell}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </SlidingBox>
    </div>
  );
}
