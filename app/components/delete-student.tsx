// The confirmation for deleting a student's account and data, shared by the family page and the
// school's student list: it says exactly what goes, and asks for the student's name typed out.
import { Form, Link } from "react-router";
import { Notice } from "~/components/auth-forms";
import { SendButton } from "~/components/send-button";

export function DeleteStudentForm({
  name,
  username,
  who,
  busy,
  typed,
  error,
  back,
}: {
  name: string;
  username: string | null;
  who: string;
  busy: boolean;
  typed?: string;
  error?: string;
  back: string;
}) {
  return (
    <>
      <h1 className="mb-4 text-[length:var(--text-step-3)]">Delete {name}'s account and data</h1>
      <div className="mb-6 rounded-lg border-2 border-danger bg-card p-5">
        <p className="mb-2 font-bold">This cannot be undone. Deleting {who}'s account removes, for good:</p>
        <ul className="mb-2 list-disc space-y-1 pl-5">
          <li>
            the account itself ({name}, username <span className="font-mono">{username}</span>): nobody can sign in with it again;
          </li>
          <li>every answer, prediction, own reading, written answer and photo, and all progress through the course;</li>
          <li>their places in classes and any extra tries or time they were given.</li>
        </ul>
        <p>Their seat for this school year becomes free for someone else. Receipts for seats already bought are kept.</p>
      </div>
      {error ? <Notice tone="problem">{error}</Notice> : null}
      <Form method="post" noValidate className="card">
        <label htmlFor="confirm-name" className="mb-1 block font-bold">
          To confirm, type the name: <span className="font-mono">{name}</span>
        </label>
        <input
          id="confirm-name"
          name="confirmName"
          className="field mb-4"
          autoComplete="off"
          spellCheck={false}
          defaultValue={typed ?? ""}
          aria-invalid={error ? true : undefined}
          required
        />
        <div className="flex flex-wrap gap-3">
          <SendButton className="btn border-danger bg-danger hover:bg-[#7d1621]" busy={busy}>
            {busy ? "Deleting…" : `Delete ${name}'s account and data`}
          </SendButton>
          <Link to={back} className="btn btn-quiet">
            Keep the account
          </Link>
        </div>
      </Form>
    </>
  );
}
