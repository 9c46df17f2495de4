// Small factories for seat and payment tests: an invented school or household with its people.
// Every name here is made up; each call makes fresh, unique rows so tests never share them.
import { randomBytes } from "node:crypto";
import type { Database } from "~/db/client.server";
import { classes, memberships, organisations, seatPurchases, users } from "~/db/schema.server";

const tag = () => randomBytes(4).toString("hex");

export async function createSchool(db: Database, options: { seats?: number; schoolYear?: string; name?: string } = {}) {
  const t = tag();
  const [school] = await db
    .insert(organisations)
    .values({ kind: "school", name: options.name ?? `Test School ${t} (invented)`, slug: `test-school-${t}` })
    .returning();
  const admin = await createAdult(db, school.id, "school_admin", `Admin ${t}`);
  if (options.seats) await givePaidSeats(db, school.id, options.schoolYear ?? "2026-27", options.seats);
  return { school, admin };
}

export async function createHousehold(db: Database, options: { seats?: number; schoolYear?: string } = {}) {
  const t = tag();
  const [household] = await db
    .insert(organisations)
    .values({ kind: "household", name: `Test household ${t} (invented)`, slug: `test-home-${t}`, signInCode: `HOME-${t}`.toUpperCase() })
    .returning();
  const parent = await createAdult(db, household.id, "parent", `Parent ${t}`);
  if (options.seats) await givePaidSeats(db, household.id, options.schoolYear ?? "2026-27", options.seats);
  return { household, parent };
}

export async function createAdult(db: Database, organisationId: string, role: "school_admin" | "teacher" | "parent", displayName: string) {
  const [user] = await db
    .insert(users)
    .values({ email: `${displayName.toLowerCase().replace(/[^a-z0-9]+/g, ".")}.${tag()}@test.example`, displayName, emailVerifiedAt: new Date() })
    .returning();
  await db.insert(memberships).values({ userId: user.id, organisationId, role });
  return user;
}

export async function createStudents(db: Database, organisationId: string, count: number) {
  const t = tag();
  const rows = await db
    .insert(users)
    .values(Array.from({ length: count }, (_, i) => ({ homeOrganisationId: organisationId, username: `s${i}.${t}`, displayName: `Student ${i} ${t}`, gradeBand: "6-8" as const })))
    .returning();
  await db.insert(memberships).values(rows.map((r) => ({ userId: r.id, organisationId, role: "student" as const })));
  return rows;
}

export async function createClass(db: Database, organisationId: string, teacherId: string, schoolYear = "2026-27") {
  const t = tag();
  const [klass] = await db
    .insert(classes)
    .values({ organisationId, teacherId, name: `Class ${t}`, schoolYear, signInCode: `C${t}`.toUpperCase() })
    .returning();
  return klass;
}

/** Seats that are simply there (as the demo's are), without going through payments. */
export async function givePaidSeats(db: Database, organisationId: string, schoolYear: string, seats: number) {
  await db.insert(seatPurchases).values({
    organisationId,
    schoolYear,
    seats,
    amountCents: seats * 900,
    method: "demo",
    status: "paid",
    providerRef: `test-${tag()}`,
    paidAt: new Date(),
  });
}
