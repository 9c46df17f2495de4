// Uploads: a set-up photo on a lesson page and a roster file on a class's roster page. A file that is
// too large, of the wrong kind, or whose name or claimed type says something its bytes do not, is
// refused with a sentence that says what to do, and nothing is stored: no row in any table and no file
// in the upload folder. The bytes decide what a file is (its first bytes, the "magic number"), never its
// name or the browser's claim, so a real photo with a misleading name is kept under its real type.
import { readdirSync, type Dirent } from "node:fs";
import path from "node:path";
import { desc, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it, vi } from "vitest";
import { db } from "~/db/client.server";
import { serverEnv } from "~/env.server";
import { classes, photos } from "~/db/schema.server";
import { PHOTO_MAX_BYTES } from "~/lib/photo-rules";
import { photoStorage } from "~/lib/photo-store.server";
import { MAX_ROSTER_BYTES } from "~/lib/teaching/roster.server";
import * as lessonRoute from "~/routes/learn.lesson";
import * as photoRoute from "~/routes/photos";
import * as rosterRoute from "~/routes/teach.classes.$classId.roster";
import { changedTables, snapshotter, type Snapshot } from "./db-snapshot";
import { appUrl, get, post, runRoute, sessionCookieFor } from "./auth-helpers";

// An upload folder of this file's own (other test files upload at the same time), set before the app reads its settings.
await vi.hoisted(async () => {
  const { mkdtempSync } = await import("node:fs");
  const { tmpdir } = await import("node:os");
  const { join } = await import("node:path");
  process.env.UPLOADS_DIR = mkdtempSync(join(tmpdir(), "bendwise-uploads-test-"));
});

const LESSON = "07-home-lab";
const PHOTO_ID = "setup-photo";
const photoDir = () => path.resolve(process.env.UPLOADS_DIR!, "photos");
/** Every photo in the store's folder (it keeps each as <hash>.dat beside <hash>.meta.json, in sub-folders). */
const storedFiles = () => {
  try {
    return (readdirSync(photoDir(), { recursive: true, withFileTypes: true }) as Dirent[]).filter((d) => d.isFile() && d.name.endsWith(".dat")).map((d) => d.name).sort();
  } catch {
    return [];
  }
};

// The smallest files of each kind (their signatures, then filler): enough for a type check by bytes.
const JPEG = () => new Uint8Array([0xff, 0xd8, 0xff, 0xe0, 0x00, 0x10, 0x4a, 0x46, 0x49, 0x46, ...new Array(200).fill(7)]);
const PNG = () => new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, ...new Array(200).fill(3)]);
const bytesOf = (text: string) => new TextEncoder().encode(text);

let student: string;
let teacher: string;
let mapleClass: string;
let snapshot: () => Promise<Snapshot>;

beforeAll(async () => {
  student = await sessionCookieFor("student");
  teacher = await sessionCookieFor("teacher");
  [{ id: mapleClass }] = await db.select({ id: classes.id }).from(classes).where(eq(classes.signInCode, "MAPLE7A"));
  snapshot = await snapshotter();
  expect(serverEnv().UPLOADS_DIR).toContain("bendwise-uploads-test-");
}, 60_000);

function multipart(url: string, cookie: string, fields: Record<string, string>, files: { field: string; name: string; type: string; bytes: Uint8Array }[]): Request {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.append(k, v);
  for (const f of files) form.append(f.field, new File([f.bytes as Uint8Array<ArrayBuffer>], f.name, { type: f.type }));
  return new Request(`${appUrl}${url}`, { method: "POST", headers: { cookie, origin: appUrl, "sec-fetch-site": "same-origin" }, body: form });
}

async function sendPhoto(files: { name: string; type: string; bytes: Uint8Array }[], fields: Record<string, string> = { intent: "photo", photoId: PHOTO_ID }) {
  const request = multipart(`/learn/${LESSON}`, student, fields, files.map((f) => ({ field: "photo", ...f })));
  return runRoute(lessonRoute.action as never, request, { slug: LESSON });
}

/** Runs `send`, expects a refusal whose sentence matches `message`, and that nothing was stored. */
async function expectRefusedAndNothingStored(send: () => Promise<{ status: number; body: unknown }>, message: RegExp) {
  const [rowsBefore, filesBefore] = [await snapshot(), storedFiles()];
  const result = await send();
  expect(result.status).toBe(400);
  expect(JSON.stringify(result.body)).toMatch(message);
  expect(changedTables(rowsBefore, await snapshot()), "tables changed by a refused upload").toEqual([]);
  expect(storedFiles(), "files left in the upload folder").toEqual(filesBefore);
}

describe("set-up photos", () => {
  it("keeps a real JPEG: one row, one file, served back with its type and nosniff", async () => {
    const filesBefore = storedFiles();
    const result = await sendPhoto([{ name: "setup.jpg", type: "image/jpeg", bytes: JPEG() }]);
    expect(result.status).toBe(200);
    expect(storedFiles()).toHaveLength(filesBefore.length + 1);
    const [row] = await db.select().from(photos).where(eq(photos.photoId, PHOTO_ID));
    expect(row).toMatchObject({ contentType: "image/jpeg", lessonSlug: LESSON });
    const served = await runRoute(photoRoute.loader as never, get(`/photos/${row.id}`, { cookie: student }), { id: row.id });
    expect(served.status).toBe(200);
    expect(served.headers.get("content-type")).toBe("image/jpeg");
    expect(served.headers.get("x-content-type-options")).toBe("nosniff");
  });

  it("keeps a phone's JPEG without where it was taken or which phone took it (the child's home stays private)", async () => {
    const exif = bytesOf("Exif\0\0MM\0*\0\0\0\x08\0\0\0\0\0\0GPS 59.3293N 18.0686E PhoneMaker");
    const withPosition = new Uint8Array([0xff, 0xd8, 0xff, 0xe1, 0, exif.length + 2, ...exif, 0xff, 0xda, 0, 8, 1, 1, 0, 0, 0x3f, 0, 0x12, 0x34, 0xff, 0xd9]);
    const result = await sendPhoto([{ name: "IMG_2048.jpg", type: "image/jpeg", bytes: withPosition }], { intent: "photo", photoId: "setup-photo" });
    expect(result.status).toBe(200);
    const [row] = await db.select().from(photos).where(eq(photos.photoId, PHOTO_ID)).orderBy(desc(photos.createdAt)).limit(1);
    const stored = new Uint8Array(await (await photoStorage().get(row.storageKey))!.arrayBuffer());
    const storedText = Buffer.from(stored).toString("latin1");
    expect(storedText).not.toContain("GPS");
    expect(storedText).not.toContain("PhoneMaker");
    expect(Array.from(stored)).toEqual([0xff, 0xd8, 0xff, 0xda, 0, 8, 1, 1, 0, 0, 0x3f, 0, 0x12, 0x34, 0xff, 0xd9]);
    expect(row.bytes).toBe(stored.length);
  });

  it("answers an address with no photo as a plain sentence, not a quoted JSON string", async () => {
    for (const id of ["not-a-photo", "00000000-0000-4000-8000-000000000000"]) {
      const missing = await runRoute(photoRoute.loader as never, get(`/photos/${id}`, { cookie: student }), { id });
      expect(missing.status).toBe(404);
      expect(missing.headers.get("content-type")).toBe("text/plain; charset=utf-8");
      expect(missing.body).toBe("There is no photo at this address.");
    }
  });

  it("refuses a photo over the size limit, saying the limit", async () => {
    const big = new Uint8Array(PHOTO_MAX_BYTES + 1);
    big.set(JPEG());
    await expectRefusedAndNothingStored(() => sendPhoto([{ name: "big.jpg", type: "image/jpeg", bytes: big }]), /larger than 5 MB/);
  });

  it("refuses another kind of image (GIF) and a file that is no image at all", async () => {
    await expectRefusedAndNothingStored(() => sendPhoto([{ name: "setup.gif", type: "image/gif", bytes: bytesOf("GIF89a" + "x".repeat(100)) }]), /not a JPEG, PNG or WebP/);
    await expectRefusedAndNothingStored(() => sendPhoto([{ name: "notes.pdf", type: "application/pdf", bytes: bytesOf("%PDF-1.7\n" + "x".repeat(100)) }]), /not a JPEG, PNG or WebP/);
  });

  it("names an iPhone's HEIC photo and says how to send a JPEG, by its bytes whatever its name", async () => {
    const heic = bytesOf("\u0000\u0000\u0000\u0018ftypheic\u0000\u0000\u0000\u0000mif1heic" + "x".repeat(100));
    for (const name of ["IMG_0412.HEIC", "setup.jpg"]) {
      await expectRefusedAndNothingStored(() => sendPhoto([{ name, type: "image/jpeg", bytes: heic }]), /HEIC photo.*screenshot.*Most Compatible/);
    }
  });

  it("refuses a file whose name and claimed type say photo but whose bytes do not", async () => {
    await expectRefusedAndNothingStored(() => sendPhoto([{ name: "setup.jpg", type: "image/jpeg", bytes: bytesOf("<html><script>alert(1)</script></html>") }]), /not a JPEG, PNG or WebP/);
    await expectRefusedAndNothingStored(
      () => sendPhoto([{ name: "setup.png", type: "image/png", bytes: bytesOf('<svg xmlns="http://www.w3.org/2000/svg"><script>alert(1)</script></svg>') }]),
      /not a JPEG, PNG or WebP/,
    );
    await expectRefusedAndNothingStored(() => sendPhoto([{ name: "setup.webp", type: "image/webp", bytes: bytesOf("RIFF....WAVEfmt " + "x".repeat(50)) }]), /not a JPEG, PNG or WebP/);
  });

  it("refuses an empty file, two files at once, and a photo for a place the lesson does not have", async () => {
    await expectRefusedAndNothingStored(() => sendPhoto([{ name: "setup.jpg", type: "image/jpeg", bytes: new Uint8Array() }]), /empty|Choose a photo/);
    await expectRefusedAndNothingStored(
      () => sendPhoto([{ name: "a.jpg", type: "image/jpeg", bytes: JPEG() }, { name: "b.jpg", type: "image/jpeg", bytes: JPEG() }]),
      /one photo at a time/,
    );
    await expectRefusedAndNothingStored(() => sendPhoto([{ name: "a.jpg", type: "image/jpeg", bytes: JPEG() }], { intent: "photo", photoId: "../../etc" }), /Choose a photo/);
  });

  it("keeps a real PNG sent with a misleading name and type under its real type, never the claimed one", async () => {
    const filesBefore = storedFiles();
    const result = await sendPhoto([{ name: "notes.txt", type: "text/plain", bytes: PNG() }]);
    expect(result.status).toBe(200);
    const rows = await db.select().from(photos).where(eq(photos.photoId, PHOTO_ID));
    const png = rows.find((r) => r.contentType === "image/png")!;
    expect(png.storageKey).toMatch(/\.png$/);
    expect(await photoStorage().has(png.storageKey)).toBe(true);
    expect(storedFiles()).toHaveLength(filesBefore.length + 1);
  });

  it("removes a student's own photo, row and file; another student's photo or a made-up id removes nothing", async () => {
    const [mine] = await db.select().from(photos).where(eq(photos.photoId, PHOTO_ID));
    const remove = (cookie: string, photo: string) =>
      runRoute(lessonRoute.action as never, post(`/learn/${LESSON}`, { intent: "remove-photo", photoId: PHOTO_ID, photo }, { cookie }), { slug: LESSON });

    // Another student (Ben) cannot remove Amira's photo; an id that is no photo finds nothing.
    const [rowsBefore, filesBefore] = [await snapshot(), storedFiles()];
    expect((await remove(await sessionCookieFor("secondStudent"), mine.id)).status).toBe(404);
    expect((await remove(student, "00000000-0000-4000-8000-000000000000")).status).toBe(404);
    expect((await remove(student, "not-an-id")).status).toBe(400);
    expect(changedTables(rowsBefore, await snapshot())).toEqual([]);
    expect(storedFiles()).toEqual(filesBefore);

    const removed = await remove(student, mine.id);
    expect(removed.status).toBe(200);
    expect(removed.body).toEqual({ photoId: PHOTO_ID, removed: true });
    expect(await db.select().from(photos).where(eq(photos.id, mine.id))).toEqual([]);
    expect(await photoStorage().has(mine.storageKey)).toBe(false);
    expect(storedFiles()).toHaveLength(filesBefore.length - 1);
  });
});

describe("roster files", () => {
  const sendRoster = (file: { name: string; type: string; bytes: Uint8Array }) =>
    runRoute(rosterRoute.action as never, multipart(`/teach/classes/${mapleClass}/roster`, teacher, { gradeBand: "6-8" }, [{ field: "file", ...file }]), { classId: mapleClass });

  it("previews a real CSV and stores nothing until the teacher confirms", async () => {
    const before = await snapshot();
    const result = await sendRoster({ name: "roster.csv", type: "text/csv", bytes: bytesOf("name,username\nNova Q. (invented),nova.q\n") });
    expect(result.status).toBe(200);
    expect(changedTables(before, await snapshot())).toEqual([]);
  });

  it("refuses a file over the size limit", async () => {
    const big = bytesOf(`name,username\n${"Ann B. (invented),ann.b\n".repeat(Math.ceil(MAX_ROSTER_BYTES / 20))}`);
    await expectRefusedAndNothingStored(() => sendRoster({ name: "roster.csv", type: "text/csv", bytes: big }), /too large/);
  });

  it("refuses a spreadsheet workbook or a binary file named .csv", async () => {
    await expectRefusedAndNothingStored(() => sendRoster({ name: "roster.csv", type: "text/csv", bytes: new Uint8Array([0x50, 0x4b, 0x03, 0x04, ...new Array(64).fill(0)]) }), /spreadsheet workbook/);
    await expectRefusedAndNothingStored(() => sendRoster({ name: "roster.csv", type: "text/csv", bytes: PNG().map((b, i) => (i === 20 ? 0 : b)) }), /not a text file/);
    await expectRefusedAndNothingStored(() => sendRoster({ name: "roster.csv", type: "text/csv", bytes: new Uint8Array() }), /Choose a CSV file/);
  });
});
