// The weekly summary: one e-mail per adult who has something to hear about — a parent about each
// child (lessons complete, the last seven days, what is due soon), a teacher about each of their
// classes (from the same gradebook the teacher reads). Queued, never sent directly, so a mail server
// that is down delays the summaries but loses none.
//
// Once a week at most: each recipient is claimed in mail_preferences (last_summary_week) in the same
// statement that checks they still want it, so a second run in the same week, or two workers at
// once, queue nothing twice. A failure to queue gives the claim back.
import { and, asc, eq, gte, inArray, isNotNull, isNull, sql } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import { plural } from "~/lib/plural";
import { classes, exerciseAttempts, mailPreferences, memberships, organisations, users, writtenAnswers } from "~/db/schema.server";
import { serverEnv } from "~/env.server";
import { courseProgress, NO_TRY_OUTCOMES_SQL } from "~/lib/course.server";
import { renderEmail, sendMail, type OutgoingMail } from "~/lib/mailer.server";
import { assignedLessonsFor } from "~/lib/teaching/assignments.server";
import { loadGradebooks } from "~/lib/teaching/gradebook.server";
import { DAY_MS, formatDue } from "~/lib/teaching/time";
import { weeklySummaryStopUrl } from "./preferences.server";

/** The ISO 8601 week of a date, e.g. "2026-W49" (weeks start on Monday; week 1 holds the first Thursday). */
export function isoWeek(date: Date): string {
  const day = new Date(Date.UTC(date.getUTCFullYear(), date.getUTCMonth(), date.getUTCDate()));
  const weekday = day.getUTCDay() || 7;
  day.setUTCDate(day.getUTCDate() + 4 - weekday);
  const yearStart = Date.UTC(day.getUTCFullYear(), 0, 1);
  const week = Math.ceil(((day.getTime() - yearStart) / DAY_MS + 1) / 7);
  return `${day.getUTCFullYear()}-W${String(week).padStart(2, "0")}`;
}

interface Recipient {
  id: string;
  email: string;
  displayName: string;
  householdIds: string[];
  isTeacher: boolean;
}

export interface WeeklySummary {
  userId: string;
  mail: OutgoingMail;
}

/** Every summary due now, composed but not queued. A fixed number of queries plus a few per child. */
export async function composeWeeklySummaries({ db }: { db: Database }, now: Date = new Date()): Promise<WeeklySummary[]> {
  const appUrl = serverEnv().APP_URL.replace(/\/$/, "");
  const weekAgo = new Date(now.getTime() - 7 * DAY_MS);
  const adults = await db
    .select({ id: users.id, email: users.email, displayName: users.displayName, role: memberships.role, organisationId: memberships.organisationId, kind: organisations.kind })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .innerJoin(organisations, eq(organisations.id, memberships.organisationId))
    .leftJoin(mailPreferences, eq(mailPreferences.userId, users.id))
    .where(
      and(
        isNotNull(users.email),
        isNull(users.homeOrganisationId),
        sql`coalesce(${mailPreferences.weeklySummary}, true)`,
        sql`(${memberships.role} = 'parent' and ${organisations.kind} = 'household') or (${memberships.role} = 'teacher' and ${organisations.kind} = 'school')`,
      ),
    );
  const recipients = new Map<string, Recipient>();
  for (const a of adults) {
    const r = recipients.get(a.id) ?? { id: a.id, email: a.email!, displayName: a.displayName, householdIds: [], isTeacher: false };
    if (a.role === "parent") r.householdIds.push(a.organisationId);
    else r.isTeacher = true;
    recipients.set(a.id, r);
  }
  if (recipients.size === 0) return [];

  const householdIds = [...new Set([...recipients.values()].flatMap((r) => r.householdIds))];
  const teacherIds = [...recipients.values()].filter((r) => r.isTeacher).map((r) => r.id);
  const [children, classRows] = await Promise.all([
    householdIds.length === 0
      ? Promise.resolve([])
      : db
          .select({ id: users.id, displayName: users.displayName, householdId: memberships.organisationId })
          .from(users)
          .innerJoin(memberships, and(eq(memberships.userId, users.id), eq(memberships.organisationId, users.homeOrganisationId), eq(memberships.role, "student")))
          .where(inArray(users.homeOrganisationId, householdIds))
          .orderBy(asc(users.displayName)),
    teacherIds.length === 0
      ? Promise.resolve([])
      : db
          .select({ id: classes.id, name: classes.name, teacherId: classes.teacherId, timeZone: classes.timeZone })
          .from(classes)
          .innerJoin(organisations, and(eq(organisations.id, classes.organisationId), eq(organisations.kind, "school")))
          .where(and(inArray(classes.teacherId, teacherIds), isNull(classes.archivedAt)))
          .orderBy(asc(classes.name)),
  ]);
  const childIds = children.map((c) => c.id);
  const [attemptsThisWeek, answersThisWeek, books] = await Promise.all([
    childIds.length === 0
      ? Promise.resolve([])
      : db
          .select({
            studentId: exerciseAttempts.studentId,
            checked: sql<number>`count(*) filter (where ${exerciseAttempts.outcome} not in ${NO_TRY_OUTCOMES_SQL})`.mapWith(Number),
            right: sql<number>`count(*) filter (where ${exerciseAttempts.correct} = 1)`.mapWith(Number),
          })
          .from(exerciseAttempts)
          .where(and(inArray(exerciseAttempts.studentId, childIds), gte(exerciseAttempts.createdAt, weekAgo)))
          .groupBy(exerciseAttempts.studentId),
    childIds.length === 0
      ? Promise.resolve([])
      : db
          .select({ studentId: writtenAnswers.studentId, n: sql<number>`count(*)`.mapWith(Number) })
          .from(writtenAnswers)
          .where(and(inArray(writtenAnswers.studentId, childIds), gte(writtenAnswers.handedInAt, weekAgo)))
          .groupBy(writtenAnswers.studentId),
    loadGradebooks({ db }, classRows.map((c) => c.id), now),
  ]);

  // Per child: the course path and what is due; a handful of queries each, once a week.
  const childLines = new Map<string, string>();
  for (const child of children) {
    const [progress, assigned] = await Promise.all([courseProgress({ db }, child.id), assignedLessonsFor({ db }, child.id, now)]);
    const complete = progress.filter((p) => p.complete).length;
    const week = attemptsThisWeek.find((a) => a.studentId === child.id);
    const handedIn = answersThisWeek.find((a) => a.studentId === child.id)?.n ?? 0;
    const activity =
      week || handedIn
        ? `In the last 7 days: ${plural(week?.checked ?? 0, "answer")} checked, ${week?.right ?? 0} right${handedIn ? `; ${plural(handedIn, "written answer")} handed in` : ""}.`
        : "Nothing done in the last 7 days.";
    const soon = assigned.filter((a) => {
      const due = new Date(a.dueAt).getTime();
      return due >= now.getTime() && due <= now.getTime() + 7 * DAY_MS && !progress.find((p) => p.slug === a.slug)?.complete;
    });
    const due = soon.length > 0 ? ` Due soon: ${soon.map((a) => `lesson ${a.number}, ${a.title} (${formatDue(a.dueAt, a.timeZone, now)})`).join("; ")}.` : "";
    childLines.set(child.id, `${child.displayName}: ${complete} of ${progress.length} lessons complete. ${activity}${due}`);
  }

  const summaries: WeeklySummary[] = [];
  for (const r of recipients.values()) {
    const sections: { heading: string; lines: string[] }[] = [];
    const mine = children.filter((c) => r.householdIds.includes(c.householdId));
    if (mine.length > 0) sections.push({ heading: "Your children", lines: mine.map((c) => childLines.get(c.id)!) });
    const theirClasses = classRows.filter((c) => c.teacherId === r.id);
    if (theirClasses.length > 0) {
      sections.push({
        heading: "Your classes",
        lines: theirClasses.map((c) => {
          const s = books.get(c.id)!.summary;
          const parts = [
            `${plural(s.students, "student")}, ${plural(s.lessons, "lesson")} assigned`,
            s.completePercent === null ? null : `${s.completePercent}% of the assigned work complete`,
            s.stuck ? `${s.stuck} stuck` : null,
            s.notStarted ? `${s.notStarted} not started` : null,
            s.toReview ? `${plural(s.toReview, "written answer")} waiting for your review` : null,
          ].filter(Boolean);
          return `${c.name}: ${parts.join("; ")}.`;
        }),
      });
    }
    if (sections.length === 0) continue;
    const stopUrl = weeklySummaryStopUrl(r.id, appUrl);
    const home = mine.length > 0 ? `${appUrl}/family` : `${appUrl}/teach`;
    const { text, html } = renderEmail({
      heading: "Your week on Bendwise",
      paragraphs: [`Hello ${r.displayName},`, "here is what happened on Bendwise in the last seven days."],
      sections,
      button: { label: mine.length > 0 ? "Open your family page" : "Open your teaching page", url: home },
      footnote: `You get this summary once a week because you ${
        mine.length > 0 && theirClasses.length > 0 ? "have children and teach classes" : mine.length > 0 ? "have children" : "teach classes"
      } on Bendwise. One click on the link below stops it; no sign-in needed.`,
      smallLink: { label: "Stop the weekly summary", url: stopUrl },
    });
    summaries.push({
      userId: r.id,
      mail: {
        to: r.email,
        subject: "Your week on Bendwise",
        text,
        html,
        headers: { "List-Unsubscribe": `<${stopUrl}>`, "List-Unsubscribe-Post": "List-Unsubscribe=One-Click" },
      },
    });
  }
  return summaries;
}

/** Claims a recipient for this week: false when they have opted out or already have this week's summary. */
async function claim(db: Database, userId: string, week: string): Promise<{ previous: string | null } | null> {
  const rows = await db.execute<{ previous: string | null }>(sql`
    with before as (select ${mailPreferences.lastSummaryWeek} as previous from ${mailPreferences} where ${mailPreferences.userId} = ${userId})
    insert into ${mailPreferences} (user_id, weekly_summary, last_summary_week) values (${userId}, true, ${week})
    on conflict (user_id) do update set last_summary_week = excluded.last_summary_week, updated_at = now()
      where ${mailPreferences.weeklySummary} and ${mailPreferences.lastSummaryWeek} is distinct from excluded.last_summary_week
    returning (select previous from before) as previous`);
  return rows[0] ? { previous: rows[0].previous ?? null } : null;
}

/**
 * Composes this week's summaries and queues each once. `force` (the demo command) sends them again
 * even if this week's went out already; opted-out adults never get one.
 */
export async function queueWeeklySummaries(
  { db, send = sendMail }: { db: Database; send?: (mail: OutgoingMail) => Promise<void> },
  options: { now?: Date; force?: boolean } = {},
): Promise<{ queued: number; skipped: number }> {
  const now = options.now ?? new Date();
  const week = isoWeek(now);
  const summaries = await composeWeeklySummaries({ db }, now);
  let queued = 0;
  let skipped = 0;
  for (const summary of summaries) {
    const claimed = options.force ? { previous: null } : await claim(db, summary.userId, week);
    if (!claimed) {
      skipped++;
      continue;
    }
    try {
      await send(summary.mail);
      queued++;
    } catch (error) {
      if (!options.force) {
        await db.update(mailPreferences).set({ lastSummaryWeek: claimed.previous }).where(eq(mailPreferences.userId, summary.userId));
      }
      throw error;
    }
  }
  return { queued, skipped };
}
