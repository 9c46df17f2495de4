// The student's list of assigned lessons, rendered as the server does: who set them, when a lesson
// assigned from a later day joins the list, and the late-work rule in words.
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { MemoryRouter } from "react-router";
import { describe, expect, it } from "vitest";
import { AssignedLessons } from "~/components/teaching/assigned-lessons";
import type { AssignedLesson } from "~/lib/teaching/assignments.server";

const lesson = (over: Partial<AssignedLesson>): AssignedLesson => ({
  slug: "02-force-and-deformation",
  number: 2,
  title: "Force and deformation",
  className: "Family lessons",
  opensAt: "2026-12-20T08:00:00.000Z",
  opensText: "Sun 20 Dec, 8:00 am",
  dueAt: "2026-12-27T17:00:00.000Z",
  dueText: "Sun 27 Dec, 5:00 pm",
  timeZone: "UTC",
  latePolicy: "accept",
  latePenaltyPercent: 0,
  opened: true,
  ...over,
});

const render = (lessons: AssignedLesson[], by: "teacher" | "parent") =>
  renderToStaticMarkup(createElement(MemoryRouter, null, createElement(AssignedLessons, { lessons, done: {}, by }))).replace(/<[^>]+>/g, " ").replace(/\s+/g, " ");

describe("assigned lessons on /learn", () => {
  it("names who set them: the teacher, or the parent at home", () => {
    expect(render([lesson({})], "teacher")).toContain("Assigned by your teacher");
    expect(render([lesson({})], "parent")).toContain("Assigned by your parent");
  });

  it("says from when a lesson not yet open is assigned, and still links it (the course is self-paced)", () => {
    const html = renderToStaticMarkup(createElement(MemoryRouter, null, createElement(AssignedLessons, { lessons: [lesson({ opened: false })], done: {}, by: "parent" })));
    expect(html).toContain('href="/learn/02-force-and-deformation"');
    expect(render([lesson({ opened: false })], "parent")).toContain("assigned from Sun 20 Dec, 8:00 am · due Sun 27 Dec, 5:00 pm");
  });

  it("states the late-work rule", () => {
    expect(render([lesson({ latePolicy: "penalty", latePenaltyPercent: 5 })], "teacher")).toContain("late answers lose 5% of their credit a day");
    expect(render([lesson({ latePolicy: "closed" })], "teacher")).toContain("closes at the due date");
    expect(render([lesson({ latePolicy: "accept" })], "teacher")).not.toMatch(/late|closes/);
  });
});
