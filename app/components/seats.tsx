// Pieces shared by the seat pages of schools and families: the seat ledger, the purchase list and
// the notice shown when no seat is free (the class roster of a later issue shows it too).
import { Link } from "react-router";
import { plural } from "~/lib/plural";

export interface LedgerRowView {
  schoolYear: string;
  bought: number;
  inUse: number;
  free: number;
}

export function SeatLedgerTable({ rows, currentYear, caption }: { rows: LedgerRowView[]; currentYear: string; caption: string }) {
  if (rows.length === 0) return <p className="text-ink-soft">No seats yet for any school year.</p>;
  return (
    <table className="w-full border-collapse text-left" data-testid="seat-ledger">
      <caption className="sr-only">{caption}</caption>
      <thead>
        <tr className="border-b-2 border-rule">
          <th scope="col" className="py-2 pr-4">School year</th>
          <th scope="col" className="py-2 pr-4 text-right">Bought</th>
          <th scope="col" className="py-2 pr-4 text-right">In use</th>
          <th scope="col" className="py-2 text-right">Free</th>
        </tr>
      </thead>
      <tbody>
        {rows.map((row) => (
          <tr key={row.schoolYear} className="border-b border-rule" data-year={row.schoolYear}>
            <th scope="row" className="py-2 pr-4 font-bold">
              {row.schoolYear}
              {row.schoolYear === currentYear ? <span className="ml-2 text-[length:var(--text-step--1)] font-normal text-ink-soft">(this year)</span> : null}
            </th>
            <td className="py-2 pr-4 text-right tabular-nums" data-cell="bought">{row.bought}</td>
            <td className="py-2 pr-4 text-right tabular-nums" data-cell="in-use">{row.inUse}</td>
            <td className={`py-2 text-right tabular-nums font-bold ${row.free === 0 ? "text-danger" : "text-ok"}`} data-cell="free">
              {row.free}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

export interface PurchaseView {
  id: string;
  orderedOn: string;
  schoolYear: string;
  seats: number;
  amount: string;
  howPaid: string;
  purchaseOrder: string | null;
  state: "paid" | "invoice-waiting" | "card-unfinished" | "cancelled";
  stateText: string;
  receiptUrl: string | null;
  invoiceUrl: string | null;
  unfinishedUrl: string | null;
}

/** Every purchase with its receipt, invoice or unfinished payment; each link names its purchase for a screen reader's list of links. */
export function PurchaseList({ purchases }: { purchases: PurchaseView[] }) {
  if (purchases.length === 0) return <p className="text-ink-soft">No purchases yet.</p>;
  return (
    <ul className="grid gap-3" data-testid="purchases">
      {purchases.map((p) => (
        <li key={p.id} className="card flex flex-wrap items-start justify-between gap-3" data-state={p.state}>
          {/* min-w-0 and wrap-anywhere: a long purchase-order number breaks instead of widening the card. */}
          <div className="min-w-0 wrap-anywhere">
            <p className="font-bold">
              {plural(p.seats, "seat")} for {p.schoolYear} · {p.amount}
            </p>
            <p className="text-[length:var(--text-step--1)] text-ink-soft">
              Ordered {p.orderedOn} · {p.howPaid}
              {p.purchaseOrder ? ` · purchase order ${p.purchaseOrder}` : ""}
            </p>
            <p className={`mt-1 text-[length:var(--text-step--1)] font-bold ${p.state === "paid" ? "text-ok" : p.state === "cancelled" ? "text-ink-soft" : "text-caution"}`}>
              {p.stateText}
            </p>
          </div>
          <div className="flex flex-wrap gap-2">
            {p.receiptUrl ? (
              <Link className="btn btn-quiet" to={p.receiptUrl}>
                Receipt<span className="sr-only"> for {plural(p.seats, "seat")}, {p.schoolYear}</span>
              </Link>
            ) : null}
            {p.invoiceUrl ? (
              <a className="btn btn-quiet" href={p.invoiceUrl}>
                Read the invoice<span className="sr-only"> for {plural(p.seats, "seat")}, {p.schoolYear}</span>
              </a>
            ) : null}
            {p.unfinishedUrl ? (
              <Link className="btn btn-quiet" to={p.unfinishedUrl}>
                Finish or drop<span className="sr-only"> the order of {plural(p.seats, "seat")} for {p.schoolYear}, ordered {p.orderedOn}</span>
              </Link>
            ) : null}
          </div>
        </li>
      ))}
    </ul>
  );
}

/** Shown when a student cannot be added because every seat of that year is in use. */
export function NoFreeSeatNotice({ notice }: { notice: { message: string; buyUrl?: string; askAdministrators?: string[] } }) {
  const names = notice.askAdministrators ?? [];
  return (
    <div role="alert" className="mb-4 rounded-lg border-l-4 border-danger bg-[#fdecee] px-4 py-3 text-ink">
      <p className="font-bold">{notice.message}</p>
      {notice.buyUrl ? (
        <p className="mt-2">
          <Link className="btn" to={notice.buyUrl}>
            Buy more seats
          </Link>
        </p>
      ) : names.length > 0 ? (
        <p className="mt-1">
          Ask your school's Bendwise {names.length === 1 ? "administrator" : "administrators"} to buy more:{" "}
          <strong>{names.length === 1 ? names[0] : `${names.slice(0, -1).join(", ")} or ${names.at(-1)}`}</strong>.
        </p>
      ) : (
        <p className="mt-1">Ask your school's Bendwise administrator to buy more.</p>
      )}
    </div>
  );
}
