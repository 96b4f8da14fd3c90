/**
 * Pixel helpers of marker following, against values recomputed here [calc]: the vertex of a
 * parabola through three samples, and the centre of a disc drawn with 8×8 supersampling.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { copyPatch, dotCentroid, parabolaVertex, patchOrigin, scorePeak, type GrayFrame } from '../../../server/follow/gray-frame';

/** A grey frame with one disc at (cx, cy), radius r, area-weighted edges (8×8 samples per pixel). */
function disc(cx: number, cy: number, r: number, inside: number, outside: number, size = 48): GrayFrame {
  const data = new Uint8Array(size * size);
  for (let y = 0; y < size; y++)
    for (let x = 0; x < size; x++) {
      let hits = 0;
      for (let sy = 0; sy < 8; sy++)
        for (let sx = 0; sx < 8; sx++) if (Math.hypot(x + (sx + 0.5) / 8 - 0.5 - cx, y + (sy + 0.5) / 8 - 0.5 - cy) <= r) hits++;
      data[y * size + x] = Math.round(outside + ((inside - outside) * hits) / 64);
    }
  return { width: size, height: size, data };
}

describe('parabolaVertex and scorePeak', () => {
  it('finds the vertex of y = −(x − v)² from samples at −1, 0, 1 exactly', () => {
    fc.assert(
      fc.property(fc.double({ min: -0.5, max: 0.5, noNaN: true }), (v) => {
        const f = (x: number) => -((x - v) ** 2);
        expect(parabolaVertex(f(-1), f(0), f(1))).toBeCloseTo(v, 9);
      }),
    );
  });

  it('gives the sub-pixel peak of a paraboloid score map', () => {
    const cols = 9;
    const scores = new Float32Array(cols * cols);
    for (let y = 0; y < cols; y++) for (let x = 0; x < cols; x++) scores[y * cols + x] = 1 - 0.01 * ((x - 4.3) ** 2 + (y - 3.8) ** 2);
    const peak = scorePeak(scores, cols, cols);
    expect(peak.x).toBeCloseTo(4.3, 4);
    expect(peak.y).toBeCloseTo(3.8, 4);
  });
});

describe('dotCentroid', () => {
  it('finds the centre of a white dot within 0.1 px wherever it sits between pixels', () => {
    fc.assert(
      fc.property(fc.double({ min: 20, max: 28, noNaN: true }), fc.double({ min: 20, max: 28, noNaN: true }), (cx, cy) => {
        const fit = dotCentroid(disc(cx, cy, 5, 250, 90), { x: cx + 1.5, y: cy - 1.2 }, 7, 1)!;
        expect(Math.hypot(fit.x - cx, fit.y - cy)).toBeLessThan(0.1);
        expect(fit.contrast).toBeGreaterThan(150);
      }),
      { numRuns: 40 },
    );
  });

  it('finds a dark dot with polarity −1, and nothing on a flat patch', () => {
    const fit = dotCentroid(disc(23.4, 24.7, 4, 20, 200), { x: 24, y: 24 }, 6, -1)!;
    expect(Math.hypot(fit.x - 23.4, fit.y - 24.7)).toBeLessThan(0.1);
    const flat: GrayFrame = { width: 48, height: 48, data: new Uint8Array(48 * 48).fill(120) };
    expect(dotCentroid(flat, { x: 24, y: 24 }, 6, 1)).toBeNull();
  });
});

describe('patches', () => {
  it('keeps a patch inside the frame and copies its rows', () => {
    const frame: GrayFrame = { width: 10, height: 8, data: Uint8Array.from({ length: 80 }, (_, i) => i) };
    expect(patchOrigin(frame, { x: 0.2, y: 7.9 }, 5)).toEqual({ x: 0, y: 3 });
    const out = new Uint8Array(9);
    copyPatch(frame, { x: 2, y: 1 }, 3, out);
    expect([...out]).toEqual([12, 13, 14, 22, 23, 24, 32, 33, 34]);
  });
});
