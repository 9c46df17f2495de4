// Set-up photos: checked (real type from the bytes, size) and kept through a small storage interface.
// By default a git-ignored local folder (UPLOADS_DIR); object storage can stand behind the same interface.
import { randomUUID } from "node:crypto";
import path from "node:path";
import { createFsFileStorage } from "@remix-run/file-storage/fs";
import type { FileStorage } from "@remix-run/file-storage";
import { MaxFilesExceededError, parseFormData, type FileUpload } from "@remix-run/form-data-parser";
import { and, eq } from "drizzle-orm";
import type { Database } from "~/db/client.server";
import { photos } from "~/db/schema.server";
import { serverEnv } from "~/env.server";
import { stripPhotoMetadata } from "./photo-metadata";
import { notAPhotoMessage, PHOTO_MAX_BYTES, sniffImageType } from "./photo-rules";

let storage: FileStorage | undefined;

export function photoStorage(): FileStorage {
  storage ??= createFsFileStorage(path.resolve(serverEnv().UPLOADS_DIR, "photos"));
  return storage;
}

export type PhotoUploadResult =
  | { ok: true; form: FormData; photo: { key: string; contentType: string; bytes: number } | null }
  | { ok: false; error: string };

/**
 * Reads a multipart form with at most one photo. The file is refused, and nothing stored, when it is
 * too large or its bytes are not a JPEG, PNG or WebP image (whatever its name or claimed type says).
 * A photo is stored without its metadata (stripPhotoMetadata: no GPS position, camera or time).
 */
export async function readPhotoForm(request: Request): Promise<PhotoUploadResult> {
  let photo: { key: string; contentType: string; bytes: number } | null = null;
  let refusal: string | null = null;
  let form: FormData;
  try {
    form = await parseFormData(request, { maxFiles: 1, maxFileSize: PHOTO_MAX_BYTES }, async (upload: FileUpload) => {
      if (upload.fieldName !== "photo") return null;
      const bytes = new Uint8Array(await upload.arrayBuffer());
      if (bytes.length === 0) {
        refusal = "That file is empty. Choose a photo.";
        return null;
      }
      const realType = sniffImageType(bytes);
      if (!realType) {
        refusal = notAPhotoMessage({ bytes, name: upload.name, type: upload.type });
        return null;
      }
      // Kept without the camera's metadata: a phone writes where the photo was taken into it.
      const picture = stripPhotoMetadata(bytes, realType);
      const key = `${randomUUID()}.${realType.split("/")[1]}`;
      await photoStorage().set(key, new File([picture as Uint8Array<ArrayBuffer>], key, { type: realType }));
      photo = { key, contentType: realType, bytes: picture.length };
      return key;
    });
  } catch (error) {
    // A refused upload keeps nothing: a photo stored before the refusal (the first of two files) goes.
    if (photo) await photoStorage().remove((photo as { key: string }).key);
    if (error instanceof MaxFilesExceededError) return { ok: false, error: "Send one photo at a time." };
    const name = (error as Error)?.name ?? "";
    if (name === "MaxFileSizeExceededError" || /size/i.test(String((error as Error)?.message))) {
      return { ok: false, error: `That photo is larger than ${PHOTO_MAX_BYTES / 1024 / 1024} MB. Choose a smaller one or take it at a lower resolution.` };
    }
    return { ok: false, error: "The upload could not be read. Please try again." };
  }
  if (refusal) return { ok: false, error: refusal };
  return { ok: true, form, photo };
}

export async function recordPhoto(
  { db }: { db: Database },
  row: { studentId: string; lessonSlug: string; photoId: string; key: string; contentType: string; bytes: number },
) {
  await db.insert(photos).values({
    studentId: row.studentId,
    lessonSlug: row.lessonSlug,
    photoId: row.photoId,
    storageKey: row.key,
    contentType: row.contentType,
    bytes: row.bytes,
  });
}

/**
 * Removes one of the student's own photos: its row, then its file. False when the student has no
 * photo with that id (another student's photo is never touched).
 */
export async function removePhoto({ db }: { db: Database }, studentId: string, id: string): Promise<boolean> {
  const [removed] = await db
    .delete(photos)
    .where(and(eq(photos.id, id), eq(photos.studentId, studentId)))
    .returning({ key: photos.storageKey });
  if (!removed) return false;
  await photoStorage().remove(removed.key);
  return true;
}

export async function findPhoto({ db }: { db: Database }, id: string) {
  const [row] = await db.select().from(photos).where(and(eq(photos.id, id)));
  return row ?? null;
}
