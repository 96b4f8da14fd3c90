/**
 * Picture processing (jimp): upright by EXIF orientation, scaled, every metadata block gone, and
 * the bad inputs refused before decoding. Metadata is read back with exifr (an EXIF/XMP/IPTC
 * reader independent of the code under test); the orientation meaning is the EXIF standard's.
 */
import { describe, expect, it } from 'vitest';
import exifr from 'exifr';
import { imageSize } from 'image-size';
import { Jimp } from 'jimp';
import { processLogo, processPicture, PICTURE_LONG_SIDE, THUMB_LONG_SIDE } from '../../../server/pictures/picture-processing';
import { checkPictureHeader } from '../../../server/pictures/picture-sniff';
import { gifBomb, jpegDeclaring, markedJpeg, withExif, withXmpAndIptc } from '../../support/pictures';

async function pixel(jpeg: Buffer, x: number, y: number) {
  const img = await Jimp.fromBuffer(jpeg);
  const c = img.getPixelColor(x, y);
  return { r: (c >>> 24) & 255, g: (c >>> 16) & 255, b: (c >>> 8) & 255, a: c & 255 };
}
const isRed = (p: { r: number; g: number; b: number }) => p.r > 200 && p.g < 60 && p.b < 60;

describe('processPicture', () => {
  it('turns an EXIF orientation 6 photo upright: the stored top-left mark ends at the top-right (EXIF 2.3, CIPA DC-008, orientation 6 = 0th row is the visual right side; from memory)', async () => {
    const source = withExif(await markedJpeg(300, 200), 6);
    // The source really carries orientation 6 and GPS, read by exifr.
    const before = await exifr.parse(source, { gps: true, tiff: true });
    expect(before.Orientation === 6 || before.Orientation === 'Rotate 90 CW').toBe(true);
    expect(before.latitude).toBeCloseTo(47.5, 3);

    const out = await processPicture(source);
    expect([out.full.width, out.full.height]).toEqual([200, 300]);
    expect(isRed(await pixel(out.full.bytes, 200 - 10, 10))).toBe(true); // top-right
    expect(isRed(await pixel(out.full.bytes, 10, 10))).toBe(false); // top-left is grey now
    expect(isRed(await pixel(out.full.bytes, 200 - 10, 300 - 10))).toBe(false);
  });

  it('leaves no EXIF, GPS, XMP or IPTC in the picture or its thumbnail (read back with exifr)', async () => {
    const source = withXmpAndIptc(withExif(await markedJpeg(640, 480), 6));
    const found = await exifr.parse(source, { tiff: true, gps: true, xmp: true, iptc: true, mergeOutput: false });
    expect(found.gps?.latitude).toBeCloseTo(47.5, 3);
    expect(found.xmp ?? found.dc).toBeTruthy();
    expect(found.iptc).toBeTruthy();

    const out = await processPicture(source);
    for (const bytes of [out.full.bytes, out.thumb.bytes]) {
      const left = await exifr.parse(bytes, { tiff: true, gps: true, xmp: true, iptc: true, icc: true, jfif: false, mergeOutput: false });
      expect(left).toBeUndefined();
      // No APP1 (EXIF/XMP) or APP13 (IPTC) segment at all.
      expect(bytes.includes(Buffer.from('Exif\0', 'latin1'))).toBe(false);
      expect(bytes.includes(Buffer.from('Photoshop 3.0', 'latin1'))).toBe(false);
      expect(bytes.includes(Buffer.from('Testcam', 'latin1'))).toBe(false);
    }
  });

  it('scales a large photo to a long side of 1600 px and a 400 px thumbnail, keeping the aspect ratio (sizes read by image-size)', async () => {
    const out = await processPicture(await markedJpeg(3200, 2400));
    expect(imageSize(out.full.bytes)).toMatchObject({ width: PICTURE_LONG_SIDE, height: 1200, type: 'jpg' });
    expect(imageSize(out.thumb.bytes)).toMatchObject({ width: THUMB_LONG_SIDE, height: 300, type: 'jpg' });
  });

  it('never enlarges a small picture', async () => {
    const out = await processPicture(await markedJpeg(320, 240));
    expect([out.full.width, out.full.height]).toEqual([320, 240]);
    expect([out.thumb.width, out.thumb.height]).toEqual([320, 240]);
  });

  it('puts a transparent PNG on white for the JPEG', async () => {
    const png = await new Jimp({ width: 100, height: 50, color: 0x00000000 }).getBuffer('image/png');
    const out = await processPicture(png);
    const p = await pixel(out.full.bytes, 50, 25);
    expect(Math.min(p.r, p.g, p.b)).toBeGreaterThan(240);
  });
});

describe('processLogo', () => {
  it('keeps PNG transparency (alpha read back with jimp) and scales to 600 px', async () => {
    const img = new Jimp({ width: 1200, height: 400, color: 0x00000000 });
    for (let y = 100; y < 300; y++) for (let x = 100; x < 1100; x++) img.setPixelColor(0x1f5e4bff, x, y);
    const withMeta = await img.getBuffer('image/png');
    const out = await processLogo(withMeta);
    expect(imageSize(out.bytes)).toMatchObject({ width: 600, height: 200, type: 'png' });
    expect((await pixel(out.bytes, 5, 5)).a).toBe(0);
    expect((await pixel(out.bytes, 300, 100)).a).toBe(255);
  });
});

describe('bad pictures are refused with a clear 4xx before or instead of decoding', () => {
  const refusal = async (bytes: Buffer) => {
    const err = await processPicture(bytes).then(
      () => null,
      (e: { status: number; code: string; message: string }) => e,
    );
    expect(err).not.toBeNull();
    return err!;
  };

  it('a text file named .jpg', async () => {
    expect(await refusal(Buffer.from('this is not a picture\n'))).toMatchObject({ status: 422, code: 'not_picture' });
  });

  it('an empty file', async () => {
    expect(await refusal(Buffer.alloc(0))).toMatchObject({ status: 422, code: 'empty_file' });
  });

  it('a truncated JPEG', async () => {
    const whole = await markedJpeg(400, 300);
    expect(await refusal(whole.subarray(0, Math.floor(whole.length * 0.6)))).toMatchObject({ status: 422, code: 'truncated' });
  });

  it('a 60-megapixel picture, from its header alone (the bytes behind it are a small photo)', async () => {
    const lying = jpegDeclaring(await markedJpeg(64, 48), 10000, 6000);
    expect(() => checkPictureHeader(lying)).toThrow(/60\.0 megapixels/);
    expect(await refusal(lying)).toMatchObject({ status: 422, code: 'too_many_pixels' });
  });

  it('a GIF bomb (a 200-byte file declaring 30000×30000 pixels)', async () => {
    const bomb = gifBomb();
    expect(bomb.length).toBeLessThan(300);
    expect(await refusal(bomb)).toMatchObject({ status: 422, code: 'too_many_pixels' });
  });

  it('an SVG, even one starting with an XML prolog', async () => {
    const svg = Buffer.from('<?xml version="1.0"?>\n<svg xmlns="http://www.w3.org/2000/svg"><script>alert(1)</script></svg>');
    expect(await refusal(svg)).toMatchObject({ status: 422, code: 'svg_refused' });
  });

  it('a PNG cut short', async () => {
    const png = await new Jimp({ width: 200, height: 200, color: 0x336699ff }).getBuffer('image/png');
    expect(await refusal(png.subarray(0, png.length - 20))).toMatchObject({ status: 422, code: 'truncated' });
  });
});
