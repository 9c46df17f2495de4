// A photo of the student's set-up: a JPEG, PNG or WebP file of at most 5 MB, checked on the server.
import { useEffect, useRef, useState } from "react";
import { useFetcher } from "react-router";
import { CHOOSE_A_PHOTO_FIRST, HEIC_PHOTO, looksLikeHeic, PHOTO_MAX_BYTES } from "~/lib/photo-rules";
import { useLesson } from "./lesson-context";
import { SendButton } from "~/components/send-button";

export function PhotoUpload({ id, prompt = "Add a photo of your set-up." }: { id: string; prompt?: string }) {
  const { state, canAnswer } = useLesson();
  const fetcher = useFetcher<{ photoId?: string; error?: string; saved?: boolean }>();
  // Each upload box has its own fetcher, so its answer is always about this box.
  const mine = fetcher.data;
  // Said at once in the browser, before anything is sent: no file chosen, or an iPhone's HEIC photo.
  const [early, setEarly] = useState<string | null>(null);
  const checkBeforeSending = (event: React.FormEvent<HTMLFormElement>) => {
    const file = (event.currentTarget.elements.namedItem("photo") as HTMLInputElement | null)?.files?.[0];
    const problem = !file || file.size === 0 ? CHOOSE_A_PHOTO_FIRST : looksLikeHeic({ name: file.name, type: file.type }) ? HEIC_PHOTO : null;
    setEarly(problem);
    if (problem) event.preventDefault();
  };
  // A saved photo leaves the box: pressing "Upload the photo" again would send the same picture twice.
  const form = useRef<HTMLFormElement>(null);
  useEffect(() => {
    if (fetcher.state === "idle" && mine?.saved) form.current?.reset();
  }, [fetcher.state, mine]);
  const photos = state.photos[id] ?? [];
  return (
    <section id={`photo-${id}`} className="card my-8 scroll-mt-6 font-ui" aria-labelledby={`photo-${id}-title`}>
      <h3 id={`photo-${id}-title`} className="mb-2 font-reading text-[length:var(--text-step-1)]">
        Photo of your set-up
      </h3>
      <p className="mb-3">{prompt} Keep faces out of the picture.</p>
      {canAnswer && (
        <fetcher.Form ref={form} method="post" encType="multipart/form-data" noValidate onSubmit={checkBeforeSending}>
          <input type="hidden" name="intent" value="photo" />
          <input type="hidden" name="photoId" value={id} />
          <label className="block">
            <span className="mb-1 block font-bold">Choose a photo (JPEG, PNG or WebP, up to {PHOTO_MAX_BYTES / 1024 / 1024} MB)</span>
            <input type="file" name="photo" accept="image/jpeg,image/png,image/webp" className="block w-full max-w-full" onChange={() => setEarly(null)} />
          </label>
          <SendButton className="btn mt-3" busy={fetcher.state !== "idle"}>
            {fetcher.state !== "idle" ? "Uploading…" : "Upload the photo"}
          </SendButton>
        </fetcher.Form>
      )}
      <div aria-live="polite">
        {/* The last reply is said only once the box is idle, so an old refusal is gone while the next photo goes up. */}
        {early && <p className="mt-2 rounded bg-ember-wash p-3 text-danger" role="alert">{early}</p>}
        {!early && fetcher.state === "idle" && mine?.error && <p className="mt-2 rounded bg-ember-wash p-3 text-danger" role="alert">{mine.error}</p>}
        {!early && fetcher.state === "idle" && mine?.saved && <p className="mt-2 font-bold text-ok">Photo saved.</p>}
      </div>
      {photos.length > 0 && (
        <ul className="mt-3 flex flex-wrap gap-4">
          {photos.map((p, i) => (
            <li key={p.id} className="flex flex-col items-start gap-1">
              <img src={`/photos/${p.id}`} alt={`Your photo of the set-up${photos.length > 1 ? `, ${i + 1} of ${photos.length}` : ""}`} className="h-32 rounded border border-rule object-cover" />
              <RemovePhoto boxId={id} photo={p.id} label={photos.length > 1 ? `Remove photo ${i + 1}` : "Remove this photo"} />
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}

/** Removes one photo (its file too): a picture sent by mistake, or with a face in it, need not stay. */
function RemovePhoto({ boxId, photo, label }: { boxId: string; photo: string; label: string }) {
  const fetcher = useFetcher<{ error?: string }>();
  return (
    <fetcher.Form method="post">
      <input type="hidden" name="intent" value="remove-photo" />
      <input type="hidden" name="photoId" value={boxId} />
      <input type="hidden" name="photo" value={photo} />
      <SendButton className="btn btn-quiet text-[length:var(--text-step--1)]" busy={fetcher.state !== "idle"}>
        {fetcher.state !== "idle" ? "Removing…" : label}
      </SendButton>
      {fetcher.state === "idle" && fetcher.data?.error ? <p className="text-danger" role="alert">{fetcher.data.error}</p> : null}
    </fetcher.Form>
  );
}
