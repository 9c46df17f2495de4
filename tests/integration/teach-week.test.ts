// Small things a teacher reads in an ordinary week, checked through the pages' loaders and actions:
// a new time zone names how the assigned lessons' due times now read; the class code is written the
// same way on the teaching home as elsewhere; the roster lists names in the gradebook's order.
import { beforeAll, describe, expect, it } from "vitest";
import { schoolYearOf } from "~/lib/school-year";
import { dateToZonedInput } from "~/lib/teaching/time";
import * as teachHome from "~/routes/teach";
import * as classList from "~/routes/teach.classes";
import * as settings from "~/routes/teach.classes.$classId.settings";
import * as assignPage from "~/routes/teach.classes.$classId.assignments";
import * as roster from "~/routes/teach.classes.$classId.roster";
import { get, post, runRoute, sessionCookieFor } from "./auth-helpers";
import { demoIds } from "./teaching-helpers";

let ids: Awaited<ReturnType<typeof demoIds>>;
let cookie: string;
let classId: string;

beforeAll(async () => {
  ids = await demoIds();
  cookie = await sessionCookieFor("teacher");
  const made = await runRoute(
    classList.action as never,
    post("/teach/classes", { intent: "create", name: "Week test class", schoolYear: schoolYearOf(), organisationId: ids.maplebrook.id, timeZone: "UTC" }, { cookie }),
  );
  classId = (made.body as { created: string }).created;
}, 60_000);

describe("a teacher's week", () => {
  it("says, on a new time zone, that the assigned lessons keep their moment and how their due times read now", async () => {
    const day = 24 * 3600 * 1000;
    const due = new Date(Math.floor((Date.now() + 7 * day) / day) * day + 17 * 3600 * 1000); // 5 pm UTC, a week ahead
    const assigned = await runRoute(
      assignPage.action as never,
      post(`/teach/classes/${classId}/assignments`, { intent: "assign", slug: "01-measuring-deformation", opensAt: dateToZonedInput(new Date(), "UTC"), dueAt: dateToZonedInput(due, "UTC"), latePolicy: "accept" }, { cookie }),
      { classId },
    );
    expect(assigned.status).toBe(200);
    const moved = await runRoute(settings.action as never, post(`/teach/classes/${classId}/settings`, { intent: "time-zone", timeZone: "Asia/Kolkata" }, { cookie }), { classId });
    expect(moved.status).toBe(200);
    const done = (moved.body as { done: string }).done;
    expect(done).toMatch(/^Due dates now use Asia\/Kolkata\. Lessons already assigned keep the same moment, so their times read differently: /);
    expect(done).toMatch(/lesson 1 is now due [^()]*, 10:30 pm \(it read [^()]*, 5:00 pm in UTC\)\. If you meant the times as typed, change them under Lessons assigned\.$/);
    // Choosing the same zone again changes nothing, and says only that.
    const same = await runRoute(settings.action as never, post(`/teach/classes/${classId}/settings`, { intent: "time-zone", timeZone: "Asia/Kolkata" }, { cookie }), { classId });
    expect((same.body as { done: string }).done).toBe("Due dates now use Asia/Kolkata.");
  });

  it("writes the class code on the teaching home in two groups, as the class's own pages do", async () => {
    const home = await runRoute(teachHome.loader as never, get("/teach", { cookie }));
    const mine = (home.body as { classes: { id: string; code: string }[] }).classes.find((c) => c.id === classId)!;
    expect(mine.code).toMatch(/^[A-Z0-9]{4} [A-Z0-9]{4}$/);
    const list = await runRoute(classList.loader as never, get("/teach/classes", { cookie }));
    expect((list.body as { active: { id: string; code: string }[] }).active.find((c) => c.id === classId)!.code).toBe(mine.code);
  });

  it("lists the roster by name as people read it, accents among their letters, as the gradebook does", async () => {
    const suffix = String(Date.now() % 100000);
    for (const [displayName, username] of [["Fatima S.", `fatima.s${suffix}`], ["Émile D.", `emile.d${suffix}`], ["Dara K.", `dara.k${suffix}`]]) {
      const added = await runRoute(roster.action as never, post(`/teach/classes/${classId}/roster`, { intent: "add-one", displayName, username, gradeBand: "6-8", studentNumber: "", password: "" }, { cookie }), { classId });
      expect(added.status).toBe(200);
    }
    const page = await runRoute(roster.loader as never, get(`/teach/classes/${classId}/roster`, { cookie }), { classId });
    expect((page.body as { students: { displayName: string }[] }).students.map((s) => s.displayName)).toEqual(["Dara K.", "Émile D.", "Fatima S."]);
  });
});
