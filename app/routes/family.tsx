// /family: a parent's home. First version: the household's children (name, username, grade band),
// the code they sign in with, and the seats bought.
import { and, asc, eq, inArray, sql } from "drizzle-orm";
import { Link } from "react-router";
import type { Route } from "./+types/family";
import { db } from "~/db/client.server";
import { memberships, organisations, seatPurchases, users } from "~/db/schema.server";
import { requireRole } from "~/lib/auth.server";

export async function loader({ request }: Route.LoaderArgs) {
  const { user } = await requireRole(request, ["parent"]);
  const ids = user.memberships.filter((m) => m.role === "parent").map((m) => m.organisationId);
  const [households, children, seats] = await Promise.all([
    db.select({ id: organisations.id, name: organisations.name, signInCode: organisations.signInCode }).from(organisations).where(inArray(organisations.id, ids)),
    db
      .select({ organisationId: users.homeOrganisationId, id: users.id, displayName: users.displayName, username: users.username, gradeBand: users.gradeBand })
      .from(users)
      .innerJoin(memberships, and(eq(memberships.userId, users.id), eq(memberships.organisationId, users.homeOrganisationId), eq(memberships.role, "student")))
      .where(inArray(users.homeOrganisationId, ids))
      .orderBy(asc(users.displayName)),
    db
      .select({ organisationId: seatPurchases.organisationId, schoolYear: seatPurchases.schoolYear, seats: sql<number>`sum(${seatPurchases.seats})::int` })
      .from(seatPurchases)
      .where(and(inArray(seatPurchases.organisationId, ids), eq(seatPurchases.status, "paid")))
      .groupBy(seatPurchases.organisationId, seatPurchases.schoolYear)
      .orderBy(asc(seatPurchases.schoolYear)),
  ]);
  return {
    displayName: user.displayName,
    households: households.map((h) => ({
      ...h,
      children: children.filter((c) => c.organisationId === h.id).map(({ organisationId: _, ...c }) => c),
      seats: seats.filter((s) => s.organisationId === h.id).map(({ schoolYear, seats }) => ({ schoolYear, seats })),
    })),
  };
}

export default function Family({ loaderData }: Route.ComponentProps) {
  const { displayName, households } = loaderData;
  return (
    <div className="mx-auto max-w-4xl px-5 py-12">
      <p className="mb-1 text-ink-soft">Parent · {displayName}</p>
      {households.map((h) => (
        <section key={h.id} aria-labelledby={`household-${h.id}`} className="mb-10">
          <h1 id={`household-${h.id}`} className="mb-6 text-[length:var(--text-step-3)]">
            {h.name}
          </h1>
          <div className="card mb-6">
            <h2 className="mb-2 text-[length:var(--text-step-1)]">What you can do here</h2>
            <ul className="list-disc space-y-1 pl-5">
              <li>
                See your children's accounts. They sign in with the family code{" "}
                <strong className="font-mono">{h.signInCode ?? "—"}</strong>, their username and their password.
              </li>
              <li>
                <Link to="/family/seats">Buy a seat for each child and keep every receipt</Link>. Soon: add a child, set a new password for a
                child, and follow their progress lesson by lesson.
              </li>
            </ul>
          </div>
          <h2 className="mb-3 text-[length:var(--text-step-1)]">Children</h2>
          {h.children.length === 0 ? (
            <p className="text-ink-soft">No children's accounts yet.</p>
          ) : (
            <ul className="mb-6 grid gap-3 sm:grid-cols-2">
              {h.children.map((c) => (
                <li key={c.id} className="card">
                  <strong>{c.displayName}</strong>
                  <span className="block text-ink-soft">
                    username <span className="font-mono">{c.username}</span> · grades {c.gradeBand ?? "—"}
                  </span>
                </li>
              ))}
            </ul>
          )}
          <p>
            {h.seats.length === 0
              ? "No seats bought yet."
              : h.seats.map((s) => `${s.seats} ${s.seats === 1 ? "seat" : "seats"} for ${s.schoolYear}`).join(" · ")}
          </p>
        </section>
      ))}
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Family — Bendwise" }];
