// The gradebook's column heads, rendered as the server does: a lesson assigned from a later day says
// from when, beside its due date.
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { MemoryRouter } from "react-router";
import { describe, expect, it } from "vitest";
import { GradebookTable } from "~/components/teaching/gradebook-table";
import type { GradebookView } from "~/lib/teaching/gradebook.server";

const lesson = (over: Record<string, unknown>) => ({
  assignmentId: "a2",
  slug: "02-force-and-deformation",
  number: 2,
  title: "Force and deformation",
  opensAt: "2026-12-20T08:00:00.000Z",
  dueAt: "2026-12-27T17:00:00.000Z",
  opensText: "Sun 20 Dec, 8:00 am",
  dueText: "Sun 27 Dec, 5:00 pm",
  latePolicy: "accept",
  latePenaltyPercent: 0,
  opened: true,
  exercises: [],
  inCourse: true,
  ...over,
});

const heads = (lessons: ReturnType<typeof lesson>[]) =>
  renderToStaticMarkup(createElement(MemoryRouter, null, createElement(GradebookTable, { classId: "c", book: { lessons } as unknown as GradebookView, rows: [] })))
    .replace(/<[^>]+>/g, " ")
    .replace(/\s+/g, " ");

describe("gradebook column heads", () => {
  it("say from when a lesson not yet open is assigned, and only the due date once it is open", () => {
    expect(heads([lesson({ opened: false })])).toContain("assigned from Sun 20 Dec, 8:00 am · due Sun 27 Dec, 5:00 pm");
    expect(heads([lesson({ opened: true })])).not.toContain("assigned from");
  });
});
