/**
 * The demo library's own drawings: every demo exercise has two or three captioned key positions,
 * each drawn inside the picture (pixels of the figure's ink read back with @napi-rs/canvas) and
 * accepted by the picture processing like any upload (sizes read with image-size).
 */
import { createCanvas, loadImage } from '@napi-rs/canvas';
import { imageSize } from 'image-size';
import { describe, expect, it } from 'vitest';
import { DEMO_EXERCISES } from '../../seeds/demo-exercises';
import { joints, lowest, VIEW } from '../../seeds/demo-illustrations/figure';
import { DEMO_ILLUSTRATIONS } from '../../seeds/demo-illustrations/poses';
import { drawKeyPosition, ILLUSTRATION_SIZE } from '../../seeds/demo-illustrations/seed-pictures';
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

  it('every figure fits across the picture and below its top edge', () => {
    for (const [name, positions] of Object.entries(DEMO_ILLUSTRATIONS)) {
      for (const { pose } of positions) {
        const j = joints(pose);
        const xs = [j.hip, j.shoulder, j.headCentre, j.near.toe, j.far.toe, j.near.heel, j.nearArm.hand, j.farArm.hand].map((p) => p[0]);
        expect(Math.min(...xs), name).toBeGreaterThan(2);
        expect(Math.max(...xs), name).toBeLessThan(148);
        const rest = pose.restPoint === 'near-toe' ? j.near.toe[1] - 1.5 : lowest(j);
        const height = Math.max(j.headCentre[1] + 5.5, j.nearArm.hand[1], j.farArm.hand[1]) - rest;
        const { width: w, height: h } = ILLUSTRATION_SIZE;
        const roomAboveFloor = (h - VIEW.floorPx * (w / 1200)) / (w / VIEW.across);
        expect((pose.restOn ?? 0) + height, name).toBeLessThan(roomAboveFloor - 3);
      }
    }
  });

  it('a drawing shows the figure in the app’s spruce and goes through picture processing as an upload would', async () => {
    const png = drawKeyPosition(DEMO_ILLUSTRATIONS['Heel drop from a step, straight knee']![1]!);
    expect(imageSize(png)).toMatchObject({ width: ILLUSTRATION_SIZE.width, height: ILLUSTRATION_SIZE.height, type: 'png' });
    const img = await loadImage(png);
    const ctx = createCanvas(img.width, img.height).getContext('2d');
    ctx.drawImage(img, 0, 0);
    const data = ctx.getImageData(0, 0, img.width, img.height).data;
    let ink = 0;
    for (let i = 0; i < data.length; i += 4) if (data[i] === 0x1f && data[i + 1] === 0x5a && data[i + 2] === 0x4a) ink++;
    expect(ink).toBeGreaterThan(2000);
    const out = await processPicture(png);
    expect([out.full.width, out.full.height]).toEqual([1000, 750]);
    expect([out.thumb.width, out.thumb.height]).toEqual([400, 300]);
  });
});
