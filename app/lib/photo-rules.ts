// What a set-up photo may be: shared by the upload form (to say it) and the server (to enforce it).
export const PHOTO_MAX_BYTES = 5 * 1024 * 1024;
export const PHOTO_TYPES = ["image/jpeg", "image/png", "image/webp"] as const;
export type PhotoType = (typeof PHOTO_TYPES)[number];

/**
 * The real type of an image from its first bytes (its "magic number"), whatever its name or the
 * browser's content type claim. File signatures: JPEG FF D8 FF, PNG 89 50 4E 47 0D 0A 1A 0A,
 * WebP "RIFF" …. "WEBP" (common practice, no source beyond the formats' own specifications).
 */
export function sniffImageType(bytes: Uint8Array): PhotoType | null {
  if (bytes.length >= 3 && bytes[0] === 0xff && bytes[1] === 0xd8 && bytes[2] === 0xff) return "image/jpeg";
  const png = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];
  if (bytes.length >= 8 && png.every((b, i) => bytes[i] === b)) return "image/png";
  const ascii = (from: number, to: number) => String.fromCharCode(...bytes.slice(from, to));
  if (bytes.length >= 12 && ascii(0, 4) === "RIFF" && ascii(8, 12) === "WEBP") return "image/webp";
  return null;
}

export const NOT_A_PHOTO = "That file is not a JPEG, PNG or WebP photo. Choose a photo file.";
export const HEIC_PHOTO =
  "That is a HEIC photo, the kind an iPhone or iPad takes, and it cannot be shown here. Send a JPEG instead: take a screenshot of the photo and upload the screenshot, or set the camera to “Most Compatible” (Settings › Camera › Formats) and take the photo again.";
export const CHOOSE_A_PHOTO_FIRST = "Choose a photo first, then press “Upload the photo”.";

/**
 * HEIC/HEIF (an ISO base-media file: "ftyp" at byte 4 and a HEIF brand after it, ISO/IEC 23008-12),
 * or a name or type that says so: the photo format phones use that browsers mostly cannot show.
 */
export function looksLikeHeic(file: { bytes?: Uint8Array; name?: string; type?: string }): boolean {
  if (/\.(heic|heif)$/i.test(file.name ?? "") || /^image\/hei[cf]/i.test(file.type ?? "")) return true;
  const bytes = file.bytes;
  if (!bytes || bytes.length < 12) return false;
  const ascii = (from: number, to: number) => String.fromCharCode(...bytes.slice(from, to));
  return ascii(4, 8) === "ftyp" && ["heic", "heix", "hevc", "hevx", "heim", "heis", "mif1", "msf1"].includes(ascii(8, 12));
}

/** Why a file that is no photo we keep was refused, naming HEIC when it is one. */
export const notAPhotoMessage = (file: { bytes?: Uint8Array; name?: string; type?: string }) => (looksLikeHeic(file) ? HEIC_PHOTO : NOT_A_PHOTO);
