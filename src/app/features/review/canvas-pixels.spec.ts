import fc from 'fast-check';
import {
  canvasOrigin,
  clientToFrame,
  clientToView,
  deviceRatio,
  frameToBacking,
  frameToClient,
  isOnDevicePixels,
  pixelGridStep,
  placeCanvas,
} from './canvas-pixels';
import { fitTransform } from './view-transform';

/** Display scalings people use (100 % to 300 %, and a phone's 2.625). */
const RATIOS = [1, 1.25, 1.5, 1.75, 2, 2.25, 2.5, 2.625, 3];
const FRAME = { width: 1280, height: 720 };
const isWhole = (v: number) => Math.abs(v - Math.round(v)) < 1e-9;

describe('pixelGridStep', () => {
  it('is 1 CSS px where every CSS px is whole device pixels, 2 at 150 %, 4 at 125 % and 175 %, 8 at 2.625', () => {
    expect([1, 2, 3].map(pixelGridStep)).toEqual([1, 1, 1]);
    expect(pixelGridStep(1.5)).toBe(2);
    expect(pixelGridStep(1.25)).toBe(4);
    expect(pixelGridStep(1.75)).toBe(4);
    expect(pixelGridStep(2.625)).toBe(8);
  });

  it('is 0 when no step up to 8 CSS px is whole device pixels (e.g. 1.1)', () => {
    expect(pixelGridStep(1.1)).toBe(0);
  });
});

describe('deviceRatio', () => {
  it('takes the reported ratio, else 1', () => {
    expect(deviceRatio(1.5)).toBe(1.5);
    expect([undefined, 0, -1, NaN, Infinity].map(deviceRatio)).toEqual([1, 1, 1, 1, 1]);
  });
});

describe('placeCanvas', () => {
  it('at 150 % moves a box that starts on x.5 device px (279 CSS px) to the next even CSS px and sizes its backing exactly', () => {
    // The case seen at 390 × 844: the viewer 374 × 257.39 CSS px at (8, 283) = (12, 424.5) device px.
    const p = placeCanvas({ left: 8, top: 283, width: 374, height: 257.390625 }, 1.5);
    expect(p.offset.x).toBeCloseTo(0, 12);
    expect(p.offset.y).toBeCloseTo(1, 12);
    expect(p.size).toEqual({ width: 374, height: 256 });
    expect(p.backing).toEqual({ width: 561, height: 384 });
  });

  it('at 100 % keeps a box on whole px and drops the fractional rest', () => {
    const p = placeCanvas({ left: 0, top: 0, width: 656.7, height: 400.2 }, 1);
    expect(p.offset).toEqual({ x: 0, y: 0 });
    expect(p.size).toEqual({ width: 656, height: 400 });
    expect(p.backing).toEqual({ width: 656, height: 400 });
  });

  it('keeps a box that is already on the grid, to within 1/128 px', () => {
    const p = placeCanvas({ left: 10 + 1 / 256, top: 20 - 1 / 256, width: 100, height: 60 }, 1.5);
    expect(p.offset.x).toBeCloseTo(-1 / 256, 12);
    expect(p.size.width).toBe(100);
  });

  it('falls back to whole device pixels for a ratio without a common grid', () => {
    const p = placeCanvas({ left: 3.3, top: 7.7, width: 300, height: 200 }, 1.1);
    expect(isOnDevicePixels({ left: 3.3 + p.offset.x, top: 7.7 + p.offset.y, ...p.size }, 1.1)).toBe(true);
  });

  it('gives an empty box for a host thinner than a grid step', () => {
    expect(placeCanvas({ left: 0.5, top: 0, width: 1, height: 10 }, 1.5).size.width).toBe(0);
  });

  it('for any host and ratio: inside the host, whole CSS and device px, backing = box × ratio (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -2000, max: 2000, noNaN: true }),
        fc.double({ min: -2000, max: 4000, noNaN: true }),
        fc.double({ min: 20, max: 3000, noNaN: true }),
        fc.double({ min: 20, max: 2000, noNaN: true }),
        fc.constantFrom(...RATIOS),
        (left, top, width, height, ratio) => {
          const p = placeCanvas({ left, top, width, height }, ratio);
          const box = { left: left + p.offset.x, top: top + p.offset.y, ...p.size };
          const step = pixelGridStep(ratio);
          expect(p.offset.x).toBeGreaterThanOrEqual(-1 / 64);
          expect(p.offset.y).toBeGreaterThanOrEqual(-1 / 64);
          expect(p.offset.x).toBeLessThan(step);
          expect(p.offset.y).toBeLessThan(step);
          expect(box.left + box.width).toBeLessThanOrEqual(left + width + 1 / 64);
          expect(box.top + box.height).toBeLessThanOrEqual(top + height + 1 / 64);
          expect(p.size.width).toBeGreaterThan(width - 2 * step - 1e-6);
          expect(p.size.height).toBeGreaterThan(height - 2 * step - 1e-6);
          expect(isOnDevicePixels(box, ratio)).toBe(true);
          // Whole CSS px too, so snapping to whole CSS px (device emulation) does not move it either.
          expect(Math.abs(box.left - Math.round(box.left))).toBeLessThan(1e-6);
          expect(Math.abs(box.top - Math.round(box.top))).toBeLessThan(1e-6);
          expect(isWhole(p.backing.width) && isWhole(p.backing.height)).toBe(true);
          expect(p.backing.width).toBeCloseTo(p.size.width * ratio, 9);
          expect(p.backing.height).toBeCloseTo(p.size.height * ratio, 9);
        },
      ),
      { numRuns: 500 },
    );
  });
});

describe('canvasOrigin and clientToView', () => {
  it('reads a placed box back on its device pixel although layout kept it in 1/64 px', () => {
    // 1.7 CSS px of offset is kept as 1.703125 (109/64): the box reads 12.003 but shows at 12.
    expect(canvasOrigin({ left: 12.003125, top: 284.0, width: 1, height: 1 }, 1.5)).toEqual({ x: 12, y: 284 });
    expect(clientToView({ x: 12, y: 284 }, { x: 112.5, y: 300.25 })).toEqual({ x: 100.5, y: 16.25 });
  });
});

describe('frame ↔ client round trip', () => {
  it('puts the middle of a 1280 × 720 frame in the middle of a fitted canvas', () => {
    const p = placeCanvas({ left: 8, top: 283, width: 374, height: 257.390625 }, 1.5);
    const t = fitTransform(FRAME, p.size);
    const origin = { x: 8 + p.offset.x, y: 283 + p.offset.y };
    const c = frameToClient(t, origin, { x: 640, y: 360 });
    expect(c.x).toBeCloseTo(8 + 374 / 2, 9);
    expect(c.y).toBeCloseTo(284 + 256 / 2, 9);
    const back = frameToBacking(t, 1.5, { x: 640, y: 360 });
    expect(back.x).toBeCloseTo(561 / 2, 9);
    expect(back.y).toBeCloseTo(384 / 2, 9);
  });

  it('frame → client → frame is exact to 1e-6 frame px at any ratio, host, zoom and pan (property)', () => {
    fc.assert(
      fc.property(
        fc.record({
          left: fc.double({ min: -500, max: 1500, noNaN: true }),
          top: fc.double({ min: -500, max: 3000, noNaN: true }),
          width: fc.double({ min: 100, max: 2500, noNaN: true }),
          height: fc.double({ min: 100, max: 1500, noNaN: true }),
        }),
        fc.constantFrom(...RATIOS),
        fc.double({ min: 0.5, max: 16, noNaN: true }),
        fc.double({ min: -2000, max: 2000, noNaN: true }),
        fc.double({ min: -2000, max: 2000, noNaN: true }),
        fc.double({ min: 0, max: FRAME.width, noNaN: true }),
        fc.double({ min: 0, max: FRAME.height, noNaN: true }),
        (host, ratio, zoom, px, py, fx, fy) => {
          const p = placeCanvas(host, ratio);
          const fit = fitTransform(FRAME, p.size);
          const t = { scale: fit.scale * zoom, tx: fit.tx + px, ty: fit.ty + py };
          // The box as layout reads it back: within 1/64 CSS px of where it was placed.
          const read = { left: host.left + p.offset.x + 1 / 200, top: host.top + p.offset.y - 1 / 200, ...p.size };
          const origin = canvasOrigin(read, ratio);
          const client = frameToClient(t, origin, { x: fx, y: fy });
          const back = clientToFrame(t, origin, client);
          expect(Math.abs(back.x - fx)).toBeLessThan(1e-6);
          expect(Math.abs(back.y - fy)).toBeLessThan(1e-6);
          // And the painter draws that frame point at the same place: backing px / ratio = client − origin.
          const drawn = frameToBacking(t, ratio, { x: fx, y: fy });
          expect(drawn.x / ratio + origin.x).toBeCloseTo(client.x, 6);
          expect(drawn.y / ratio + origin.y).toBeCloseTo(client.y, 6);
          // The origin is the placed corner, on whole device pixels.
          expect(origin.x).toBeCloseTo(host.left + p.offset.x, 6);
          expect(isOnDevicePixels({ left: origin.x, top: origin.y, ...p.size }, ratio)).toBe(true);
        },
      ),
      { numRuns: 500 },
    );
  });
});
