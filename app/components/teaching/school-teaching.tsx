// The school's classes and teachers with how their students are doing: the administrator's view of
// teaching (on /school/classes). Summaries only: a class's gradebook stays with its teacher.
import { SlidingBox } from "~/components/sliding-box";
import type { SchoolTeaching } from "~/lib/teaching/school.server";

const pct = (v: number | null) => (v === null ? "—" : `${v}%`);

export function SchoolTeachingSection({ school }: { school: SchoolTeaching }) {
  return (
    <section aria-labelledby={`teaching-${school.id}`} className="mb-10" data-school={school.id}>
      <h2 id={`teaching-${school.id}`} className="mb-3 text-[length:var(--text-step-2)]">Classes at {school.name}</h2>
      {school.classes.length === 0 ? (
        <p className="mb-6 text-ink-soft">No classes yet. Teachers make them on their teaching page.</p>
      ) : (
        <SlidingBox label="Every class of the school with its progress" className="mb-8 rounded-lg border border-rule bg-card">
          {/* Wide enough that a class's name breaks between words; a phone scrolls the table in its box. */}
          <table className="w-full min-w-[46rem] border-collapse text-left text-[length:var(--text-step--1)]">
            <caption className="sr-only">Every class of the school with its progress</caption>
            <thead>
              <tr className="border-b-2 border-rule">
                <th scope="col" className="px-3 py-2">Class</th>
                <th scope="col" className="px-3 py-2">Teacher</th>
                <th scope="col" className="px-3 py-2">Year</th>
                <th scope="col" className="px-3 py-2">Students</th>
                <th scope="col" className="px-3 py-2">Lessons assigned</th>
                <th scope="col" className="px-3 py-2">Lesson work done</th>
                <th scope="col" className="px-3 py-2">Average score</th>
                <th scope="col" className="px-3 py-2">Stuck</th>
                <th scope="col" className="px-3 py-2">Late</th>
              </tr>
            </thead>
            <tbody>
              {school.classes.map((c) => (
                <tr key={c.id} className="border-b border-rule" data-class={c.name}>
                  <th scope="row" className="min-w-[10rem] max-w-[16rem] px-3 py-2 [overflow-wrap:anywhere]">{c.name}</th>
                  <td className="px-3 py-2">{c.teacherName}</td>
                  <td className="whitespace-nowrap px-3 py-2">{c.schoolYear}</td>
                  <td className="px-3 py-2">{c.summary.students}</td>
                  <td className="px-3 py-2">{c.summary.lessons}</td>
                  <td className="px-3 py-2">{pct(c.summary.completePercent)}</td>
                  <td className="px-3 py-2">{pct(c.summary.averageScore)}</td>
                  <td className="px-3 py-2">{c.summary.stuck}</td>
                  <td className="px-3 py-2">{c.summary.late}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </SlidingBox>
      )}
      <h3 className="mb-2 font-reading text-[length:var(--text-step-1)]">Teachers</h3>
      {school.teachers.length === 0 ? (
        <p className="text-ink-soft">No teachers yet.</p>
      ) : (
        <SlidingBox label="Every teacher of the school with their classes" className="rounded-lg border border-rule bg-card">
          <table className="w-full border-collapse text-left text-[length:var(--text-step--1)]">
            <caption className="sr-only">Every teacher of the school with their classes</caption>
            <thead>
              <tr className="border-b-2 border-rule">
                <th scope="col" className="px-3 py-2">Teacher</th>
                <th scope="col" className="px-3 py-2">Classes</th>
                <th scope="col" className="px-3 py-2">Students</th>
                <th scope="col" className="px-3 py-2">Lesson work done</th>
                <th scope="col" className="px-3 py-2">Students stuck</th>
              </tr>
            </thead>
            <tbody>
              {school.teachers.map((t) => (
                <tr key={t.id} className="border-b border-rule">
                  <th scope="row" className="px-3 py-2">{t.name}</th>
                  <td className="px-3 py-2">{t.classes}</td>
                  <td className="px-3 py-2">{t.students}</td>
                  <td className="px-3 py-2">{pct(t.completePercent)}</td>
                  <td className="px-3 py-2">{t.stuck}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </SlidingBox>
      )}
    </section>
  );
}
