// The weekly summary: parents hear about each child, teachers about each class, in Bendwise's look
// with a plain-text part; at most one a week per person; the one-click link at its foot stops it
// without signing in (and so does a mail program's own "unsubscribe" post); a link that was not made
// by us does nothing; the preference is kept and can be turned back on.
import { readFileSync } from "node:fs";
import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { mailPreferences } from "~/db/schema.server";
import { isoWeek, queueWeeklySummaries } from "~/lib/mail/weekly.server";
import { readWeeklySummaryToken, weeklySummaryToken } from "~/lib/mail/preferences.server";
import * as familyRoute from "~/routes/family";
import * as stopRoute from "~/routes/mail.weekly-summary";
import { demoSignIns } from "../../drizzle/scripts/seed";
import { get, post, runRoute, sessionCookieFor, userIdOf } from "./auth-helpers";
import { linkIn, mailsTo } from "./family-helpers";

const SUBJECT = "Your week on Bendwise";
const parentEmail = demoSignIns.parent.email;
const teacherEmail = demoSignIns.teacher.email;
const weekly = (address: string, count: number) => mailsTo(address, count, 8000, SUBJECT);
let parentId: string;

beforeAll(async () => {
  parentId = await userIdOf("parent");
});

describe("the weekly summary", () => {
  it("writes ISO weeks", () => {
    expect(isoWeek(new Date("2026-12-01T12:00:00Z"))).toBe("2026-W49");
    expect(isoWeek(new Date("2027-01-01T12:00:00Z"))).toBe("2026-W53");
    expect(isoWeek(new Date("2027-01-04T12:00:00Z"))).toBe("2027-W01");
  });

  it("goes to parents about each child and to teachers about each class, once a week", async () => {
    const now = new Date("2026-12-04T16:00:00Z");
    const first = await queueWeeklySummaries({ db }, { now });
    expect(first.queued).toBeGreaterThanOrEqual(4); // the demo parent and the demo teachers with classes

    const [toParent] = await weekly(parentEmail, 1);
    expect(toParent.text).toMatch(/Your children\n- Juno: \d of 8 lessons complete\./);
    expect(toParent.text).toMatch(/- Mika: \d of 8 lessons complete\./);
    expect(toParent.html).toContain("Stop the weekly summary");
    expect(toParent.html).toContain("#0d5c57");
    // The catcher keeps each message as an .eml file; its raw headers carry the one-click opt-out (RFC 8058).
    const raw = readFileSync((toParent as unknown as { source: string }).source, "utf8");
    expect(raw).toMatch(/^List-Unsubscribe:\s+<http[^>]*\/mail\/weekly-summary\?token=[0-9a-f-]{36}\.[A-Za-z0-9_-]+>/m);
    expect(raw).toMatch(/^List-Unsubscribe-Post: List-Unsubscribe=One-Click/m);

    const [toTeacher] = await weekly(teacherEmail, 1);
    expect(toTeacher.text).toMatch(/Your classes\n- Grade 7 Physical Science A: 10 students, \d+ lessons? assigned/);
    expect(toTeacher.text).not.toContain("Juno");

    // The same week again: nothing new.
    expect(await queueWeeklySummaries({ db }, { now: new Date("2026-12-05T09:00:00Z") })).toMatchObject({ queued: 0 });
    await new Promise((r) => setTimeout(r, 1000));
    expect(await weekly(parentEmail, 2)).toHaveLength(1);
    expect((await db.select().from(mailPreferences).where(eq(mailPreferences.userId, parentId)))[0]).toMatchObject({ weeklySummary: true, lastSummaryWeek: "2026-W49" });
  });

  it("stops with one click on the link, without signing in; the next week's run leaves the parent out", async () => {
    const [mail] = await weekly(parentEmail, 1);
    const link = linkIn(mail, "/mail/weekly-summary?token=");
    const stopped = await runRoute(stopRoute.loader as never, get(link));
    expect(stopped.status).toBe(200);
    expect(stopped.body).toEqual({ ok: true, on: false, email: parentEmail });
    expect((await db.select().from(mailPreferences).where(eq(mailPreferences.userId, parentId)))[0].weeklySummary).toBe(false);

    const next = await queueWeeklySummaries({ db }, { now: new Date("2026-12-11T16:00:00Z") });
    expect(next.queued).toBeGreaterThanOrEqual(3);
    await weekly(teacherEmail, 2);
    expect(await weekly(parentEmail, 2)).toHaveLength(1);

    // Turned back on from the same page.
    const resumed = await runRoute(stopRoute.action as never, post(link, { intent: "resume" }));
    expect(resumed.body).toEqual({ ok: true, on: true, email: parentEmail });
    const home = await runRoute(familyRoute.loader as never, get("/family", { cookie: await sessionCookieFor("parent") }));
    expect(home.body).toMatchObject({ weekly: true });
  });

  it("accepts a mail program's one-click post (RFC 8058) from its own servers", async () => {
    const token = weeklySummaryToken(parentId);
    const request = new Request(`http://127.0.0.1/mail/weekly-summary?token=${token}`, {
      method: "POST",
      headers: { "content-type": "application/x-www-form-urlencoded" },
      body: "List-Unsubscribe=One-Click",
    });
    const result = await runRoute(stopRoute.action as never, request);
    expect(result.body).toEqual({ ok: true, on: false, email: parentEmail });
  });

  it("does nothing for a link we did not make", async () => {
    const token = weeklySummaryToken(parentId);
    const teacherId = await userIdOf("teacher");
    const forged = [
      `${token.slice(0, -1)}${token.endsWith("A") ? "B" : "A"}`,
      `${teacherId}.${token.split(".")[1]}`,
      weeklySummaryToken(parentId, "some other secret that is long enough"),
      "nonsense",
    ];
    for (const t of forged) {
      expect(readWeeklySummaryToken(t)).toBeNull();
      const result = await runRoute(stopRoute.loader as never, get(`/mail/weekly-summary?token=${encodeURIComponent(t)}`));
      expect(result.status).toBe(404);
    }
    expect(readWeeklySummaryToken(token)).toBe(parentId);
    // The parent switches it on again from their family page.
    const cookie = await sessionCookieFor("parent");
    const on = await runRoute(familyRoute.action as never, post("/family", { intent: "weekly", on: "yes" }, { cookie }));
    expect(on.status).toBe(200);
    expect((await db.select().from(mailPreferences).where(eq(mailPreferences.userId, parentId)))[0].weeklySummary).toBe(true);
  });
});
