/**
 * The saved still's caution line, without the API: one small line at the foot of the image, drawn
 * in the shipped Source Sans 3. The reference for "is it the caution, in that font" is Skia's own
 * text measurement (@napi-rs/canvas `measureText`) of the line in the registered face, compared
 * with where the ink actually landed in the PNG.
 */
import { createCanvas, loadImage } from '@napi-rs/canvas';
import { describe, expect, it } from 'vitest';
import { CANVAS_FONT_FAMILY, loadCanvas } from '../../../server/render/fonts';
import { renderStill } from '../../../server/render/still-render';
import { STILL_CAUTION_LINE } from '../../../src/contracts/sharing';

/** A plain mid-grey frame of `w`×`h` as JPEG bytes (no landmarks: only the caution is looked at). */
async function greyFrame(w: number, h: number): Promise<Buffer> {
  const c = createCanvas(w, h);
  const ctx = c.getContext('2d');
  ctx.fillStyle = '#808080';
  ctx.fillRect(0, 0, w, h);
  return c.encode('jpeg', 90);
}

/** Columns and rows of `rect` in the PNG whose pixels are clearly darker than the white paper. */
async function inkExtent(png: Buffer, rect: { x: number; y: number; width: number; height: number }) {
  const img = await loadImage(png);
  const ctx = createCanvas(img.width, img.height).getContext('2d');
  ctx.drawImage(img, 0, 0);
  const data = ctx.getImageData(rect.x, rect.y, rect.width, rect.height - 1).data; // last row: the hairline
  let left = Infinity,
    right = -Infinity,
    top = Infinity,
    bottom = -Infinity;
  for (let y = 0; y < rect.height - 1; y++) {
    for (let x = 0; x < rect.width; x++) {
      const i = (y * rect.width + x) * 4;
      if (data[i]! < 200) {
        left = Math.min(left, x);
        right = Math.max(right, x);
        top = Math.min(top, y);
        bottom = Math.max(bottom, y);
      }
    }
  }
  return { left, right, top, bottom };
}

describe('renderStill: the caution line', () => {
  it.each([
    [1280, 720, 'A caption under the frame.'],
    [640, 360, ''],
  ])('a %i×%i still carries one small line at its foot, as wide as the shipped font sets it', async (w, h, caption) => {
    const out = await renderStill({
      panels: [
        {
          image: await greyFrame(w, h),
          frameSize: { width: w, height: h },
          landmarks: [],
          nearSide: 'right',
          direction: 'left_to_right',
          scale: null,
          heading: 'Baseline',
        },
      ],
      caption,
      showAngles: false,
    });
    // At the foot, below the frame (and caption), full width, and small: under 6 % of the image.
    expect(out.caution).toMatchObject({ x: 0, width: out.width });
    expect(out.caution.y + out.caution.height).toBe(out.height);
    expect(out.caution.y).toBeGreaterThanOrEqual(out.layout[0]!.y + out.layout[0]!.height);
    expect(out.caution.height / out.height).toBeLessThan(0.06);

    // The ink in that band is one line of the caution in Source Sans 3 at the small size.
    await loadCanvas();
    const unit = Math.max(12, Math.round(Math.min(w, h) * 0.028));
    const size = Math.max(10, Math.round(unit * 0.8));
    const probe = createCanvas(10, 10).getContext('2d');
    probe.font = `400 ${size}px "${CANVAS_FONT_FAMILY}"`;
    const expected = probe.measureText(STILL_CAUTION_LINE).width;
    const ink = await inkExtent(out.png, out.caution);
    expect(Math.abs(ink.left - unit)).toBeLessThanOrEqual(2);
    expect(Math.abs(ink.right - ink.left + 1 - expected)).toBeLessThanOrEqual(3);
    expect(ink.bottom - ink.top + 1).toBeLessThanOrEqual(Math.ceil(size * 1.2)); // one line, small
  });
});
