/**
 * EXIF orientation of a JPEG, read and applied without the decoder: pure, no I/O. Reading it here
 * lets the picture be decoded as stored, scaled down first and turned upright afterwards, on a
 * bitmap a few times smaller than the photo (EXIF 2.3 / CIPA DC-008, tag 0x0112 of IFD0).
 */

/** Where a JPEG's orientation tag is: its value (1–8) and the byte offset of the value. */
export interface OrientationTag {
  orientation: number;
  offset: number;
  /** Whether the TIFF block is little-endian (`II`). */
  littleEndian: boolean;
}

const ORIENTATION = 0x0112;

/** Finds the orientation tag in a JPEG's first APP1 `Exif` block, or null (no block, no tag, malformed). */
export function findOrientation(b: Buffer): OrientationTag | null {
  if (b.length < 4 || b[0] !== 0xff || b[1] !== 0xd8) return null;
  let at = 2;
  while (at + 4 <= b.length && b[at] === 0xff) {
    const marker = b[at + 1]!;
    if (marker === 0xda || marker === 0xd9) return null; // image data: no more metadata blocks
    const length = b.readUInt16BE(at + 2);
    if (marker === 0xe1 && b.toString('latin1', at + 4, at + 10) === 'Exif\0\0') return inTiff(b, at + 10, at + 2 + length);
    at += 2 + length;
  }
  return null;
}

function inTiff(b: Buffer, tiff: number, end: number): OrientationTag | null {
  if (tiff + 8 > end || end > b.length) return null;
  const little = b.toString('latin1', tiff, tiff + 2) === 'II';
  const u16 = (o: number) => (little ? b.readUInt16LE(o) : b.readUInt16BE(o));
  const u32 = (o: number) => (little ? b.readUInt32LE(o) : b.readUInt32BE(o));
  const ifd = tiff + u32(tiff + 4);
  if (ifd + 2 > end) return null;
  const count = u16(ifd);
  for (let i = 0; i < count; i++) {
    const entry = ifd + 2 + i * 12;
    if (entry + 12 > end) return null;
    if (u16(entry) !== ORIENTATION) continue;
    const orientation = u16(entry + 8);
    return orientation >= 1 && orientation <= 8 ? { orientation, offset: entry + 8, littleEndian: little } : null;
  }
  return null;
}

/** A copy of the JPEG whose orientation tag says 1 (as stored), so a decoder leaves the pixels as they are. */
export function withoutOrientation(b: Buffer, tag: OrientationTag): Buffer {
  const copy = Buffer.from(b);
  if (tag.littleEndian) copy.writeUInt16LE(1, tag.offset);
  else copy.writeUInt16BE(1, tag.offset);
  return copy;
}

/**
 * Turns an RGBA bitmap upright by EXIF orientation (2–8 mirror and/or rotate; 5–8 swap width and
 * height): each output pixel `(x, y)` is read from the stored one the orientation names.
 */
export function orientBitmap(
  data: Buffer,
  width: number,
  height: number,
  orientation: number,
): { data: Buffer; width: number; height: number } {
  if (orientation < 2 || orientation > 8) return { data, width, height };
  const swap = orientation > 4;
  const ow = swap ? height : width;
  const oh = swap ? width : height;
  const src = new Uint32Array(data.buffer, data.byteOffset, width * height);
  const out = Buffer.alloc(ow * oh * 4);
  const dst = new Uint32Array(out.buffer, out.byteOffset, ow * oh);
  const w1 = width - 1;
  const h1 = height - 1;
  // Per orientation: the stored index of output (x, y) = base + x·dx + y·dy.
  const [base, dx, dy] = (
    {
      2: [w1, -1, width],
      3: [h1 * width + w1, -1, -width],
      4: [h1 * width, 1, -width],
      5: [0, width, 1],
      6: [h1 * width, -width, 1],
      7: [h1 * width + w1, -width, -1],
      8: [w1, width, -1],
    } as Record<number, [number, number, number]>
  )[orientation]!;
  for (let y = 0, i = 0; y < oh; y++) {
    let s = base + y * dy;
    for (let x = 0; x < ow; x++, i++, s += dx) dst[i] = src[s]!;
  }
  return { data: out, width: ow, height: oh };
}
