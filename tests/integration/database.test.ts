// The migrated and seeded database: the demo is in place, running the seed again adds nothing,
// and the demo's two schools are separate.
import { count, eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { classes, enrollments, memberships, organisations, seatPurchases, users } from "~/db/schema.server";
import { seedDemo } from "../../drizzle/scripts/seed";
import { loader as healthLoader } from "~/routes/healthz";

async function tableCounts() {
  const tables = { organisations, users, memberships, classes, enrollments, seatPurchases };
  const result: Record<string, number> = {};
  for (const [name, table] of Object.entries(tables)) {
    const [row] = await db.select({ n: count() }).from(table);
    result[name] = row.n;
  }
  return result;
}

describe("demo data", () => {
  it("holds the invented school, the second school and the household", async () => {
    const orgs = await db.select({ slug: organisations.slug, kind: organisations.kind }).from(organisations);
    expect(orgs.map((o) => o.slug).sort()).toEqual(["harborside", "lindqvist-home", "maplebrook"]);
    const [maplebrook] = await db.select().from(organisations).where(eq(organisations.slug, "maplebrook"));
    expect(maplebrook.name).toMatch(/invented/);
    const maplebrookClasses = await db.select().from(classes).where(eq(classes.organisationId, maplebrook.id));
    expect(maplebrookClasses).toHaveLength(3);
    const students = await db
      .select({ n: count() })
      .from(memberships)
      .where(eq(memberships.organisationId, maplebrook.id));
    expect(students[0].n).toBeGreaterThanOrEqual(33); // 30 students, an administrator, two teachers
  });

  it("gives children no e-mail address", async () => {
    const children = await db.select({ email: users.email }).from(users).where(eq(users.gradeBand, "6-8"));
    expect(children.length).toBeGreaterThan(30);
    expect(children.every((c) => c.email === null)).toBe(true);
  });

  it("adds no duplicate rows when the seed runs again", async () => {
    const before = await tableCounts();
    await seedDemo(db);
    expect(await tableCounts()).toEqual(before);
  });
});

describe("health check", () => {
  it("answers ok when the database answers", async () => {
    const response = await healthLoader();
    expect(response.status).toBe(200);
    expect(await response.json()).toEqual({ ok: true });
  });
});
