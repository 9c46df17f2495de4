// A photo of the student's set-up: a JPEG, PNG or WebP file of at most 5 MB, checked on the server.
import { useFetcher } from "react-router";
import { PHOTO_MAX_BYTES } from "~/lib/photo-rules";
import { useLesson } from "./lesson-context";
import { SendButton } from "~/components/send-button";

export function PhotoUpload({ id, prompt = "Add a photo of your set-up." }: { id: string; prompt?: string }) {
  const { state, canAnswer } = useLesson();
  const fetcher = useFetcher<{ photoId?: string; error?: string; saved?: boolean }>();
  // Each upload box has its own fetcher, so its answer is always about this box.
  const mine = fetcher.data;
  const photos = state.photos[id] ?? [];
  return (
    <section id={`photo-${id}`} className="card my-8 scroll-mt-6 font-ui" aria-labelledby={`photo-${id}-title`}>
      <h3 id={`photo-${id}-title`} className="mb-2 font-reading text-[length:var(--text-step-1)]">
        Photo of your set-up
      </h3>
      <p className="mb-3">{prompt} Keep faces out of the picture.</p>
      {canAnswer && (
        <fetcher.Form method="post" encType="multipart/form-data">
          <input type="hidden" name="intent" value="photo" />
          <input type="hidden" name="photoId" value={id} />
          <label className="block">
            <span className="mb-1 block font-bold">Choose a photo (JPEG, PNG or WebP, up to {PHOTO_MAX_BYTES / 1024 / 1024} MB)</span>
            <input type="file" name="photo" accept="image/jpeg,image/png,image/webp" required className="block w-full max-w-full" />
          </label>
          <SendButton className="btn mt-3" busy={fetcher.state !== "idle"}>
            {fetcher.state !== "idle" ? "Uploading…" : "Upload the photo"}
          </SendButton>
        </fetcher.Form>
      )}
      <div aria-live="polite">
        {mine?.error && <p className="mt-2 rounded bg-ember-wash p-3 text-danger" role="alert">{mine.error}</p>}
        {mine?.saved && <p className="mt-2 font-bold text-ok">Photo saved.</p>}
      </div>
      {photos.length > 0 && (
        <ul className="mt-3 flex flex-wrap gap-3">
          {photos.map((p) => (
            <li key={p.id}>
              <img src={`/photos/${p.id}`} alt="Your photo of the set-up" className="h-32 rounded border border-rule object-cover" />
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
