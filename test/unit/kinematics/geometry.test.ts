/**
 * src/kinematics geometry: the two coordinate spaces, direction normalisation, the scale bar, and
 * the out-of-plane and frame-quantisation figures of REFERENCES.md ([calc], recomputed here).
 */
import fc from 'fast-check';
import { describe, expect, expectTypeOf, it } from 'vitest';
import type { FramePoint } from '../../../src/contracts/annotations';
import {
  facingOf,
  frameQuantisationMs,
  metresPerPixel,
  outOfPlaneFactor,
  pixelToSagittal,
  planeDistance,
  planePxToFrame,
  planeScale,
  pxToMetres,
  scaleBarPixelLength,
  toPlaneMetres,
  toPlanePx,
  toSagittal,
  type PlanePoint,
  type Point,
} from '../../../src/kinematics';
import { H, SCALE_1M_400PX, W } from './helpers';

const frame = { frameSize: { width: W, height: H }, direction: 'left_to_right' as const };

describe('image fractions → y-up plane', () => {
  it('flips y so up is positive, and scales by the frame size (aspect kept)', () => {
    const p = toPlanePx({ x: 0.5, y: 0.25 }, frame);
    expect(p.x).toBeCloseTo(640, 9);
    expect(p.y).toBeCloseTo(-180, 9);
    const q = toPlanePx({ x: 0.5, y: 0.5 }, frame);
    expect(q.y - p.y).toBeCloseTo(-180, 9); // lower in the image = lower in the plane
  });

  it('mirrors x for a right-to-left clip so +x is the running direction, and matches the older toSagittal', () => {
    const a = toPlanePx({ x: 0.3, y: 0.4 }, frame);
    const b = toPlanePx({ x: 0.3, y: 0.4 }, { ...frame, direction: 'right_to_left' });
    expect(b.x).toBeCloseTo(-a.x, 9);
    expect(b.y).toBeCloseTo(a.y, 9);
    expect(toSagittal({ x: 0.3, y: 0.4 }, frame.frameSize, facingOf('right_to_left'))).toEqual({ x: b.x, y: b.y });
  });

  it('planePxToFrame inverts toPlanePx in both directions (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: -1, max: 2, noNaN: true }), fc.double({ min: -1, max: 2, noNaN: true }), fc.boolean(), (x, y, ltr) => {
        const f = { ...frame, direction: ltr ? ('left_to_right' as const) : ('right_to_left' as const) };
        const back = planePxToFrame(toPlanePx({ x, y }, f), f);
        expect(back.x).toBeCloseTo(x, 9);
        expect(back.y).toBeCloseTo(y, 9);
      }),
    );
  });

  it('keeps frame fractions, plane pixels and plane metres apart by type', () => {
    const f: FramePoint = { x: 0.1, y: 0.2 };
    const px = toPlanePx(f, frame);
    const m = pxToMetres(px, 0.0025);
    expectTypeOf(px).toEqualTypeOf<PlanePoint<'px'>>();
    expectTypeOf(m).toEqualTypeOf<PlanePoint<'m'>>();
    expectTypeOf(m).toMatchTypeOf<Point>(); // the angle functions accept plane points
    // @ts-expect-error a frame fraction is not a plane point
    planeDistance(f, px);
    // @ts-expect-error pixels and metres do not mix
    planeDistance(px, m);
    // @ts-expect-error metres are not pixels
    pxToMetres(m, 1);
    expect(planeDistance(m, toPlaneMetres({ x: 0.1 + 400 / W, y: 0.2 }, frame, 0.0025))).toBeCloseTo(1, 9);
  });
});

describe('scale bar', () => {
  it('[calc] worked example, REFERENCES.md: 1 m spanning 400 px → 2.5 mm/px', () => {
    expect(metresPerPixel(SCALE_1M_400PX, { width: W, height: H })).toBeCloseTo(1 / 400, 12);
    expect(metresPerPixel(SCALE_1M_400PX, { width: W, height: H })! * 1000).toBeCloseTo(2.5, 12); // 2.5 mm/px as REFERENCES.md prints it
  });

  it('[calc] a diagonal bar uses its pixel length (300, 400 px → 500 px), not its fraction length', () => {
    const bar = { frame: 0, a: { x: 0, y: 0 }, b: { x: 300 / W, y: 400 / H }, lengthM: 1.25 };
    expect(metresPerPixel(bar, { width: W, height: H })).toBeCloseTo(1.25 / 500, 12);
  });

  it('a missing or degenerate bar gives null, never NaN or Infinity', () => {
    const size = { width: W, height: H };
    expect(metresPerPixel(null, size)).toBeNull();
    expect(metresPerPixel({ ...SCALE_1M_400PX, b: SCALE_1M_400PX.a }, size)).toBeNull();
    expect(metresPerPixel({ ...SCALE_1M_400PX, lengthM: 0 }, size)).toBeNull();
    expect(metresPerPixel({ ...SCALE_1M_400PX, lengthM: Number.NaN }, size)).toBeNull();
    // A bar a hair long: 1 m over ~1e-316 px would be Infinity m/px (found by the fast-check property in measures.test.ts).
    expect(metresPerPixel({ frame: 0, a: { x: 0, y: 0 }, b: { x: 1e-320, y: 0 }, lengthM: 1 }, size)).toBeNull();
  });
});

describe('error figures', () => {
  it('[calc] worked example, REFERENCES.md: out-of-plane factor D/(D − Δ), 0.15 m → 3.1 % at 5 m, 8.1 % at 2 m', () => {
    expect((outOfPlaneFactor(5, 0.15) - 1) * 100).toBeCloseTo(3.1, 1);
    expect((outOfPlaneFactor(2, 0.15) - 1) * 100).toBeCloseTo(8.1, 1);
    expect(5 / 4.85).toBeCloseTo(outOfPlaneFactor(5, 0.15), 12);
    expect(outOfPlaneFactor(1, 1)).toBeNaN();
  });

  it('[calc] REFERENCES.md frame quantisation: ±1 frame = 16.7 ms at 60 fps, 8.3 at 120, 4.2 at 240', () => {
    expect(frameQuantisationMs(60)).toBeCloseTo(16.7, 1);
    expect(frameQuantisationMs(120)).toBeCloseTo(8.3, 1);
    expect(frameQuantisationMs(240)).toBeCloseTo(4.2, 1);
  });
});

describe('facing words, pixel aspect and mirrored pixels', () => {
  it('left_to_right faces right, right_to_left faces left; a left-facing point has x mirrored, a right-facing one not', () => {
    expect(facingOf('left_to_right')).toBe('right');
    expect(facingOf('right_to_left')).toBe('left');
    // 0.5 × 1280 = 640 px across, 0.5 × 720 = 360 px down → y up: −360.
    expect(toSagittal({ x: 0.5, y: 0.5 }, { width: 1280, height: 720 }, 'right')).toEqual({ x: 640, y: -360 });
    expect(toSagittal({ x: 0.5, y: 0.5 }, { width: 1280, height: 720 }, 'left')).toEqual({ x: -640, y: -360 });
    expect(pixelToSagittal({ x: 10, y: 20 }, 'right')).toEqual({ x: 10, y: -20 });
    expect(pixelToSagittal({ x: 10, y: 20 }, 'left')).toEqual({ x: -10, y: -20 });
  });

  it('[calc] pixels twice as wide as tall: x counts double in plane pixels and in the scale bar length', () => {
    const frame = { frameSize: { width: 640, height: 720 }, direction: 'left_to_right' as const, pixelAspect: 2 };
    // Fraction → plane pixels: x × 640 × 2 = 1280 (left to right), y × −720 (y up).
    expect(planeScale(frame)).toEqual({ x: 1280, y: -720 });
    // A horizontal bar over a quarter of the width: 0.25 × 640 × 2 = 320 px; 1 m over 320 px = 3.125 mm/px.
    const bar = { frame: 0, a: { x: 0.25, y: 0.9 }, b: { x: 0.5, y: 0.9 }, lengthM: 1 };
    expect(scaleBarPixelLength(bar, frame.frameSize, 2)).toBeCloseTo(160 * 2, 9);
    expect(metresPerPixel(bar, frame.frameSize, 2)).toBeCloseTo(1 / 320, 12);
  });
});
