/**
 * The saved still's caution line, without the API: one small line at the foot of the image, drawn
 * in the shipped Source Sans 3. The reference for "is it the caution, in that font" is Skia's own
 * text measurement (@napi-rs/canvas `measureText`) of the line in the registered face, compared
 * with where the ink actually landed in the PNG.
 */
import { createCanvas, loadImage } from '@napi-rs/canvas';
import { describe, expect, it } from 'vitest';
import * as fontkit from 'fontkit';
import { CANVAS_FACES, CANVAS_FONT_FAMILY, CANVAS_FONT_STACK, loadCanvas } from '../../../server/render/fonts';
import { clampLines, renderStill, wrapText } from '../../../server/render/still-render';
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

describe('caption lines in text without spaces', () => {
  /** 280 characters of Chinese (no spaces between words), with an emoji and a letter with a combining mark. */
  const CJK = '跑步时髋关节伸展不足'.repeat(27) + '🏃🏽e\u0301';
  const width = 600;

  it('are broken between characters so no line is wider than the caption area (Skia measureText), and every character is kept', async () => {
    await loadCanvas();
    const ctx = createCanvas(10, 10).getContext('2d');
    ctx.font = `400 23px "${CANVAS_FONT_FAMILY}"`;
    const lines = wrapText(ctx, `Push-off: ${CJK} https://example.test/${'a'.repeat(200)}`, width);
    expect(lines.length).toBeGreaterThan(3);
    for (const line of lines) expect(ctx.measureText(line).width).toBeLessThanOrEqual(width);
    // Nothing dropped: the lines hold the caption's characters in order (spaces aside).
    expect(lines.join('').replace(/\s/g, '')).toBe(`Push-off:${CJK}https://example.test/${'a'.repeat(200)}`);
    // An emoji with its skin-tone modifier and a letter with its combining mark stay whole: no line starts with the modifier or the mark.
    for (const line of lines) expect(/^(\p{Emoji_Modifier}|\p{M})/u.test(line), line).toBe(false);
  });

  it('a caption cut to fewer lines ends in "…" within the width', async () => {
    await loadCanvas();
    const ctx = createCanvas(10, 10).getContext('2d');
    ctx.font = `400 23px "${CANVAS_FONT_FAMILY}"`;
    const lines = clampLines(ctx, wrapText(ctx, CJK, width), 3, width);
    expect(lines).toHaveLength(3);
    expect(lines[2]!.endsWith('…')).toBe(true);
    expect(ctx.measureText(lines[2]!).width).toBeLessThanOrEqual(width);
    expect(clampLines(ctx, ['one', 'two'], 3, width)).toEqual(['one', 'two']);
  });

  it('a still whose caption is 280 Chinese characters renders, its caption in lines below the frame', async () => {
    const out = await renderStill({
      panels: [
        {
          image: await greyFrame(640, 360),
          frameSize: { width: 640, height: 360 },
          landmarks: [],
          nearSide: 'left',
          direction: 'left_to_right',
          scale: null,
          heading: 'Baseline · 跑步 · שלום',
        },
      ],
      caption: CJK,
      showAngles: false,
    });
    expect(out.height).toBeGreaterThan(360 + 3 * 20);
  });
});

describe('renderStill: names and captions in other scripts', () => {
  const still = async (caption: string) =>
    (
      await renderStill({
        panels: [
          {
            image: await greyFrame(640, 360),
            frameSize: { width: 640, height: 360 },
            landmarks: [],
            nearSide: 'left',
            direction: 'left_to_right',
            scale: null,
            heading: 'Baseline',
          },
        ],
        caption,
        showAngles: false,
      })
    ).png;
  const pixels = async (png: Buffer) => {
    const img = await loadImage(png);
    const ctx = createCanvas(img.width, img.height).getContext('2d');
    ctx.drawImage(img, 0, 0);
    return ctx.getImageData(0, 0, img.width, img.height).data;
  };

  it.each([
    ['Chinese', '陈小明'],
    ['Japanese', '山田さくら'],
    ['Hebrew', 'שרה כהן'],
    ['Arabic', 'ليلى حداد'],
    ['Greek', 'Αλέξης'],
    ['Cyrillic', 'Жанна Шевчук'],
    ['accented Latin', 'Zoë Łukasiewicz'],
  ])('a %s caption draws glyphs, not the missing-glyph box a non-character (U+FFFF) draws', async (_script, text) => {
    const drawn = await pixels(await still(text));
    // The same number of characters that no face has: each prints the .notdef box.
    const boxes = await pixels(await still('\uFFFF'.repeat([...text].length)));
    let differing = 0;
    for (let i = 0; i < drawn.length; i += 4) if (Math.abs(drawn[i]! - boxes[i]!) > 60) differing++;
    expect(differing).toBeGreaterThan(50);
  });

  // Source Sans 3's published coverage (Latin with its extensions, Greek, Cyrillic; [mem]) in the
  // web app's own subsets: what a still draws these with must be a bundled face, the same on every
  // machine, never whatever system font has the letter (a bare machine draws boxes).
  it.each([
    ['Greek', 'Αλέξης Παπαδόπουλος ΓΔΘΛΞΠΣΦΨΩ άέήίόύώ'],
    ['Cyrillic', 'Жанна Шевчук ЁЙЩЫЭЮЯ ёйщыэюя Ґґ Єє Її Ўў'],
    ['accented Latin', 'Zoë Łukasiewicz Ğülşen Dvořák Ærøskøbing Őrs'],
  ])("every character of a %s caption or name has a glyph in a bundled face of the stills' font stack", (_script, text) => {
    const families = [...CANVAS_FONT_STACK.matchAll(/"([^"]+)"/g)].map((m) => m[1]!);
    const bundled = new Map(CANVAS_FACES.map((f) => [f.family, f.files]));
    expect(families.every((f) => bundled.has(f))).toBe(true);
    const faces = families.filter((f) => !f.startsWith('Trailframe ')).map((f) => fontkit.openSync(bundled.get(f)![0]!));
    const missing = [...text].filter((ch) => ch.trim() && !faces.some((face) => face.hasGlyphForCodePoint(ch.codePointAt(0)!)));
    expect(missing).toEqual([]);
  });
});
