/**
 * Pictures a clinic shows (exercise demonstrations, its logo), processed with jimp (pure
 * JavaScript, nothing to download): checked before decoding (`checkPictureHeader`), decoded,
 * turned upright by its EXIF orientation, scaled down and re-encoded from pixels only, so no
 * EXIF, XMP, IPTC, GPS or device data leaves with it.
 */
import { Jimp, type JimpInstance } from 'jimp';
import { checkPictureHeader, MAX_PICTURE_PIXELS, type PictureFormat } from './picture-sniff';
import { PictureError } from './picture-error';
import { findOrientation, orientBitmap, withoutOrientation } from './exif-orientation';

/** Long side of a demonstration picture as shown (px). */
export const PICTURE_LONG_SIDE = 1600;
/** Long side of its thumbnail (px). */
export const THUMB_LONG_SIDE = 400;
/** Long side of a clinic logo (px); it keeps its transparency (PNG). */
export const LOGO_LONG_SIDE = 600;
/** JPEG quality of pictures and thumbnails. */
export const PICTURE_JPEG_QUALITY = 82;

/** One encoded image. */
export interface EncodedImage {
  bytes: Buffer;
  width: number;
  height: number;
}

/** A processed demonstration picture: upright, metadata-free JPEGs. */
export interface ProcessedPicture {
  /** What the upload was. */
  source: PictureFormat;
  full: EncodedImage;
  thumb: EncodedImage;
}

/** Size that fits `longSide` on its longer side, never larger than the picture. */
export function fitLongSide(width: number, height: number, longSide: number): { width: number; height: number } {
  const scale = Math.min(1, longSide / Math.max(width, height));
  return { width: Math.max(1, Math.round(width * scale)), height: Math.max(1, Math.round(height * scale)) };
}

/**
 * Decodes a checked picture. A JPEG is decoded as stored (its orientation tag neutralised in a
 * copy): jimp would otherwise turn the full-size bitmap upright pixel by pixel, and
 * {@link processPicture} does that after scaling down instead. Answers the orientation to apply.
 */
async function decode(bytes: Buffer, asStored = false): Promise<{ image: JimpInstance; format: PictureFormat; orientation: number }> {
  const { format } = checkPictureHeader(bytes);
  const tag = asStored && format === 'jpeg' ? findOrientation(bytes) : null;
  const orientation = tag?.orientation ?? 1;
  if (tag && orientation > 1) bytes = withoutOrientation(bytes, tag);
  try {
    const image = (await Jimp.fromBuffer(bytes, {
      'image/jpeg': { maxResolutionInMP: MAX_PICTURE_PIXELS / 1e6, tolerantDecoding: false, maxMemoryUsageInMB: 1024 },
    })) as JimpInstance;
    return { image, format, orientation };
  } catch {
    throw new PictureError('undecodable', 'The picture could not be decoded. Send it again as a JPEG or PNG.');
  }
}

function scaled(image: JimpInstance, longSide: number): JimpInstance {
  const size = fitLongSide(image.width, image.height, longSide);
  if (size.width === image.width && size.height === image.height) return image;
  return image.resize({ w: size.width, h: size.height }) as JimpInstance;
}

async function jpeg(image: JimpInstance): Promise<EncodedImage> {
  const bytes = await image.getBuffer('image/jpeg', { quality: PICTURE_JPEG_QUALITY });
  return { bytes, width: image.width, height: image.height };
}

/** Puts transparent parts on white (a JPEG has no alpha; black would show instead). */
function onWhite(image: JimpInstance): JimpInstance {
  if (!image.hasAlpha()) return image;
  const white = new Jimp({ width: image.width, height: image.height, color: 0xffffffff });
  return white.composite(image, 0, 0) as unknown as JimpInstance;
}

/**
 * A demonstration picture: upright (EXIF orientation applied by the decoder), long side at most
 * {@link PICTURE_LONG_SIDE}, a {@link THUMB_LONG_SIDE} thumbnail, both JPEG from pixels only.
 * @throws {PictureError} (422) for anything that is not a complete, decodable JPEG/PNG/GIF within the pixel limit.
 */
export async function processPicture(bytes: Buffer): Promise<ProcessedPicture> {
  const { image, format, orientation } = await decode(bytes, true);
  // Decoded once; scaled down from the decoded bitmap, then turned upright and put on white at
  // that size (a twelfth of a 12 MP photo's pixels); the thumbnail is scaled from the encoded
  // 1600 px picture in place (no copy).
  const full = onWhite(upright(scaled(image, PICTURE_LONG_SIDE), orientation));
  const fullJpeg = await jpeg(full);
  const thumb = await jpeg(scaled(full, THUMB_LONG_SIDE));
  return { source: format, full: fullJpeg, thumb };
}

/** The image turned upright by EXIF `orientation` (the same instance when it already is). */
function upright(image: JimpInstance, orientation: number): JimpInstance {
  if (orientation < 2) return image;
  return new Jimp(orientBitmap(image.bitmap.data, image.width, image.height, orientation)) as JimpInstance;
}

/**
 * A clinic logo: upright, long side at most {@link LOGO_LONG_SIDE}, re-encoded as PNG so its
 * transparency is kept (and nothing but pixels).
 * @throws {PictureError}
 */
export async function processLogo(bytes: Buffer): Promise<EncodedImage> {
  const { image } = await decode(bytes);
  const logo = scaled(image, LOGO_LONG_SIDE);
  return { bytes: await logo.getBuffer('image/png'), width: logo.width, height: logo.height };
}
