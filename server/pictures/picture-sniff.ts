/**
 * What a picture is and how big it says it is, from its bytes alone: nothing here decodes pixels,
 * so a refused file costs a few header reads. Pure (Buffer in, facts out).
 */
import { imageSize } from 'image-size';
import { PictureError } from './picture-error';

/** Formats accepted for pictures; everything else is refused by its first bytes. */
export type PictureFormat = 'jpeg' | 'png' | 'gif';

/** Most pixels a picture may declare (a 12–40 MP phone photo fits; a 60 MP one does not). */
export const MAX_PICTURE_PIXELS = 40_000_000;
/** Most frames of a GIF (only the first is kept, but the decoder reads them all). */
export const MAX_GIF_FRAMES = 200;

const startsWith = (b: Buffer, bytes: number[]) => bytes.every((v, i) => b[i] === v);

/** Whether the bytes are SVG text (a BOM, whitespace, an XML prolog or comments may come first). */
export function looksLikeSvg(b: Buffer): boolean {
  const head = b
    .subarray(0, 4096)
    .toString('utf8')
    .replace(/^\uFEFF/, '')
    .trimStart()
    .toLowerCase();
  if (!head.startsWith('<')) return false;
  return /<svg[\s>]/.test(head) || head.startsWith('<!doctype svg');
}

/** The picture format by magic bytes, or null. */
export function sniffPicture(b: Buffer): PictureFormat | null {
  if (startsWith(b, [0xff, 0xd8, 0xff])) return 'jpeg';
  if (startsWith(b, [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) return 'png';
  const sig = b.subarray(0, 6).toString('latin1');
  if (sig === 'GIF87a' || sig === 'GIF89a') return 'gif';
  return null;
}

/** Frames of a GIF and the pixels they declare, walking its blocks; null when the block chain is broken. */
export function gifFrames(b: Buffer): { frames: number; pixels: number } | null {
  if (b.length < 13) return null;
  let at = 13;
  const packed = b[10]!;
  if (packed & 0x80) at += 3 * 2 ** ((packed & 7) + 1);
  let frames = 0;
  let pixels = 0;
  const skipSubBlocks = (): boolean => {
    while (at < b.length) {
      const size = b[at]!;
      at += 1 + size;
      if (size === 0) return true;
    }
    return false;
  };
  while (at < b.length) {
    const kind = b[at]!;
    if (kind === 0x3b) return { frames, pixels };
    if (kind === 0x21) {
      at += 2;
      if (!skipSubBlocks()) return null;
    } else if (kind === 0x2c) {
      if (at + 10 > b.length) return null;
      frames++;
      pixels += b.readUInt16LE(at + 5) * b.readUInt16LE(at + 7);
      const local = b[at + 9]!;
      at += 10;
      if (local & 0x80) at += 3 * 2 ** ((local & 7) + 1);
      at += 1; // LZW minimum code size
      if (!skipSubBlocks()) return null;
    } else {
      return null;
    }
  }
  return null; // no trailer: cut short
}

/** Whether a JPEG has its end-of-image marker after its first scan (a cut-off upload does not). */
export function jpegComplete(b: Buffer): boolean {
  const scan = b.indexOf(Buffer.from([0xff, 0xda]), 2);
  if (scan < 0) return false;
  return b.lastIndexOf(Buffer.from([0xff, 0xd9])) > scan;
}

/** Whether a PNG has its closing IEND chunk. */
export function pngComplete(b: Buffer): boolean {
  return b.lastIndexOf(Buffer.from('IEND', 'latin1')) > 8;
}

/** What the checks before decoding found. */
export interface PictureHeader {
  format: PictureFormat;
  width: number;
  height: number;
}

/**
 * Every check that needs no decoding: magic bytes (SVG refused by name), complete file, and the
 * pixel count the header declares (a 60-megapixel photo or a GIF bomb is refused here, before any
 * memory is spent on it).
 * @throws {PictureError}
 */
export function checkPictureHeader(b: Buffer): PictureHeader {
  if (b.length === 0) throw new PictureError('empty_file', 'The file is empty.');
  if (looksLikeSvg(b)) {
    throw new PictureError('svg_refused', 'SVG pictures are not accepted (they can carry script). Send a JPEG or PNG.');
  }
  const format = sniffPicture(b);
  if (!format) throw new PictureError('not_picture', 'This file is not a JPEG, PNG or GIF picture.');
  let size: { width?: number; height?: number };
  try {
    size = imageSize(b);
  } catch {
    throw new PictureError('undecodable', 'The picture could not be read: its header is damaged.');
  }
  const width = size.width ?? 0;
  const height = size.height ?? 0;
  if (width <= 0 || height <= 0) throw new PictureError('undecodable', 'The picture could not be read: it declares no size.');
  const megapixels = (n: number) => (n / 1e6).toFixed(n < 1e8 ? 1 : 0);
  const tooMany = (n: number) =>
    new PictureError(
      'too_many_pixels',
      `The picture has ${megapixels(n)} megapixels; at most ${MAX_PICTURE_PIXELS / 1e6} are accepted. Send a smaller copy.`,
    );
  if (width * height > MAX_PICTURE_PIXELS) throw tooMany(width * height);
  if (format === 'jpeg' && !jpegComplete(b))
    throw new PictureError('truncated', 'The JPEG ends early (the file was cut short). Send it again.');
  if (format === 'png' && !pngComplete(b))
    throw new PictureError('truncated', 'The PNG ends early (the file was cut short). Send it again.');
  if (format === 'gif') {
    const gif = gifFrames(b);
    if (!gif || gif.frames === 0) throw new PictureError('truncated', 'The GIF is damaged or ends early.');
    if (gif.frames > MAX_GIF_FRAMES) {
      throw new PictureError('too_many_pixels', `The GIF has ${gif.frames} frames; at most ${MAX_GIF_FRAMES} are accepted.`);
    }
    if (gif.pixels > MAX_PICTURE_PIXELS) throw tooMany(gif.pixels);
  }
  return { format, width, height };
}
