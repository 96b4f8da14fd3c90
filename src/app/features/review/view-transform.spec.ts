import {
  clampPan,
  frameFractionToViewFraction,
  fitTransform,
  fractionToScreen,
  frameToScreen,
  panBy,
  pinchTransform,
  scaleLimits,
  screenToFraction,
  screenToFrame,
  wheelIntent,
  wheelZoomFactor,
  zoomAt,
} from './view-transform';

const frame = { width: 1280, height: 720 };

describe('fitTransform', () => {
  it('fits a landscape frame to the width and centres it vertically', () => {
    const t = fitTransform(frame, { width: 656, height: 600 }, 8);
    expect(t.scale).toBeCloseTo(0.5);
    expect(t.tx).toBeCloseTo(8);
    expect(t.ty).toBeCloseTo((600 - 360) / 2);
  });

  it('fits a portrait frame to the height', () => {
    const t = fitTransform({ width: 720, height: 1280 }, { width: 1000, height: 656 }, 8);
    expect(t.scale).toBeCloseTo(0.5);
    expect(t.ty).toBeCloseTo(8);
    expect(t.tx).toBeCloseTo((1000 - 360) / 2);
  });

  it('falls back to identity for empty sizes', () => {
    expect(fitTransform(frame, { width: 0, height: 0 })).toEqual({ scale: 1, tx: 0, ty: 0 });
  });
});

describe('screen and frame coordinates', () => {
  const t = { scale: 2, tx: 10, ty: -20 };

  it('round-trips frame and screen pixels', () => {
    const s = frameToScreen(t, { x: 100, y: 50 });
    expect(s).toEqual({ x: 210, y: 80 });
    expect(screenToFrame(t, s)).toEqual({ x: 100, y: 50 });
  });

  it('round-trips stored fractions', () => {
    const s = fractionToScreen(t, frame, { x: 0.25, y: 0.5 });
    expect(s).toEqual({ x: 0.25 * 1280 * 2 + 10, y: 0.5 * 720 * 2 - 20 });
    const back = screenToFraction(t, frame, s);
    expect(back.x).toBeCloseTo(0.25);
    expect(back.y).toBeCloseTo(0.5);
  });
});

describe('zoomAt', () => {
  const limits = { min: 0.1, max: 10 };

  it('keeps the frame point under the pointer fixed', () => {
    const t = { scale: 1, tx: 30, ty: 40 };
    const anchor = { x: 300, y: 200 };
    const before = screenToFrame(t, anchor);
    const z = zoomAt(t, 2.5, anchor, limits);
    expect(z.scale).toBeCloseTo(2.5);
    const after = screenToFrame(z, anchor);
    expect(after.x).toBeCloseTo(before.x);
    expect(after.y).toBeCloseTo(before.y);
  });

  it('stops at the limits and still keeps the anchor fixed', () => {
    const t = { scale: 8, tx: 0, ty: 0 };
    const z = zoomAt(t, 4, { x: 100, y: 100 }, limits);
    expect(z.scale).toBe(10);
    const p = screenToFrame(z, { x: 100, y: 100 });
    expect(p.x).toBeCloseTo(100 / 8);
  });

  it('derives limits from the fit scale', () => {
    const l = scaleLimits(frame, { width: 656, height: 600 });
    expect(l.min).toBeCloseTo(0.25);
    expect(l.max).toBeCloseTo(8);
  });
});

describe('panning', () => {
  it('moves by screen pixels', () => {
    expect(panBy({ scale: 2, tx: 1, ty: 2 }, 5, -5)).toEqual({ scale: 2, tx: 6, ty: -3 });
  });

  it('keeps part of the frame in view', () => {
    const view = { width: 800, height: 600 };
    const far = clampPan({ scale: 1, tx: 5000, ty: -5000 }, frame, view, 48);
    expect(far.tx).toBe(800 - 48);
    expect(far.ty).toBe(48 - 720);
  });
});

describe('pinchTransform', () => {
  const limits = { min: 0.1, max: 10 };

  it('scales by the finger distance and follows the midpoint', () => {
    const start = { scale: 1, tx: 0, ty: 0 };
    const t = pinchTransform(start, { x: 100, y: 100 }, { x: 200, y: 100 }, { x: 50, y: 120 }, { x: 250, y: 120 }, limits);
    expect(t.scale).toBeCloseTo(2);
    // The frame point that was under the old midpoint (150, 100) is now under the new one (150, 120).
    const p = frameToScreen(t, { x: 150, y: 100 });
    expect(p.x).toBeCloseTo(150);
    expect(p.y).toBeCloseTo(120);
  });

  it('pans with two fingers moving together', () => {
    const t = pinchTransform({ scale: 1, tx: 0, ty: 0 }, { x: 0, y: 0 }, { x: 10, y: 0 }, { x: 5, y: 5 }, { x: 15, y: 5 }, limits);
    expect(t).toEqual({ scale: 1, tx: 5, ty: 5 });
  });
});

describe('wheelZoomFactor', () => {
  it('zooms in on a negative delta and out on a positive one, symmetrically', () => {
    const zin = wheelZoomFactor(-100);
    const zout = wheelZoomFactor(100);
    expect(zin).toBeGreaterThan(1);
    expect(zout).toBeLessThan(1);
    expect(zin * zout).toBeCloseTo(1);
  });

  it('treats line-mode deltas as larger steps and caps huge ones', () => {
    expect(wheelZoomFactor(3, 1)).toBeLessThan(wheelZoomFactor(3, 0));
    expect(wheelZoomFactor(-100000)).toBeCloseTo(wheelZoomFactor(-200));
  });
});

describe('frameFractionToViewFraction', () => {
  it('maps a stored point to where it shows in the view, as a fraction of the view', () => {
    const t = { scale: 0.5, tx: 8, ty: 20 };
    const view = { width: 656, height: 400 };
    const p = frameFractionToViewFraction(t, frame, view, { x: 0.5, y: 0.5 });
    expect(p.x).toBeCloseTo((0.5 * 1280 * 0.5 + 8) / 656);
    expect(p.y).toBeCloseTo((0.5 * 720 * 0.5 + 20) / 400);
  });

  it('keeps angles: a segment keeps its direction in view pixels', () => {
    const t = { scale: 2.5, tx: -300, ty: -100 };
    const view = { width: 800, height: 600 };
    const a = frameFractionToViewFraction(t, frame, view, { x: 0.4, y: 0.3 });
    const b = frameFractionToViewFraction(t, frame, view, { x: 0.45, y: 0.6 });
    const inFrame = Math.atan2((0.6 - 0.3) * 720, (0.45 - 0.4) * 1280);
    const inView = Math.atan2((b.y - a.y) * 600, (b.x - a.x) * 800);
    expect(inView).toBeCloseTo(inFrame);
  });
});

describe('wheelIntent', () => {
  it('zooms only with Ctrl or ⌘ (and a trackpad pinch, sent as Ctrl + wheel); the plain wheel scrolls the page', () => {
    expect(wheelIntent({ ctrlKey: false, metaKey: false })).toBe('scroll');
    expect(wheelIntent({ ctrlKey: true, metaKey: false })).toBe('zoom');
    expect(wheelIntent({ ctrlKey: false, metaKey: true })).toBe('zoom');
  });
});
