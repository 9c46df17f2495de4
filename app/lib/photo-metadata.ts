// A set-up photo is kept without what a camera writes beside the picture: the place it was taken (GPS),
// the phone's make and serial number, the time, the owner's name, comments and editing history. A
// child's photo of a home lab must not tell where the child lives. Only the picture stays, with its
// colour profile and, for a JPEG, the one Exif tag that says which way up it was taken.
//
// Formats: JPEG segments (ITU-T T.81, Annex B; Exif 2.32, section 4.5.4 for APP1 and the TIFF IFD
// of section 4.6.2), PNG chunks (PNG specification, 3rd edition, section 5.3 and the eXIf chunk),
// WebP's RIFF chunks and the VP8X flags (RFC 9649, section 2.7). No image is decoded: the picture's
// own bytes are copied untouched, so nothing is lost in quality.
import type { PhotoType } from "./photo-rules";

/** The photo's bytes without its metadata (a new array; the input is not changed). */
export function stripPhotoMetadata(bytes: Uint8Array, type: PhotoType): Uint8Array {
  if (type === "image/jpeg") return stripJpeg(bytes);
  if (type === "image/png") return stripPng(bytes);
  return stripWebp(bytes);
}

const concat = (parts: Uint8Array[]) => {
  const out = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
  let at = 0;
  for (const p of parts) {
    out.set(p, at);
    at += p.length;
  }
  return out;
};
const ascii = (bytes: Uint8Array, from: number, length: number) => String.fromCharCode(...bytes.subarray(from, from + length));

// JPEG markers kept before the picture: APP0 (JFIF), APP2 (the ICC colour profile) and APP14 (Adobe's
// colour transform, needed to show CMYK pictures right). Every other APPn (APP1 Exif and XMP, APP13
// IPTC, the makers' own) and COM (comments) go; the tables and frame headers are not APPn.
const KEPT_APP = new Set([0xe0, 0xe2, 0xee]);
const isApp = (marker: number) => marker >= 0xe0 && marker <= 0xef;
const SOS = 0xda;
const COM = 0xfe;

function stripJpeg(bytes: Uint8Array): Uint8Array {
  const parts: Uint8Array[] = [bytes.subarray(0, 2)]; // SOI
  let orientation: number | null = null;
  let at = 2;
  while (at + 4 <= bytes.length && bytes[at] === 0xff) {
    const marker = bytes[at + 1];
    if (marker === 0xff) {
      at += 1; // a fill byte before a marker
      continue;
    }
    const length = (bytes[at + 2] << 8) | bytes[at + 3];
    const end = at + 2 + length;
    if (length < 2 || end > bytes.length) break; // a broken segment: the rest is copied as it is
    if (marker === SOS) break; // the picture itself, to the end of the file
    if (marker === 0xe1 && orientation === null) orientation = exifOrientation(bytes.subarray(at + 4, end));
    if (!(marker === COM || (isApp(marker) && !KEPT_APP.has(marker)))) parts.push(bytes.subarray(at, end));
    at = end;
  }
  // A photo taken sideways stays the right way up: its orientation alone goes back in, first after
  // JFIF as Exif requires. Orientation 1 (as stored) needs no tag.
  if (orientation !== null && orientation !== 1) {
    const afterJfif = parts.length > 1 && parts[1][1] === 0xe0 ? 2 : 1;
    parts.splice(afterJfif, 0, orientationSegment(orientation));
  }
  parts.push(bytes.subarray(at));
  return concat(parts);
}

/** The Orientation tag (0x0112) of IFD0 in an APP1 Exif segment's data, or null. */
function exifOrientation(data: Uint8Array): number | null {
  if (data.length < 14 || ascii(data, 0, 6) !== "Exif\0\0") return null;
  const tiff = data.subarray(6);
  const little = ascii(tiff, 0, 2) === "II";
  if (!little && ascii(tiff, 0, 2) !== "MM") return null;
  const view = new DataView(tiff.buffer, tiff.byteOffset, tiff.byteLength);
  const ifd = view.getUint32(4, little);
  if (ifd + 2 > tiff.length) return null;
  const count = view.getUint16(ifd, little);
  for (let i = 0; i < count; i++) {
    const entry = ifd + 2 + i * 12;
    if (entry + 12 > tiff.length) return null;
    if (view.getUint16(entry, little) === 0x0112 && view.getUint16(entry + 2, little) === 3) {
      const value = view.getUint16(entry + 8, little);
      return value >= 1 && value <= 8 ? value : null;
    }
  }
  return null;
}

/** An APP1 Exif segment holding one tag: Orientation (SHORT, one value), big-endian. */
function orientationSegment(orientation: number): Uint8Array {
  const tiff = [0x4d, 0x4d, 0x00, 0x2a, 0, 0, 0, 8, 0, 1, 0x01, 0x12, 0, 3, 0, 0, 0, 1, 0, orientation, 0, 0, 0, 0, 0, 0];
  const data = [0x45, 0x78, 0x69, 0x66, 0, 0, ...tiff];
  const length = data.length + 2;
  return new Uint8Array([0xff, 0xe1, length >> 8, length & 0xff, ...data]);
}

// PNG chunks that hold words or times about the photo, not the picture: text (tEXt, zTXt, iTXt),
// Exif (eXIf) and the time it was last changed (tIME).
const PNG_METADATA = new Set(["tEXt", "zTXt", "iTXt", "eXIf", "tIME"]);

function stripPng(bytes: Uint8Array): Uint8Array {
  const parts: Uint8Array[] = [bytes.subarray(0, 8)];
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  let at = 8;
  while (at + 12 <= bytes.length) {
    const end = at + 12 + view.getUint32(at);
    if (end > bytes.length) break;
    if (!PNG_METADATA.has(ascii(bytes, at + 4, 4))) parts.push(bytes.subarray(at, end));
    at = end;
  }
  parts.push(bytes.subarray(at));
  return concat(parts);
}

function stripWebp(bytes: Uint8Array): Uint8Array {
  const parts: Uint8Array[] = [];
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  let at = 12;
  while (at + 8 <= bytes.length) {
    const size = view.getUint32(at + 4, true);
    const end = at + 8 + size + (size % 2); // chunks are padded to an even length
    if (end > bytes.length) break;
    const fourcc = ascii(bytes, at, 4);
    if (fourcc === "VP8X" && size >= 1) {
      const chunk = bytes.slice(at, end);
      chunk[8] &= ~(0x08 | 0x04); // the flags that say EXIF and XMP chunks follow
      parts.push(chunk);
    } else if (fourcc !== "EXIF" && fourcc !== "XMP ") {
      parts.push(bytes.subarray(at, end));
    }
    at = end;
  }
  parts.push(bytes.subarray(at));
  const body = concat(parts);
  const header = bytes.slice(0, 12);
  new DataView(header.buffer).setUint32(4, body.length + 4, true); // RIFF size: "WEBP" and the chunks
  return concat([header, body]);
}
