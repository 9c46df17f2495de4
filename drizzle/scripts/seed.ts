// The demo: an INVENTED school, an INVENTED second school and an INVENTED household.
// Every name, code and figure here is made up for the demo. Running the seed again adds nothing twice.
import { and, eq } from "drizzle-orm";
import type { PostgresJsDatabase } from "drizzle-orm/postgres-js";
import { drizzle } from "drizzle-orm/postgres-js";
import postgres from "postgres";
import { hashPassword } from "~/lib/passwords.server";
import * as schema from "~/db/schema.server";
import { classes, enrollments, memberships, organisations, seatAssignments, seatPurchases, users } from "~/db/schema.server";
import type { Role } from "~/db/schema.server";
import { seedTeachingDemo } from "./seed-teaching";

type Db = PostgresJsDatabase<typeof schema>;

export const DEMO_SCHOOL_YEAR = "2026-27";
export const DEMO_ADULT_PASSWORD = "bendwise-demo-adult";
export const DEMO_STUDENT_PASSWORD = "strips-and-sticks";

/** The sign-ins printed by `npm start` and used by the tests. */
export const demoSignIns = {
  schoolAdmin: { email: "admin@maplebrook.example", password: DEMO_ADULT_PASSWORD },
  teacher: { email: "r.oduya@maplebrook.example", password: DEMO_ADULT_PASSWORD },
  secondTeacher: { email: "l.fenwick@maplebrook.example", password: DEMO_ADULT_PASSWORD },
  student: { code: "MAPLE7A", username: "amira.k", password: DEMO_STUDENT_PASSWORD },
  secondStudent: { code: "MAPLE7A", username: "ben.t", password: DEMO_STUDENT_PASSWORD },
  parent: { email: "sam.lindqvist@home.example", password: DEMO_ADULT_PASSWORD },
  child: { code: "LINDQ-HOME", username: "juno", password: DEMO_STUDENT_PASSWORD },
  otherSchoolAdmin: { email: "admin@harborside.example", password: DEMO_ADULT_PASSWORD },
  otherSchoolTeacher: { email: "p.nakamura@harborside.example", password: DEMO_ADULT_PASSWORD },
  otherSchoolStudent: { code: "HARBOR8", username: "theo.r", password: DEMO_STUDENT_PASSWORD },
} as const;

// Invented student names (first name and initial), ten per class.
const maplebrookStudents = [
  ["Amira K.", "amira.k"], ["Ben T.", "ben.t"], ["Carmen L.", "carmen.l"], ["Dev P.", "dev.p"],
  ["Elif S.", "elif.s"], ["Finn O.", "finn.o"], ["Grace W.", "grace.w"], ["Hugo M.", "hugo.m"],
  ["Ines R.", "ines.r"], ["Jonah B.", "jonah.b"], ["Kira N.", "kira.n"], ["Leo F.", "leo.f"],
  ["Maya D.", "maya.d"], ["Nils A.", "nils.a"], ["Olu E.", "olu.e"], ["Priya V.", "priya.v"],
  ["Quinn H.", "quinn.h"], ["Rosa G.", "rosa.g"], ["Sami J.", "sami.j"], ["Tara C.", "tara.c"],
  ["Umar Z.", "umar.z"], ["Vera I.", "vera.i"], ["Wes Y.", "wes.y"], ["Xia Q.", "xia.q"],
  ["Yusuf U.", "yusuf.u"], ["Zoe X.", "zoe.x"], ["Ari W.", "ari.w"], ["Bea M.", "bea.m"],
  ["Cal S.", "cal.s"], ["Dina F.", "dina.f"],
] as const;

async function upsertOrganisation(db: Db, values: typeof organisations.$inferInsert) {
  await db.insert(organisations).values(values).onConflictDoNothing({ target: organisations.slug });
  const [row] = await db.select().from(organisations).where(eq(organisations.slug, values.slug));
  return row;
}

async function upsertAdult(db: Db, email: string, displayName: string, passwordHash: string) {
  await db
    .insert(users)
    .values({ email, displayName, passwordHash, emailVerifiedAt: new Date() })
    .onConflictDoNothing({ target: users.email });
  const [row] = await db.select().from(users).where(eq(users.email, email));
  return row;
}

async function upsertChild(
  db: Db,
  homeOrganisationId: string,
  username: string,
  displayName: string,
  gradeBand: "6-8" | "9-10",
  passwordHash: string,
) {
  await db
    .insert(users)
    .values({ homeOrganisationId, username, displayName, gradeBand, passwordHash })
    .onConflictDoNothing({ target: [users.homeOrganisationId, users.username] });
  const [row] = await db
    .select()
    .from(users)
    .where(and(eq(users.homeOrganisationId, homeOrganisationId), eq(users.username, username)));
  return row;
}

async function grant(db: Db, userId: string, organisationId: string, role: Role) {
  await db.insert(memberships).values({ userId, organisationId, role }).onConflictDoNothing();
}

async function upsertClass(db: Db, values: typeof classes.$inferInsert) {
  await db.insert(classes).values(values).onConflictDoNothing({ target: classes.signInCode });
  const [row] = await db.select().from(classes).where(eq(classes.signInCode, values.signInCode));
  return row;
}

async function enroll(db: Db, classId: string, studentId: string) {
  await db.insert(enrollments).values({ classId, studentId }).onConflictDoNothing();
  // An enrolled student holds one of the school's seats for the class's school year.
  const [klass] = await db.select({ organisationId: classes.organisationId, schoolYear: classes.schoolYear }).from(classes).where(eq(classes.id, classId));
  await db.insert(seatAssignments).values({ ...klass, studentId }).onConflictDoNothing();
}

async function demoPurchase(db: Db, values: typeof seatPurchases.$inferInsert) {
  await db.insert(seatPurchases).values(values).onConflictDoNothing({ target: seatPurchases.providerRef });
}

export async function seedDemo(db: Db) {
  // Two hashes serve every demo account (each still salted); hashing forty times would only slow start-up.
  const adultHash = await hashPassword(DEMO_ADULT_PASSWORD);
  const studentHash = await hashPassword(DEMO_STUDENT_PASSWORD);

  // --- Maplebrook Middle School (invented) ---
  const maplebrook = await upsertOrganisation(db, { kind: "school", name: "Maplebrook Middle School (invented demo)", slug: "maplebrook" });
  const admin = await upsertAdult(db, demoSignIns.schoolAdmin.email, "Dana Whitcombe", adultHash);
  await grant(db, admin.id, maplebrook.id, "school_admin");
  const oduya = await upsertAdult(db, demoSignIns.teacher.email, "Ruth Oduya", adultHash);
  await grant(db, oduya.id, maplebrook.id, "teacher");
  const fenwick = await upsertAdult(db, demoSignIns.secondTeacher.email, "Lars Fenwick", adultHash);
  await grant(db, fenwick.id, maplebrook.id, "teacher");

  const maplebrookClasses = [
    await upsertClass(db, { organisationId: maplebrook.id, teacherId: oduya.id, name: "Grade 7 Physical Science A", schoolYear: DEMO_SCHOOL_YEAR, signInCode: "MAPLE7A" }),
    await upsertClass(db, { organisationId: maplebrook.id, teacherId: oduya.id, name: "Grade 7 Physical Science B", schoolYear: DEMO_SCHOOL_YEAR, signInCode: "MAPLE7B" }),
    await upsertClass(db, { organisationId: maplebrook.id, teacherId: fenwick.id, name: "Grade 8 Engineering Design", schoolYear: DEMO_SCHOOL_YEAR, signInCode: "MAPLE8E" }),
  ];
  for (const [i, [displayName, username]] of maplebrookStudents.entries()) {
    const student = await upsertChild(db, maplebrook.id, username, displayName, "6-8", studentHash);
    await grant(db, student.id, maplebrook.id, "student");
    await enroll(db, maplebrookClasses[Math.floor(i / 10)].id, student.id);
  }
  await demoPurchase(db, {
    organisationId: maplebrook.id, schoolYear: DEMO_SCHOOL_YEAR, seats: 40, amountCents: 40 * 900,
    method: "demo", status: "paid", providerRef: "demo-maplebrook-2026-27", paidAt: new Date(),
  });

  // --- Harborside Academy (invented), smaller: tests check that one school never sees the other ---
  const harborside = await upsertOrganisation(db, { kind: "school", name: "Harborside Academy (invented demo)", slug: "harborside" });
  const harborAdmin = await upsertAdult(db, demoSignIns.otherSchoolAdmin.email, "Ines Calder", adultHash);
  await grant(db, harborAdmin.id, harborside.id, "school_admin");
  const nakamura = await upsertAdult(db, demoSignIns.otherSchoolTeacher.email, "Paul Nakamura", adultHash);
  await grant(db, nakamura.id, harborside.id, "teacher");
  const harborClass = await upsertClass(db, { organisationId: harborside.id, teacherId: nakamura.id, name: "Grade 8 Science", schoolYear: DEMO_SCHOOL_YEAR, signInCode: "HARBOR8" });
  for (const [displayName, username] of [["Theo R.", "theo.r"], ["Uma S.", "uma.s"], ["Viktor L.", "viktor.l"]] as const) {
    const student = await upsertChild(db, harborside.id, username, displayName, "6-8", studentHash);
    await grant(db, student.id, harborside.id, "student");
    await enroll(db, harborClass.id, student.id);
  }
  await demoPurchase(db, {
    organisationId: harborside.id, schoolYear: DEMO_SCHOOL_YEAR, seats: 5, amountCents: 5 * 900,
    method: "demo", status: "paid", providerRef: "demo-harborside-2026-27", paidAt: new Date(),
  });

  // --- The Lindqvist household (invented): one parent, two children ---
  const household = await upsertOrganisation(db, { kind: "household", name: "Lindqvist household (invented demo)", slug: "lindqvist-home", signInCode: "LINDQ-HOME" });
  const parent = await upsertAdult(db, demoSignIns.parent.email, "Sam Lindqvist", adultHash);
  await grant(db, parent.id, household.id, "parent");
  for (const [displayName, username, band] of [["Juno", "juno", "6-8"], ["Mika", "mika", "9-10"]] as const) {
    const child = await upsertChild(db, household.id, username, displayName, band, studentHash);
    await grant(db, child.id, household.id, "student");
    await db.insert(seatAssignments).values({ organisationId: household.id, schoolYear: DEMO_SCHOOL_YEAR, studentId: child.id }).onConflictDoNothing();
  }
  await demoPurchase(db, {
    organisationId: household.id, schoolYear: DEMO_SCHOOL_YEAR, seats: 2, amountCents: 2 * 1400,
    method: "demo", status: "paid", providerRef: "demo-lindqvist-2026-27", paidAt: new Date(),
  });

  // --- Teaching: lesson 2 assigned to the demo teacher's class, with a few invented attempts ---
  await seedTeachingDemo(db);
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error("Set DATABASE_URL to seed a database by hand (npm start does it for you).");
  const client = postgres(url, { max: 1, onnotice: () => {} });
  await seedDemo(drizzle(client, { schema }));
  await client.end();
  console.log("Demo data is in place.");
}
