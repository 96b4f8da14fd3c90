/**
 * EXIF orientation read from a JPEG's bytes and applied to a bitmap. References: the tag as
 * piexifjs writes it (an independent EXIF writer) and read back by exifr; the meaning of each
 * orientation is the EXIF standard's (EXIF 2.3 / CIPA DC-008: 0th row and 0th column; from memory),
 * checked as where the stored top-left pixel ends up.
 */
import exifr from 'exifr';
import { describe, expect, it } from 'vitest';
import { findOrientation, orientBitmap, withoutOrientation } from '../../../server/pictures/exif-orientation';
import { markedJpeg, withExif } from '../../support/pictures';

/** A 3×2 RGBA bitmap whose pixel values are their stored indexes 0…5. */
function indexed(): Buffer {
  const b = Buffer.alloc(3 * 2 * 4);
  for (let i = 0; i < 6; i++) b.writeUInt32LE(i, i * 4);
  return b;
}
const values = (r: { data: Buffer; width: number; height: number }) =>
  Array.from({ length: r.width * r.height }, (_, i) => r.data.readUInt32LE(i * 4));

describe('EXIF orientation', () => {
  it('finds the tag piexifjs wrote, and a copy marked 1 reads 1 with exifr (the original is untouched)', async () => {
    const jpeg = withExif(await markedJpeg(16, 8), 6);
    const tag = findOrientation(jpeg)!;
    expect(tag.orientation).toBe(6);
    const plain = withoutOrientation(jpeg, tag);
    expect((await exifr.parse(plain, ['Orientation']))?.Orientation).toBe('Horizontal (normal)');
    expect((await exifr.parse(jpeg, { translateValues: false }))?.Orientation).toBe(6);
    expect(plain.length).toBe(jpeg.length);
  });

  it('is null for a JPEG without EXIF and for bytes that are no JPEG', async () => {
    expect(findOrientation(await markedJpeg(8, 8))).toBeNull();
    expect(findOrientation(Buffer.from('not a picture'))).toBeNull();
  });

  it('moves each stored pixel where the orientation says (stored 3×2: 0 1 2 / 3 4 5)', () => {
    const at = (o: number) => values(orientBitmap(indexed(), 3, 2, o));
    expect(at(1)).toEqual([0, 1, 2, 3, 4, 5]);
    expect(at(2)).toEqual([2, 1, 0, 5, 4, 3]); // mirrored left–right
    expect(at(3)).toEqual([5, 4, 3, 2, 1, 0]); // turned 180°
    expect(at(4)).toEqual([3, 4, 5, 0, 1, 2]); // mirrored top–bottom
    expect(at(5)).toEqual([0, 3, 1, 4, 2, 5]); // transposed (2×3)
    expect(at(6)).toEqual([3, 0, 4, 1, 5, 2]); // turned 90° clockwise: the stored left column becomes the top row
    expect(at(7)).toEqual([5, 2, 4, 1, 3, 0]); // transversed
    expect(at(8)).toEqual([2, 5, 1, 4, 0, 3]); // turned 90° counter-clockwise
    expect(orientBitmap(indexed(), 3, 2, 6)).toMatchObject({ width: 2, height: 3 });
  });
});
