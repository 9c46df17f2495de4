// A set-up photo loses what the camera wrote about it (where, when, which phone, comments) and keeps
// the picture, its colour profile and which way up it was taken. The files are built here segment by
// segment, the way a phone writes them, with a position and a phone name that must not survive.
import { describe, expect, it } from "vitest";
import { stripPhotoMetadata } from "~/lib/photo-metadata";

const text = (s: string) => Array.from(new TextEncoder().encode(s));
const has = (bytes: Uint8Array, s: string) => Buffer.from(bytes).includes(Buffer.from(s, "latin1"));
const u16 = (n: number) => [n >> 8, n & 0xff];
const u32be = (n: number) => [(n >>> 24) & 0xff, (n >>> 16) & 0xff, (n >>> 8) & 0xff, n & 0xff];
const u32le = (n: number) => [n & 0xff, (n >>> 8) & 0xff, (n >>> 16) & 0xff, (n >>> 24) & 0xff];
const segment = (marker: number, data: number[]) => [0xff, marker, ...u16(data.length + 2), ...data];

/** A little-endian Exif block as phones write it: IFD0 with Make, Orientation and a GPS IFD with a latitude. */
function exif(orientation: number): number[] {
  const le16 = (n: number) => [n & 0xff, n >> 8];
  const make = text("PhoneMaker Model 9\0");
  // TIFF header (8) + IFD0 with 3 entries (2 + 36 + 4) = 50; the make string follows, then the GPS IFD.
  const makeAt = 50;
  const gpsAt = makeAt + make.length;
  const ifd0 = [
    ...le16(3),
    ...le16(0x010f), ...le16(2), ...u32le(make.length), ...u32le(makeAt),
    ...le16(0x0112), ...le16(3), ...u32le(1), ...le16(orientation), 0, 0,
    ...le16(0x8825), ...le16(4), ...u32le(1), ...u32le(gpsAt),
    ...u32le(0),
  ];
  const gps = [...le16(1), ...le16(0x0001), ...le16(2), ...u32le(2), ...text("N\0"), 0, 0, ...u32le(0), ...text("GPS 59.3293N 18.0686E")];
  return [...text("Exif\0\0"), ...text("II"), 0x2a, 0, ...u32le(8), ...ifd0, ...make, ...gps];
}

const SOI = [0xff, 0xd8];
const JFIF = segment(0xe0, [...text("JFIF\0"), 1, 2, 0, 0, 1, 0, 1, 0, 0]);
const ICC = segment(0xe2, [...text("ICC_PROFILE\0"), 1, 1, ...text("a colour profile")]);
const DQT = segment(0xdb, [0, ...new Array(64).fill(1)]);
const SOF = segment(0xc0, [8, 0, 16, 0, 16, 1, 1, 0x11, 0]);
const PICTURE = [...segment(0xda, [1, 1, 0, 0, 0x3f, 0]), 0x12, 0x34, 0xff, 0x00, 0x56, 0xff, 0xd0, 0x78, 0xff, 0xd9];

/** The Orientation value of the first APP1 Exif segment of a JPEG, or null when it has none. */
function orientationOf(jpeg: Uint8Array): number | null {
  let at = 2;
  while (at + 4 <= jpeg.length && jpeg[at] === 0xff && jpeg[at + 1] !== 0xda) {
    const length = (jpeg[at + 2] << 8) | jpeg[at + 3];
    if (jpeg[at + 1] === 0xe1) {
      const tiff = Buffer.from(jpeg.subarray(at + 10, at + 2 + length));
      const little = tiff.toString("latin1", 0, 2) === "II";
      const r16 = (o: number) => (little ? tiff.readUInt16LE(o) : tiff.readUInt16BE(o));
      const ifd = little ? tiff.readUInt32LE(4) : tiff.readUInt32BE(4);
      for (let i = 0; i < r16(ifd); i++) if (r16(ifd + 2 + i * 12) === 0x0112) return r16(ifd + 2 + i * 12 + 8);
    }
    at += 2 + length;
  }
  return null;
}

describe("a JPEG photo", () => {
  const phone = new Uint8Array([
    ...SOI,
    ...JFIF,
    ...segment(0xe1, exif(6)),
    ...segment(0xe1, text("http://ns.adobe.com/xap/1.0/\0<x:xmpmeta>Owner: Juno Lindqvist</x:xmpmeta>")),
    ...ICC,
    ...segment(0xed, text("Photoshop 3.0\0IPTC city Stockholm")),
    ...segment(0xfe, text("taken at Elm Street 4")),
    ...DQT,
    ...SOF,
    ...PICTURE,
  ]);
  const kept = stripPhotoMetadata(phone, "image/jpeg");

  it("loses the position, the phone, the owner, the city and the comment", () => {
    for (const words of ["GPS 59.3293N", "PhoneMaker", "Juno Lindqvist", "Stockholm", "Elm Street"]) expect(has(kept, words), words).toBe(false);
  });

  it("keeps the picture byte for byte, its tables, its colour profile and which way up it was taken", () => {
    const picture = new Uint8Array(PICTURE);
    expect(Buffer.from(kept.subarray(kept.length - picture.length)).equals(Buffer.from(picture))).toBe(true);
    expect(Array.from(kept.subarray(0, 2 + JFIF.length))).toEqual([...SOI, ...JFIF]);
    for (const part of [ICC, DQT, SOF]) expect(Buffer.from(kept).includes(Buffer.from(part))).toBe(true);
    expect(orientationOf(phone)).toBe(6);
    expect(orientationOf(kept)).toBe(6);
    expect(kept.length).toBeLessThan(phone.length);
  });

  it("leaves a photo with nothing to take out as it was, and takes nothing more out the second time", () => {
    const plain = new Uint8Array([...SOI, ...JFIF, ...DQT, ...SOF, ...PICTURE]);
    expect(Buffer.from(stripPhotoMetadata(plain, "image/jpeg")).equals(Buffer.from(plain))).toBe(true);
    expect(Buffer.from(stripPhotoMetadata(kept, "image/jpeg")).equals(Buffer.from(kept))).toBe(true);
  });

  it("needs no orientation tag for a photo taken the right way up", () => {
    const upright = stripPhotoMetadata(new Uint8Array([...SOI, ...segment(0xe1, exif(1)), ...DQT, ...PICTURE]), "image/jpeg");
    expect(orientationOf(upright)).toBeNull();
    expect(has(upright, "PhoneMaker")).toBe(false);
  });

  it("copies a file it cannot walk from the broken place on, after dropping what came before", () => {
    const broken = new Uint8Array([...SOI, ...segment(0xe1, exif(3)), 0xff, 0xdb, 0x7f, 0xff, 1, 2, 3]);
    const out = stripPhotoMetadata(broken, "image/jpeg");
    expect(has(out, "GPS 59.3293N")).toBe(false);
    expect(Array.from(out.subarray(out.length - 7))).toEqual([0xff, 0xdb, 0x7f, 0xff, 1, 2, 3]);
  });
});

describe("a PNG photo", () => {
  const chunk = (type: string, data: number[]) => [...u32be(data.length), ...text(type), ...data, 0, 0, 0, 0];
  const signature = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];
  const IHDR = chunk("IHDR", [0, 0, 0, 1, 0, 0, 0, 1, 8, 2, 0, 0, 0]);
  const IDAT = chunk("IDAT", [1, 2, 3, 4]);
  const IEND = chunk("IEND", []);
  const ICCP = chunk("iCCP", text("profile\0\0abc"));

  it("loses its text, Exif and time chunks and keeps the picture's chunks in order", () => {
    const png = new Uint8Array([
      ...signature,
      ...IHDR,
      ...ICCP,
      ...chunk("tEXt", text("Author\0Juno")),
      ...chunk("iTXt", text("XML:com.adobe.xmp\0\0\0\0\0GPS 59.3293N")),
      ...chunk("eXIf", text("MM\0*PhoneMaker")),
      ...chunk("tIME", [7, 234, 12, 2, 15, 0, 0]),
      ...IDAT,
      ...IEND,
    ]);
    const kept = stripPhotoMetadata(png, "image/png");
    expect(Array.from(kept)).toEqual([...signature, ...IHDR, ...ICCP, ...IDAT, ...IEND]);
  });
});

describe("a WebP photo", () => {
  const chunk = (fourcc: string, data: number[]) => [...text(fourcc), ...u32le(data.length), ...data, ...(data.length % 2 ? [0] : [])];
  const riff = (chunks: number[]) => [...text("RIFF"), ...u32le(chunks.length + 4), ...text("WEBP"), ...chunks];
  const VP8 = chunk("VP8 ", [9, 8, 7, 6, 5]);

  it("loses its EXIF and XMP chunks, says so in its header flags and keeps a right RIFF size", () => {
    const flags = 0x20 | 0x08 | 0x04; // ICC, EXIF, XMP
    const webp = new Uint8Array(riff([...chunk("VP8X", [flags, 0, 0, 0, 0, 0, 0, 0, 0, 0]), ...chunk("ICCP", [1, 2]), ...VP8, ...chunk("EXIF", text("II*\0GPS 59.3293N")), ...chunk("XMP ", text("<x>Juno</x>"))]));
    const kept = stripPhotoMetadata(webp, "image/webp");
    expect(Array.from(kept)).toEqual(riff([...chunk("VP8X", [0x20, 0, 0, 0, 0, 0, 0, 0, 0, 0]), ...chunk("ICCP", [1, 2]), ...VP8]));
    expect(Buffer.from(kept).readUInt32LE(4)).toBe(kept.length - 8);
  });
});
