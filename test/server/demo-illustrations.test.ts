/**
 * The demo library's own drawings: every demo exercise has two or three captioned key positions,
 * each drawn inside the picture (pixels of the figure's ink read back with @napi-rs/canvas) and
 * accepted by the picture processing like any upload (sizes read with image-size).
 */
import { createCanvas, loadImage } from '@napi-rs/canvas';
import { imageSize } from 'image-size';
import { describe, expect, it } from 'vitest';
import { DEMO_EXERCISES } from '../../seeds/demo-exercises';
import { LAYOUT } from '../../seeds/demo-illustrations/figure';
import { DEMO_ILLUSTRATIONS } from '../../seeds/demo-illustrations/poses';
import { drawKeyPositions } from '../../seeds/demo-illustrations/seed-pictures';
import { DEMO_LIMITS } from '../../src/contracts/demonstrations';
import { processPicture } from '../../server/pictures/picture-processing';

describe('demo exercise illustrations', () => {
  it('every demo exercise has 2–3 key positions with a one-line caption within the limit', () => {
    for (const e of DEMO_EXERCISES) {
      const positions = DEMO_ILLUSTRATIONS[e.name];
      expect(positions, e.name).toBeDefined();
      expect(positions!.length, e.name).toBeGreaterThanOrEqual(2);
      expect(positions!.length, e.name).toBeLessThanOrEqual(Math.min(3, DEMO_LIMITS.pictures));
      for (const p of positions!) {
        expect(p.caption.length).toBeGreaterThan(3);
        expect(p.caption.length).toBeLessThanOrEqual(DEMO_LIMITS.caption);
        expect(p.caption).not.toMatch(/\n/);
      }
    }
    expect(Object.keys(DEMO_ILLUSTRATIONS).sort()).toEqual(DEMO_EXERCISES.map((e) => e.name).sort());
  });

  it('each exercise’s drawings share one size, and the figure fills its picture (ink read back with @napi-rs/canvas)', async () => {
    for (const [name, positions] of Object.entries(DEMO_ILLUSTRATIONS)) {
      const pngs = drawKeyPositions(positions);
      const sizes = pngs.map((p) => imageSize(p));
      expect(new Set(sizes.map((s) => `${s.width}×${s.height}`)).size, name).toBe(1);
      const { width, height } = sizes[0] as { width: number; height: number };
      expect(width).toBe(1000);
      expect(height / width).toBeGreaterThanOrEqual(0.5);
      expect(height / width).toBeLessThanOrEqual(0.75);
      // Across the exercise's positions, the figure's ink reaches most of the width or of the height above the floor.
      let minX = width,
        maxX = 0,
        minY = height,
        maxY = 0;
      for (const png of pngs) {
        const img = await loadImage(png);
        const ctx = createCanvas(width, height).getContext('2d');
        ctx.drawImage(img, 0, 0);
        const data = ctx.getImageData(0, 0, width, height).data;
        for (let y = 0; y < height; y += 2) {
          for (let x = 0; x < width; x += 2) {
            const i = (y * width + x) * 4;
            if (data[i] === 0x1f && data[i + 1] === 0x5a && data[i + 2] === 0x4a) {
              minX = Math.min(minX, x);
              maxX = Math.max(maxX, x);
              minY = Math.min(minY, y);
              maxY = Math.max(maxY, y);
            }
          }
        }
      }
      const floorY = height * (1 - LAYOUT.floorBand);
      expect(Math.max((maxX - minX) / width, (floorY - minY) / floorY), name).toBeGreaterThan(0.6);
      expect(minX, name).toBeGreaterThan(0);
      expect(minY, name).toBeGreaterThan(0);
    }
  });

  it('a drawing shows the figure in the app’s spruce and goes through picture processing as an upload would', async () => {
    const png = drawKeyPositions(DEMO_ILLUSTRATIONS['Heel drop from a step, straight knee']!)[1]!;
    const size = imageSize(png);
    expect(size.type).toBe('png');
    const img = await loadImage(png);
    const ctx = createCanvas(img.width, img.height).getContext('2d');
    ctx.drawImage(img, 0, 0);
    const data = ctx.getImageData(0, 0, img.width, img.height).data;
    let ink = 0;
    for (let i = 0; i < data.length; i += 4) if (data[i] === 0x1f && data[i + 1] === 0x5a && data[i + 2] === 0x4a) ink++;
    expect(ink).toBeGreaterThan(2000);
    const out = await processPicture(png);
    expect([out.full.width, out.full.height]).toEqual([size.width, size.height]);
    expect(out.thumb.width).toBe(400);
    expect(out.thumb.height).toBe(Math.round((size.height! / size.width!) * 400));
  });
});
