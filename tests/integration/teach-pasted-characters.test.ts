// A control character pasted into a teacher's form (NUL, escape: invisible, and refused by PostgreSQL)
// never ends in the error page that loses what was typed: class names and review comments are kept
// without it, and a username with it is named as no username at all.
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { classes, users, writtenAnswers } from "~/db/schema.server";
import * as classList from "~/routes/teach.classes";
import * as settings from "~/routes/teach.classes.$classId.settings";
import * as roster from "~/routes/teach.classes.$classId.roster";
import * as lessonPage from "~/routes/teach.classes.$classId.lessons.$slug";
import { post, runRoute, sessionCookieFor } from "./auth-helpers";
import { demoIds } from "./teaching-helpers";

let ids: Awaited<ReturnType<typeof demoIds>>;
let cookie: string;

beforeAll(async () => {
  ids = await demoIds();
  cookie = await sessionCookieFor("teacher");
}, 60_000);

describe("pasted control characters in the teacher's forms", () => {
  it("makes and renames a class whose typed name carries a NUL or an escape, keeping the name without them", async () => {
    const made = await runRoute(
      classList.action as never,
      post("/teach/classes", { intent: "create", name: "Period\u0000 5\u001b science", schoolYear: "2026-27", organisationId: ids.maplebrook.id, timeZone: "UTC" }, { cookie }),
    );
    expect(made.status).toBe(200);
    const classId = (made.body as { created: string }).created;
    expect((await db.select().from(classes).where(eq(classes.id, classId)))[0].name).toBe("Period 5 science");

    const renamed = await runRoute(settings.action as never, post(`/teach/classes/${classId}/settings`, { intent: "rename", name: "Period 6\u0000 science" }, { cookie }), { classId });
    expect(renamed.status).toBe(200);
    expect(renamed.body).toMatchObject({ done: "The class is now called “Period 6 science”." });
    expect((await db.select().from(classes).where(eq(classes.id, classId)))[0].name).toBe("Period 6 science");

    // A name of nothing but control characters is an empty name, said beside the field.
    const empty = await runRoute(settings.action as never, post(`/teach/classes/${classId}/settings`, { intent: "rename", name: "\u0000\u0007" }, { cookie }), { classId });
    expect(empty.status).toBe(400);
    expect(empty.body).toMatchObject({ field: "name", message: "Give the class a name." });
  });

  it("says a username with a control character, a space or an accent is no username, instead of looking it up", async () => {
    const add = (username: string) =>
      runRoute(roster.action as never, post(`/teach/classes/${ids.mapleB.id}/roster`, { intent: "add-existing", username }, { cookie }), { classId: ids.mapleB.id });
    for (const typed of ["amira\u0000.k", "amira k", "amïra.k"]) {
      const refused = await add(typed);
      expect(refused.status, typed).toBe(400);
      expect((refused.body as { error: string }).error, typed).toMatch(/^No student can have the username “am.ra.?.k”: a username is 3 to 40 letters a–z/);
    }
    expect(((await add("nobody.here")).body as { error: string }).error).toBe("No student at your school has the username “nobody.here”.");
  });

  it("saves a review whose comment carries a NUL, with the comment's line ends kept", async () => {
    const [hugo] = await db.select().from(users).where(and(eq(users.homeOrganisationId, ids.maplebrook.id), eq(users.username, "hugo.m")));
    const slug = "02-force-and-deformation";
    const saved = await runRoute(
      lessonPage.action as never,
      post(`/teach/classes/${ids.mapleA.id}/lessons/${slug}`, { intent: "review", studentId: hugo.id, slug, answerId: "cer-stiffness", claim: "2", evidence: "2", reasoning: "1", comment: "Good numbers.\u0000\r\nSay why the ratio matters." }, { cookie }),
      { classId: ids.mapleA.id, slug },
    );
    expect(saved.status).toBe(200);
    const [answer] = await db.select().from(writtenAnswers).where(and(eq(writtenAnswers.studentId, hugo.id), eq(writtenAnswers.lessonSlug, slug)));
    expect(JSON.stringify(answer)).toContain("Good numbers.\\r\\nSay why the ratio matters.");
  });
});
