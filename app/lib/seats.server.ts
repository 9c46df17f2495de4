// The seat ledger and the rules for using seats. One seat is one student for one school year in one
// organisation (a school or a household). Bought = the seats of paid purchases; in use = seat
// assignments; free = bought − in use, never below zero.
//
// Every change to who holds a seat runs in a transaction that first locks the organisation's row
// (SELECT … FOR UPDATE). Two enrollments into the same school therefore take turns, each sees the
// other's seat once it commits, and no school ever has more seats in use than it bought, however many
// teachers press "enrol" at the same moment.
import { and, asc, eq, isNull, ne, sql } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import { classes, enrollments, memberships, organisations, seatAssignments, seatPurchases, users } from "~/db/schema.server";

type Tx = Parameters<Parameters<Database["transaction"]>[0]>[0];
type Queryable = Database | Tx;

export interface SeatLedgerRow {
  schoolYear: string;
  bought: number;
  inUse: number;
  free: number;
}

/** Bought, in use and free for one school year. */
export async function seatLedgerForYear({ db }: { db: Queryable }, organisationId: string, schoolYear: string): Promise<SeatLedgerRow> {
  const [row] = await db.execute<{ bought: number; in_use: number }>(sql`
    select
      coalesce((select sum(${seatPurchases.seats}) from ${seatPurchases}
                where ${seatPurchases.organisationId} = ${organisationId} and ${seatPurchases.schoolYear} = ${schoolYear}
                  and ${seatPurchases.status} = 'paid'), 0)::int as bought,
      (select count(*) from ${seatAssignments}
        where ${seatAssignments.organisationId} = ${organisationId} and ${seatAssignments.schoolYear} = ${schoolYear})::int as in_use`);
  return ledgerRow(schoolYear, row.bought, row.in_use);
}

/** The ledger of every school year the organisation has paid for or used seats in, newest first. */
export async function seatLedger({ db }: { db: Queryable }, organisationId: string): Promise<SeatLedgerRow[]> {
  const rows = await db.execute<{ school_year: string; bought: number; in_use: number }>(sql`
    with years as (
      select ${seatPurchases.schoolYear} as school_year from ${seatPurchases}
        where ${seatPurchases.organisationId} = ${organisationId} and ${seatPurchases.status} = 'paid'
      union
      select ${seatAssignments.schoolYear} from ${seatAssignments} where ${seatAssignments.organisationId} = ${organisationId}
    )
    select years.school_year,
      coalesce((select sum(p.seats) from ${seatPurchases} p
                where p.organisation_id = ${organisationId} and p.school_year = years.school_year and p.status = 'paid'), 0)::int as bought,
      (select count(*) from ${seatAssignments} a
        where a.organisation_id = ${organisationId} and a.school_year = years.school_year)::int as in_use
    from years order by years.school_year desc`);
  return rows.map((r) => ledgerRow(r.school_year, r.bought, r.in_use));
}

function ledgerRow(schoolYear: string, bought: number, inUse: number): SeatLedgerRow {
  return { schoolYear, bought, inUse, free: Math.max(bought - inUse, 0) };
}

/** The sentence shown whenever a seat is refused. */
export function noFreeSeatMessage(ledger: SeatLedgerRow): string {
  if (ledger.bought === 0) return `There are no seats for ${ledger.schoolYear} yet, so no student can be added. Seats need to be bought first.`;
  const taken = ledger.bought === 1 ? `The 1 seat for ${ledger.schoolYear} is in use` : `All ${ledger.bought} seats for ${ledger.schoolYear} are in use`;
  return `${taken}, so this student cannot be added. More seats need to be bought first.`;
}

export type SeatRefusal = { ok: false; reason: "no-free-seat"; message: string; ledger: SeatLedgerRow };

/** Locks the organisation's row for the rest of the transaction; every seat change takes this lock first. */
async function lockOrganisation(tx: Tx, organisationId: string) {
  const [org] = await tx
    .select({ id: organisations.id, kind: organisations.kind, name: organisations.name })
    .from(organisations)
    .where(eq(organisations.id, organisationId))
    .for("update");
  return org;
}

async function holdsSeat(tx: Tx, organisationId: string, schoolYear: string, studentId: string): Promise<boolean> {
  const [held] = await tx
    .select({ studentId: seatAssignments.studentId })
    .from(seatAssignments)
    .where(and(eq(seatAssignments.organisationId, organisationId), eq(seatAssignments.schoolYear, schoolYear), eq(seatAssignments.studentId, studentId)));
  return Boolean(held);
}

/** Gives a student one free seat; call inside a transaction that holds the organisation's lock. */
async function takeSeat(tx: Tx, organisationId: string, schoolYear: string, studentId: string): Promise<SeatRefusal | { ok: true; ledger: SeatLedgerRow }> {
  const ledger = await seatLedgerForYear({ db: tx }, organisationId, schoolYear);
  if (ledger.free < 1) return { ok: false, reason: "no-free-seat", message: noFreeSeatMessage(ledger), ledger };
  await tx.insert(seatAssignments).values({ organisationId, schoolYear, studentId });
  return { ok: true, ledger: ledgerRow(schoolYear, ledger.bought, ledger.inUse + 1) };
}

export type EnrollResult =
  | { ok: true; seatTaken: boolean; alreadyEnrolled: boolean; ledger: SeatLedgerRow }
  | SeatRefusal
  | { ok: false; reason: "class-not-found" | "not-a-student-here"; message: string };

/**
 * Puts a student into a class, taking one free seat of the class's school for the class's school year.
 * A student already holding a seat that year (say, in a second class) takes no second seat.
 * With no free seat the student is not enrolled and the answer says why.
 */
export async function enrollStudentUsingSeat({ db }: { db: Database }, input: { classId: string; studentId: string }): Promise<EnrollResult> {
  const [klass] = await db
    .select({ id: classes.id, organisationId: classes.organisationId, schoolYear: classes.schoolYear })
    .from(classes)
    .where(and(eq(classes.id, input.classId), isNull(classes.archivedAt)));
  if (!klass) return { ok: false, reason: "class-not-found", message: "That class does not exist or has been archived." };

  return db.transaction(async (tx) => {
    await lockOrganisation(tx, klass.organisationId);
    const [member] = await tx
      .select({ userId: memberships.userId })
      .from(memberships)
      .where(and(eq(memberships.userId, input.studentId), eq(memberships.organisationId, klass.organisationId), eq(memberships.role, "student")));
    if (!member) return { ok: false, reason: "not-a-student-here", message: "That student does not belong to this school." } as const;

    const [enrolled] = await tx
      .select({ studentId: enrollments.studentId })
      .from(enrollments)
      .where(and(eq(enrollments.classId, klass.id), eq(enrollments.studentId, input.studentId)));
    if (enrolled) {
      const ledger = await seatLedgerForYear({ db: tx }, klass.organisationId, klass.schoolYear);
      return { ok: true, seatTaken: false, alreadyEnrolled: true, ledger } as const;
    }

    let seatTaken = false;
    let ledger: SeatLedgerRow;
    if (await holdsSeat(tx, klass.organisationId, klass.schoolYear, input.studentId)) {
      ledger = await seatLedgerForYear({ db: tx }, klass.organisationId, klass.schoolYear);
    } else {
      const taken = await takeSeat(tx, klass.organisationId, klass.schoolYear, input.studentId);
      if (!taken.ok) return taken;
      seatTaken = true;
      ledger = taken.ledger;
    }
    await tx.insert(enrollments).values({ classId: klass.id, studentId: input.studentId });
    return { ok: true, seatTaken, alreadyEnrolled: false, ledger } as const;
  });
}

export type ReleaseResult = { removed: boolean; seatFreed: boolean; ledger: SeatLedgerRow | null };

/**
 * Takes a student out of a class. When that was their last class of the school year in this school,
 * their seat is freed for someone else.
 */
export async function releaseSeat({ db }: { db: Database }, input: { classId: string; studentId: string }): Promise<ReleaseResult> {
  const [klass] = await db
    .select({ id: classes.id, organisationId: classes.organisationId, schoolYear: classes.schoolYear })
    .from(classes)
    .where(eq(classes.id, input.classId));
  if (!klass) return { removed: false, seatFreed: false, ledger: null };

  return db.transaction(async (tx) => {
    await lockOrganisation(tx, klass.organisationId);
    const removed = await tx
      .delete(enrollments)
      .where(and(eq(enrollments.classId, klass.id), eq(enrollments.studentId, input.studentId)))
      .returning({ studentId: enrollments.studentId });
    const [otherClass] = await tx
      .select({ classId: enrollments.classId })
      .from(enrollments)
      .innerJoin(classes, eq(classes.id, enrollments.classId))
      .where(
        and(
          eq(enrollments.studentId, input.studentId),
          eq(classes.organisationId, klass.organisationId),
          eq(classes.schoolYear, klass.schoolYear),
          ne(classes.id, klass.id),
        ),
      )
      .limit(1);
    let seatFreed = false;
    if (!otherClass) {
      const freed = await tx
        .delete(seatAssignments)
        .where(
          and(
            eq(seatAssignments.organisationId, klass.organisationId),
            eq(seatAssignments.schoolYear, klass.schoolYear),
            eq(seatAssignments.studentId, input.studentId),
          ),
        )
        .returning({ studentId: seatAssignments.studentId });
      seatFreed = freed.length > 0;
    }
    const ledger = await seatLedgerForYear({ db: tx }, klass.organisationId, klass.schoolYear);
    return { removed: removed.length > 0, seatFreed, ledger };
  });
}

export type CreateChildResult =
  | { ok: true; child: { id: string; username: string; displayName: string }; ledger: SeatLedgerRow }
  | SeatRefusal
  | { ok: false; reason: "not-a-household" | "username-taken"; message: string };

/**
 * A parent makes an account for a child (no e-mail address; the child signs in with the household's
 * code and a username). The child takes one of the household's seats for the school year, in the
 * same transaction: no free seat, no account.
 */
export async function createChildUsingSeat(
  { db }: { db: Database },
  input: { householdId: string; schoolYear: string; displayName: string; username: string; gradeBand: "6-8" | "9-10"; passwordHash: string },
): Promise<CreateChildResult> {
  return db.transaction(async (tx) => {
    const org = await lockOrganisation(tx, input.householdId);
    if (!org || org.kind !== "household") return { ok: false, reason: "not-a-household", message: "Child accounts belong to a family." } as const;
    const username = input.username.trim().toLowerCase();
    const [taken] = await tx
      .select({ id: users.id })
      .from(users)
      .where(and(eq(users.homeOrganisationId, org.id), eq(users.username, username)));
    if (taken) return { ok: false, reason: "username-taken", message: `The username "${username}" is already used in your family. Choose another.` } as const;

    const ledger = await seatLedgerForYear({ db: tx }, org.id, input.schoolYear);
    if (ledger.free < 1) return { ok: false, reason: "no-free-seat", message: noFreeSeatMessage(ledger), ledger } as const;
    const [child] = await tx
      .insert(users)
      .values({ homeOrganisationId: org.id, username, displayName: input.displayName.trim(), gradeBand: input.gradeBand, passwordHash: input.passwordHash })
      .returning({ id: users.id, username: users.username, displayName: users.displayName });
    await tx.insert(memberships).values({ userId: child.id, organisationId: org.id, role: "student" });
    const taken2 = await takeSeat(tx, org.id, input.schoolYear, child.id);
    if (!taken2.ok) throw new Error("seat vanished inside a locked transaction");
    return { ok: true, child: { id: child.id, username: child.username ?? username, displayName: child.displayName }, ledger: taken2.ledger } as const;
  });
}

/**
 * Gives an existing child of a household a seat for another school year (a family's children keep
 * their accounts from year to year; each year takes a seat).
 */
export async function assignHouseholdSeat(
  { db }: { db: Database },
  input: { householdId: string; schoolYear: string; childId: string },
): Promise<{ ok: true; alreadyHeld: boolean; ledger: SeatLedgerRow } | SeatRefusal | { ok: false; reason: "not-a-child-here"; message: string }> {
  return db.transaction(async (tx) => {
    await lockOrganisation(tx, input.householdId);
    const [child] = await tx
      .select({ id: users.id })
      .from(users)
      .innerJoin(memberships, and(eq(memberships.userId, users.id), eq(memberships.organisationId, input.householdId), eq(memberships.role, "student")))
      .where(eq(users.id, input.childId));
    if (!child) return { ok: false, reason: "not-a-child-here", message: "That child is not part of this family." } as const;
    if (await holdsSeat(tx, input.householdId, input.schoolYear, child.id)) {
      return { ok: true, alreadyHeld: true, ledger: await seatLedgerForYear({ db: tx }, input.householdId, input.schoolYear) } as const;
    }
    const taken = await takeSeat(tx, input.householdId, input.schoolYear, child.id);
    return taken.ok ? ({ ok: true, alreadyHeld: false, ledger: taken.ledger } as const) : taken;
  });
}

/** The school's administrators, by name: who a teacher asks when the seats run out. */
export async function seatBuyers({ db }: { db: Queryable }, organisationId: string): Promise<Array<{ displayName: string; email: string | null }>> {
  return db
    .select({ displayName: users.displayName, email: users.email })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.organisationId, organisationId), eq(memberships.role, "school_admin")))
    .orderBy(asc(users.displayName));
}

export interface NoFreeSeatNotice {
  message: string;
  /** For an administrator: where to buy more. */
  buyUrl?: string;
  /** For a teacher who is not an administrator: who can buy more. */
  askAdministrators?: string[];
}

/**
 * What to show when a seat is refused: the sentence, and for an administrator a link to buy seats
 * for that year, for anyone else the names of the administrators to ask.
 */
export async function noFreeSeatNotice(
  { db }: { db: Queryable },
  refusal: SeatRefusal,
  viewer: { organisationId: string; isAdministrator: boolean },
): Promise<NoFreeSeatNotice> {
  if (viewer.isAdministrator) {
    return { message: refusal.message, buyUrl: `/school/seats/buy?${new URLSearchParams({ year: refusal.ledger.schoolYear, seats: "10" })}` };
  }
  const admins = await seatBuyers({ db }, viewer.organisationId);
  return { message: refusal.message, askAdministrators: admins.map((a) => a.displayName) };
}
