// Nothing is lost when the mail server is down. This file runs its own mail catcher on free ports and
// its own mail worker pointed at it (not the in-process worker the other files use), then:
// stops the catcher; triggers five e-mails through the app's real paths (a sign-in link, a password
// reset, a family's address check, a teacher invitation and a receipt) — each page answers as usual;
// lets the worker fail on them for a while (each failure is put back with a growing wait); starts the
// catcher again on the same ports; and counts: all five arrive, each exactly once.
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { freePort } from "../../drizzle/scripts/local-stack";
import { listCaughtMail, startMailCatcher, type MailCatcher } from "../fakes/mail-catcher";

// This file sends its queue with a worker of its own, quickly retrying: set before the app's modules read the settings.
process.env.BENDWISE_MAIL_WORKER = "separate";
process.env.MAIL_RETRY_DELAY_SECONDS = "1";

type Worker = Awaited<ReturnType<typeof import("~/lib/mail/worker.server").startMailWorker>>;
let catcher: MailCatcher | null = null;
let worker: Worker;
let ports: { smtp: number; web: number };
const mailDir = mkdtempSync(path.join(tmpdir(), "bendwise-outage-mail-"));
/** When each attempt of each e-mail job failed, from the worker's log. */
const failures = new Map<string, number[]>();

beforeAll(async () => {
  ports = { smtp: await freePort(), web: await freePort() };
  catcher = await startMailCatcher(ports.smtp, ports.web, mailDir);
  const { startMailWorker } = await import("~/lib/mail/worker.server");
  worker = await startMailWorker({
    smtpUrl: `smtp://127.0.0.1:${ports.smtp}`,
    schedule: false,
    pollingIntervalSeconds: 0.5,
    log: (line) => {
      const match = /^e-mail ([0-9a-f-]{36}): attempt (\d+)/.exec(line);
      if (match) failures.set(match[1], [...(failures.get(match[1]) ?? []), Date.now()]);
    },
  });
}, 60_000);

afterAll(async () => {
  await worker?.stop();
  await catcher?.stop();
  const { closeMailQueue } = await import("~/lib/mail/queue.server");
  await closeMailQueue();
  rmSync(mailDir, { recursive: true, force: true });
});

async function jobStates() {
  const { db } = await import("~/db/client.server");
  const { sql } = await import("drizzle-orm");
  return [...(await db.execute<{ id: string; state: string; retry_count: number }>(sql`select id, state, retry_count from pgboss.job where name = 'mail' order by created_on`))];
}

async function waitFor<T>(what: string, probe: () => Promise<T | null | undefined | false>, timeoutMs: number): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await probe();
    if (value) return value;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

describe("the mail queue while the mail server is down", () => {
  it("keeps five e-mails through the outage and delivers each exactly once when the server is back", async () => {
    const h = await import("./auth-helpers");
    const { db } = await import("~/db/client.server");
    const { seatPurchases } = await import("~/db/schema.server");
    const { sendMail } = await import("~/lib/mailer.server");
    const { sendReceipt } = await import("~/lib/receipts.server");
    const { createHousehold } = await import("../factories/schools");
    const { demoSignIns } = await import("../../drizzle/scripts/seed");
    const routes = {
      link: await import("~/routes/sign-in.link"),
      reset: await import("~/routes/reset-password"),
      join: await import("~/routes/join.family"),
      teachers: await import("~/routes/school.teachers"),
    };
    const adminCookie = await h.sessionCookieFor("schoolAdmin");
    const { household, parent } = await createHousehold(db);
    const [purchase] = await db
      .insert(seatPurchases)
      .values({ organisationId: household.id, schoolYear: "2026-27", seats: 2, amountCents: 2800, method: "card", status: "paid", providerRef: `cs_outage_${household.id}`, paidAt: new Date(), buyerUserId: parent.id })
      .returning({ id: seatPurchases.id });
    const family = `outage.family.${household.id.slice(0, 8)}@test.example`;
    const teacher = `outage.teacher.${household.id.slice(0, 8)}@test.example`;
    const expected = [demoSignIns.teacher.email, demoSignIns.schoolAdmin.email, family, teacher, parent.email!].sort();

    // The mail server goes down.
    await catcher!.stop();
    catcher = null;
    const downSince = Date.now();

    // Five e-mails, each from a page (or the payment path) that answers as it always does.
    const link = await h.runRoute(routes.link.action as never, h.post("/sign-in/link", { intent: "send", email: demoSignIns.teacher.email }));
    expect(link.body).toMatchObject({ sent: true });
    const reset = await h.runRoute(routes.reset.action as never, h.post("/reset-password", { email: demoSignIns.schoolAdmin.email }));
    expect(reset.body).toMatchObject({ sent: true });
    const join = await h.runRoute(routes.join.action as never, h.post("/join/family", { displayName: "Noor Haddad", email: family, householdName: "The Haddad family", password: "blue river stones" }));
    expect(join.body).toEqual({ sentTo: family });
    const invite = await h.runRoute(routes.teachers.action as never, h.post("/school/teachers", { intent: "invite", displayName: "Ola Brandt", email: teacher }, { cookie: adminCookie }));
    expect(invite.status).toBe(200);
    expect(await sendReceipt({ db, sendMail, appUrl: h.appUrl }, purchase.id)).toBe("sent");

    // All five are in the queue, and the worker fails on each (then again, after a longer wait).
    expect(await jobStates()).toHaveLength(5);
    await waitFor("every e-mail to fail three times", async () => failures.size === 5 && [...failures.values()].every((t) => t.length >= 3), 30_000);
    const states = await jobStates();
    expect(states.every((j) => j.state === "retry")).toBe(true);
    // pg-boss waits delay × 2^n × (1 to 2) after the n-th failure: with a 1 s delay, 1–2 s, then 2–4 s (plus up to 0.5 s of polling).
    const first = [...failures.values()].map((t) => (t[1] - t[0]) / 1000);
    const second = [...failures.values()].map((t) => (t[2] - t[1]) / 1000);
    console.log(
      `mail server down ${((Date.now() - downSince) / 1000).toFixed(1)} s; failed attempts per e-mail: ${[...failures.values()].map((t) => t.length).join(", ")}; ` +
        `wait before the 2nd attempt: ${first.map((w) => w.toFixed(1)).join(", ")} s; before the 3rd: ${second.map((w) => w.toFixed(1)).join(", ")} s (retry delay 1 s, doubling, with jitter)`,
    );
    for (const wait of first) {
      expect(wait).toBeGreaterThanOrEqual(0.9);
      expect(wait).toBeLessThan(3);
    }
    for (const wait of second) {
      expect(wait).toBeGreaterThanOrEqual(1.9);
      expect(wait).toBeLessThan(5);
    }
    expect(await listCaughtMail(ports.web).catch(() => null)).toBeNull(); // nobody is listening

    // The mail server comes back on the same ports.
    catcher = await startMailCatcher(ports.smtp, ports.web, mailDir);
    const backAt = Date.now();
    const arrived = await waitFor("all five e-mails", async () => {
      const mails = await listCaughtMail(ports.web);
      return mails.length >= 5 ? mails : null;
    }, 30_000);
    const lastIn = (Date.now() - backAt) / 1000;
    // A little longer, to catch any e-mail that would come twice.
    await new Promise((r) => setTimeout(r, 2500));
    const all = await listCaughtMail(ports.web);
    expect(all).toHaveLength(5);
    expect(all.map((m) => m.to[0].address).sort()).toEqual(expected);
    expect(new Set(all.map((m) => m.subject)).size).toBe(5);
    expect(all.map((m) => m.subject)).toEqual(
      expect.arrayContaining([
        "Your Bendwise sign-in link",
        "Choose a new Bendwise password",
        "Confirm your address to start Bendwise",
        expect.stringMatching(/invites you to teach with Bendwise$/),
        expect.stringMatching(/^Bendwise receipt BW-/),
      ]),
    );
    expect((await jobStates()).map((j) => j.state)).toEqual(["completed", "completed", "completed", "completed", "completed"]);
    expect(worker.stats.delivered).toBe(5);
    console.log(`triggered 5, delivered ${arrived.length} within ${lastIn.toFixed(1)} s of the server's return, ${all.length} in the inbox after 2.5 s more; ${worker.stats.failedAttempts} failed attempts in all`);
  }, 90_000);
});
