// /teach/classes/:classId/roster: the class's students. Add one, add a student who already has an
// account at the school, or add many from a CSV file: the file is checked first and every problem is
// named by row and column; nothing is saved until the teacher confirms a file without problems, and
// then all rows are saved in one transaction (or none). First passwords are shown once, to hand out.
import { useEffect, useState } from "react";
import { Form, Link, data, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/teach.classes.$classId.roster";
import { db } from "~/db/client.server";
import { assertSameOrigin } from "~/lib/auth.server";
import { noFreeSeatNotice, seatLedgerForYear, type NoFreeSeatNotice as SeatNotice, type SeatRefusal } from "~/lib/seats.server";
import { NoFreeSeatNotice } from "~/components/seats";
import { classHeading } from "~/lib/teaching/classes.server";
import { requireTeacherClass } from "~/lib/teaching/guard.server";
import {
  MAX_ROSTER_BYTES,
  addExistingStudent,
  addStudents,
  classRoster,
  displayNameProblem,
  importRoster,
  previewRoster,
  studentNumberProblem,
  usernameProblem,
  type RosterPreview,
} from "~/lib/teaching/roster.server";
import { checkNewPassword } from "~/lib/auth/password-rules.server";
import { problemPlace, USERNAME_MAX, USERNAME_RULE } from "~/lib/teaching/shared";
import { addStudentsLabel } from "~/lib/teaching/words";
import { ClassHeader, Notice, SelectField, TextField } from "~/components/teaching/ui";
import { LeavingQuestion, useAskBeforeLeaving } from "~/components/leaving-question";
import { SendButton } from "~/components/send-button";
import { SlidingBox } from "~/components/sliding-box";

const gradeBand = z.enum(["6-8", "9-10"], { error: "Choose grades 6–8 or 9–10." });

const intentSchema = z.discriminatedUnion("intent", [
  z.object({
    intent: z.literal("add-one"),
    displayName: z.string().trim(),
    username: z.string().trim().toLowerCase(),
    studentNumber: z.string().trim().default(""),
    gradeBand,
    password: z.string().default(""),
  }),
  z.object({ intent: z.literal("add-existing"), username: z.string().trim().toLowerCase() }),
  z.object({ intent: z.literal("import-csv"), csv: z.string().max(MAX_ROSTER_BYTES * 2), gradeBand, fileName: z.string().max(200).default("") }),
]);

type Added = { displayName: string; username: string; password: string }[];
type ActionResult =
  | { intent: "add-one"; errors: Record<string, string>; values: Record<string, string>; seatNotice?: SeatNotice }
  | { intent: "add-existing"; error?: string; done?: string; seatNotice?: SeatNotice }
  | { intent: "preview-csv" | "import-csv"; preview?: RosterPreview; csv?: string; gradeBand?: string; fileName?: string; error?: string; seatNotice?: SeatNotice }
  | { intent: "added"; added: Added }
  | { intent: "form"; error: string };

export async function loader({ request, params }: Route.LoaderArgs) {
  const { klass } = await requireTeacherClass(request, params.classId);
  const [students, seats] = await Promise.all([
    classRoster({ db }, klass.id),
    seatLedgerForYear({ db }, klass.organisationId, klass.schoolYear),
  ]);
  return { klass: classHeading(klass), students, seats };
}

export async function action({ request, params }: Route.ActionArgs) {
  assertSameOrigin(request);
  const { klass, user } = await requireTeacherClass(request, params.classId);
  const reply = (result: ActionResult, status = 200) => (status === 200 ? result : data(result, { status }));
  // A refused seat comes with the seat rules' own words: a buy link for an administrator, their names for a teacher.
  const notice = async (refusal: SeatRefusal | null | undefined) =>
    refusal
      ? noFreeSeatNotice({ db }, refusal, {
          organisationId: klass.organisationId,
          isAdministrator: user.memberships.some((m) => m.organisationId === klass.organisationId && m.role === "school_admin"),
        })
      : undefined;
  if ((request.headers.get("content-type") ?? "").startsWith("multipart/form-data")) {
    const upload = await readUpload(request);
    if ("error" in upload) return reply({ intent: "preview-csv", error: upload.error }, 400);
    const preview = await previewRoster({ db }, klass, upload.text);
    return reply(
      { intent: "preview-csv", preview, csv: upload.text, gradeBand: upload.gradeBand, fileName: upload.fileName, seatNotice: await notice(preview.seatShortage) },
      preview.problems.length > 0 ? 400 : 200,
    );
  }
  const form = Object.fromEntries(await request.formData());
  const parsed = intentSchema.safeParse(form);
  if (!parsed.success) return reply({ intent: "form", error: parsed.error.issues[0]?.message ?? "That request was not understood." }, 400);
  const input = parsed.data;
  switch (input.intent) {
    case "add-one": {
      const values = { displayName: input.displayName, username: input.username, studentNumber: input.studentNumber, gradeBand: input.gradeBand };
      const errors: Record<string, string> = {};
      const problems = {
        displayName: displayNameProblem(input.displayName),
        username: usernameProblem(input.username),
        studentNumber: input.studentNumber ? studentNumberProblem(input.studentNumber) : null,
        password: input.password ? checkNewPassword(input.password, { username: input.username }) : null,
      };
      for (const [field, problem] of Object.entries(problems)) if (problem) errors[field] = problem;
      if (Object.keys(errors).length > 0) return reply({ intent: "add-one", errors, values }, 400);
      const result = await addStudents({ db }, klass, [{ ...input }]);
      if (!result.ok) {
        const field = result.refusal ? "form" : result.message.includes("username") ? "username" : "form";
        return reply({ intent: "add-one", errors: { [field]: result.message }, values, seatNotice: await notice(result.refusal) }, field === "form" ? 409 : 400);
      }
      return reply({ intent: "added", added: result.added });
    }
    case "add-existing": {
      if (!input.username) return reply({ intent: "add-existing", error: "Type the student's username." }, 400);
      if (input.username.length > USERNAME_MAX) return reply({ intent: "add-existing", error: `That is longer than any username: a username has at most ${USERNAME_MAX} characters.` }, 400);
      const result = await addExistingStudent({ db }, klass, input.username);
      return result.ok
        ? reply({ intent: "add-existing", done: `${result.displayName} is now in this class.` })
        : reply({ intent: "add-existing", error: result.message, seatNotice: await notice(result.refusal) }, 400);
    }
    case "import-csv": {
      const result = await importRoster({ db }, klass, input.csv, input.gradeBand);
      if (!result.ok) {
        return reply(
          { intent: "import-csv", preview: result.preview, csv: input.csv, gradeBand: input.gradeBand, fileName: input.fileName, error: result.message, seatNotice: await notice(result.refusal ?? result.preview.seatShortage) },
          400,
        );
      }
      return reply({ intent: "added", added: result.added });
    }
  }
}

/** The uploaded file as text: size and kind checked, UTF-8 (with or without BOM) or else Windows-1252. */
async function readUpload(request: Request): Promise<{ text: string; gradeBand: "6-8" | "9-10"; fileName: string } | { error: string }> {
  const length = Number(request.headers.get("content-length") ?? 0);
  if (length > MAX_ROSTER_BYTES + 10_000) return { error: `The file is too large. A roster file is at most ${MAX_ROSTER_BYTES / 1000} KB.` };
  let form: FormData;
  try {
    form = await request.formData();
  } catch {
    return { error: "The upload did not arrive in one piece. Please choose the file again." };
  }
  const band = gradeBand.safeParse(form.get("gradeBand"));
  if (!band.success) return { error: "Choose the grade band of these students." };
  const file = form.get("file");
  if (!(file instanceof File) || file.size === 0) return { error: "Choose a CSV file to check." };
  if (file.size > MAX_ROSTER_BYTES) return { error: `The file is too large. A roster file is at most ${MAX_ROSTER_BYTES / 1000} KB.` };
  const bytes = new Uint8Array(await file.arrayBuffer());
  if (bytes[0] === 0x50 && bytes[1] === 0x4b) {
    return { error: "This looks like a spreadsheet workbook, not a CSV file. In your spreadsheet program, use “Save as” or “Download” and pick CSV." };
  }
  let text: string;
  try {
    text = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    // Older spreadsheet programs save CSV in Windows-1252.
    text = new TextDecoder("windows-1252").decode(bytes);
  }
  if (text.includes("\u0000")) return { error: "This file is not a text file. Save the roster as CSV and try again." };
  return { text, gradeBand: band.data, fileName: file.name.slice(0, 200) };
}

const BANDS = [
  { value: "6-8", label: "Grades 6–8" },
  { value: "9-10", label: "Grades 9–10" },
];

export default function Roster({ loaderData, actionData }: Route.ComponentProps) {
  const { klass, students, seats } = loaderData;
  const result = actionData as ActionResult | undefined;
  const busy = useNavigation().state === "submitting";
  const addOne = result?.intent === "add-one" ? result : undefined;
  const existing = result?.intent === "add-existing" ? result : undefined;
  const csv = result?.intent === "preview-csv" || result?.intent === "import-csv" ? result : undefined;
  const added = result?.intent === "added" ? result.added : undefined;
  // First passwords gather here while the page is open: adding students one by one, or a failed add
  // in between, keeps the ones already made in the list to hand out (they are not kept anywhere else).
  const [handout, setHandout] = useState<Added>([]);
  useEffect(() => {
    if (added) setHandout((list) => [...list.filter((a) => !added.some((b) => b.username === a.username)), ...added]);
  }, [added]);

  return (
    <div className="mx-auto max-w-6xl px-5 py-10">
      <ClassHeader klass={klass} />
      <p className="mb-4 text-ink-soft">
        {students.length} {students.length === 1 ? "student" : "students"} · your school has {seats.free} free {seats.free === 1 ? "seat" : "seats"} for {seats.schoolYear}
      </p>
      {result?.intent === "form" ? <Notice tone="problem">{result.error}</Notice> : null}
      {handout.length > 0 ? <AddedStudents added={handout} code={klass.code} onDone={() => setHandout([])} /> : null}

      {students.length === 0 ? (
        <p className="mb-8">No students yet. Add them one by one or from a CSV file below.</p>
      ) : (
        <div className="mb-10 overflow-x-auto">
          <table className="w-full border-collapse text-left">
            <caption className="sr-only">Students in {klass.name}</caption>
            <thead>
              <tr className="border-b-2 border-rule">
                <th scope="col" className="py-2 pr-4">Student</th>
                <th scope="col" className="py-2 pr-4">Username</th>
                <th scope="col" className="py-2 pr-4">Grades</th>
                <th scope="col" className="py-2 pr-4">Student number</th>
              </tr>
            </thead>
            <tbody>
              {students.map((s) => (
                <tr key={s.id} className="border-b border-rule">
                  <td className="py-2 pr-4">
                    <Link to={`/teach/classes/${klass.id}/students/${s.id}`}>{s.displayName}</Link>
                  </td>
                  <td className="py-2 pr-4 font-mono">{s.username}</td>
                  <td className="py-2 pr-4">{s.gradeBand ?? "—"}</td>
                  <td className="py-2 pr-4">{s.studentNumber ?? "—"}</td>
                </tr>
              ))}
            </tbody>
          </table>
          <p className="mt-2 text-[length:var(--text-step--1)] text-ink-soft">
            Open a student to see their work, set a new password, give more tries or time, or move them to another class.
          </p>
        </div>
      )}

      {klass.archived ? (
        <Notice tone="info">
          <p data-testid="archived-roster">
            This class is archived, so no student can be added to it. <Link to={`/teach/classes/${klass.id}/settings`}>Restore it in the class settings</Link> to add students again.
          </p>
        </Notice>
      ) : (
        <>
        <section className="card mb-8" aria-labelledby="from-file">
          <h2 id="from-file" className="mb-2 text-[length:var(--text-step-1)]">Add students from a CSV file</h2>
          <p className="mb-1">
            A header row, then one student a row, with the columns <strong>display name</strong>, <strong>username</strong> and, if your school uses
            them, <strong>student number</strong>. Other columns are left out: Bendwise keeps nothing more about a child.
          </p>
          <SlidingBox label="An example file" className="mb-4 rounded bg-paper">
            <pre className="p-3 font-mono text-[length:var(--text-step--1)]">
              {"display name,username,student number\nAmara O.,amara.o,70431\nBruno L.,bruno.l,70432"}
            </pre>
          </SlidingBox>
          <p className="mb-4 text-ink-soft">The file is checked first. Nothing is saved until you confirm a file without problems.</p>
          <Form method="post" preventScrollReset encType="multipart/form-data" key={csv?.fileName ?? "upload"}>
            <div className="grid gap-x-4 sm:grid-cols-2">
              <div className="mb-4">
                <label htmlFor="roster-file" className="mb-1 block font-bold">CSV file</label>
                <input id="roster-file" name="file" type="file" accept=".csv,text/csv,text/plain" required className="field" />
              </div>
              <SelectField label="Grade band of these students" name="gradeBand" defaultValue={csv?.gradeBand ?? "6-8"} options={BANDS} />
            </div>
            <SendButton className="btn" busy={busy}>Check the file</SendButton>
          </Form>
          {csv ? <RosterCheck result={csv} busy={busy} /> : null}
        </section>

        <div className="grid gap-6 md:grid-cols-2">
          <section className="card" aria-labelledby="add-one">
            <h2 id="add-one" className="mb-3 text-[length:var(--text-step-1)]">Add one student</h2>
            {addOne?.seatNotice ? <NoFreeSeatNotice notice={addOne.seatNotice} /> : addOne?.errors.form ? <Notice tone="problem">{addOne.errors.form}</Notice> : null}
            <Form method="post" preventScrollReset noValidate key={added ? added.map((a) => a.username).join() : "add-one"}>
              <input type="hidden" name="intent" value="add-one" />
              <TextField label="Display name" hint="First name and initial is enough; up to 60 characters." name="displayName" required autoComplete="off" defaultValue={addOne?.values.displayName} error={addOne?.errors.displayName} />
              <TextField label="Username" hint={`${USERNAME_RULE}; unique at your school.`} name="username" required autoComplete="off" autoCapitalize="none" spellCheck={false} defaultValue={addOne?.values.username} error={addOne?.errors.username} />
              <SelectField label="Grade band" name="gradeBand" defaultValue={addOne?.values.gradeBand ?? "6-8"} options={BANDS} />
              <TextField label="Student number (optional)" hint="Up to 30 characters." name="studentNumber" autoComplete="off" defaultValue={addOne?.values.studentNumber} error={addOne?.errors.studentNumber} />
              <TextField label="First password (optional)" hint="Leave it empty and Bendwise makes up one that is easy to type." name="password" type="text" autoComplete="off" error={addOne?.errors.password} />
              <SendButton className="btn" busy={busy}>Add the student</SendButton>
            </Form>
          </section>
          <section className="card" aria-labelledby="add-existing">
            <h2 id="add-existing" className="mb-3 text-[length:var(--text-step-1)]">Add a student who already has an account</h2>
            <p className="mb-3 text-ink-soft">For a student at your school who is in another class already. They keep their password and their work.</p>
            {existing?.done ? <Notice tone="done">{existing.done}</Notice> : null}
            {existing?.seatNotice ? <NoFreeSeatNotice notice={existing.seatNotice} /> : null}
            <Form method="post" preventScrollReset noValidate>
              <input type="hidden" name="intent" value="add-existing" />
              <TextField label="Their username" name="username" required autoComplete="off" autoCapitalize="none" spellCheck={false} error={existing?.seatNotice ? undefined : existing?.error} />
              <SendButton className="btn btn-quiet" busy={busy}>Add to this class</SendButton>
            </Form>
          </section>
        </div>
        </>
      )}
    </div>
  );
}

function RosterCheck({ result, busy }: { result: Extract<ActionResult, { intent: "preview-csv" | "import-csv" }>; busy: boolean }) {
  const { preview } = result;
  if (!preview) return <div className="mt-4"><Notice tone="problem">{result.error}</Notice></div>;
  const seatNotice = result.seatNotice ? <NoFreeSeatNotice notice={result.seatNotice} /> : null;
  const rowHas = (row: number) => preview.problems.some((p) => p.row === row);
  return (
    <div className="mt-6" data-testid="roster-preview">
      <h3 className="mb-2 font-reading text-[length:var(--text-step-1)]">
        {result.fileName ? `Checked: ${result.fileName}` : "Checked file"}
      </h3>
      {seatNotice}
      {seatNotice ? null : preview.problems.length > 0 ? (
        <Notice tone="problem">
          <p className="mb-2 font-bold">
            Nothing has been saved. {preview.problems.length === 1 ? "There is 1 problem" : `There are ${preview.problems.length} problems`} to fix in the file
            before it can be added:
          </p>
          <ul className="list-disc space-y-1 pl-5" data-testid="roster-problems">
            {preview.problems.map((p, i) => (
              <li key={i}>
                <strong>{problemPlace(p)}:</strong> {p.message}
              </li>
            ))}
          </ul>
          <p className="mt-2">Fix the file in your spreadsheet program, save it as CSV again, and check it once more.</p>
        </Notice>
      ) : (
        <Notice tone="info">
          <p>
            <strong>{preview.rows.length} {preview.rows.length === 1 ? "student is" : "students are"} ready to add.</strong> Nothing is saved until you press
            the button below the list. Your school has {preview.seats.free} free seats for {preview.seats.schoolYear}.
          </p>
        </Notice>
      )}
      {preview.ignoredColumns.length > 0 ? (
        <p className="mb-3 text-ink-soft">Left out, as Bendwise does not keep them: {preview.ignoredColumns.map((c) => `“${c}”`).join(", ")}.</p>
      ) : null}
      {preview.rows.length > 0 ? (
        <div className="mb-4 overflow-x-auto">
          <table className="w-full border-collapse text-left text-[length:var(--text-step--1)]">
            <caption className="sr-only">The students in the file</caption>
            <thead>
              <tr className="border-b-2 border-rule">
                <th scope="col" className="py-1 pr-3">Row</th>
                <th scope="col" className="py-1 pr-3">Display name</th>
                <th scope="col" className="py-1 pr-3">Username</th>
                <th scope="col" className="py-1 pr-3">Student number</th>
                <th scope="col" className="py-1 pr-3">Check</th>
              </tr>
            </thead>
            <tbody>
              {preview.rows.map((r) => {
                const bad = (column: string) => preview.problems.some((p) => p.row === r.row && p.column === column);
                const marked = "bg-[#fdecee] font-bold text-danger";
                return (
                  <tr key={r.row} className="border-b border-rule" data-row={r.row}>
                    <td className="py-1 pr-3">{r.row}</td>
                    <td className={`py-1 pr-3 ${bad(preview.columns.displayName) ? marked : ""}`}>{r.displayName || "—"}</td>
                    <td className={`py-1 pr-3 font-mono ${bad(preview.columns.username) ? marked : ""}`}>{r.username || "—"}</td>
                    <td className={`py-1 pr-3 ${bad(preview.columns.studentNumber) ? marked : ""}`}>{r.studentNumber || "—"}</td>
                    <td className="py-1 pr-3">{rowHas(r.row) ? <strong className="text-danger">Problem</strong> : "Ready"}</td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      ) : null}
      {preview.problems.length === 0 && result.csv ? (
        <Form method="post" preventScrollReset>
          <input type="hidden" name="intent" value="import-csv" />
          <input type="hidden" name="csv" value={result.csv} />
          <input type="hidden" name="gradeBand" value={result.gradeBand} />
          <input type="hidden" name="fileName" value={result.fileName} />
          <SendButton className="btn" busy={busy}>
            {addStudentsLabel(preview.rows.length)}
          </SendButton>
        </Form>
      ) : null}
    </div>
  );
}

function AddedStudents({ added, code, onDone }: { added: Added; code: string; onDone: () => void }) {
  // The first passwords are kept nowhere else: leaving the page (a tab, a link, a reload) asks first,
  // while the forms of this page, which add to the list, do not.
  const leaving = useAskBeforeLeaving();
  return (
    <section className="card mb-8 border-2 border-ok" aria-labelledby="added">
      <LeavingQuestion
        leaving={leaving}
        className="mb-3"
        question="These first passwords are not kept anywhere else. Leave the page without them? (You can set a new password on a student's page.)"
        stay="Stay and hand them out"
        leave="Leave without them"
      />
      <h2 id="added" className="mb-2 text-[length:var(--text-step-1)]">
        {added.length === 1 ? `${added[0].displayName} is in the class` : `${added.length} students are in the class`}
      </h2>
      <p className="mb-3">
        Hand each student their sign-in: the class code <strong className="font-mono">{code}</strong>, their username and this first password.{" "}
        <strong>The passwords are shown only while this page is open</strong>: students you add next join this list. Print or copy them before leaving
        the page. You can set a new one at any time.
      </p>
      <div className="overflow-x-auto">
        <table className="w-full border-collapse text-left">
          <caption className="sr-only">First passwords</caption>
          <thead>
            <tr className="border-b-2 border-rule">
              <th scope="col" className="py-1 pr-4">Student</th>
              <th scope="col" className="py-1 pr-4">Username</th>
              <th scope="col" className="py-1 pr-4">First password</th>
            </tr>
          </thead>
          <tbody>
            {added.map((a) => (
              <tr key={a.username} className="border-b border-rule">
                <td className="py-1 pr-4">{a.displayName}</td>
                <td className="py-1 pr-4 font-mono">{a.username}</td>
                <td className="py-1 pr-4 font-mono">{a.password}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <p className="mt-3 flex flex-wrap gap-3">
        <button type="button" className="btn btn-quiet" onClick={() => window.print()}>
          Print
        </button>
        <button type="button" className="btn btn-quiet" onClick={onDone}>
          I have handed these out: clear the list
        </button>
      </p>
    </section>
  );
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Students · ${data?.klass.name ?? "Class"} — Bendwise` }];
