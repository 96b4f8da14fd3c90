import type { FrameLandmarks } from '../../../contracts/annotations';
import { HitCandidate, hitTest, hitTolerancePx, landmarkCandidates } from './hit-test';

describe('hitTest', () => {
  const c: HitCandidate<string>[] = [
    { key: 'a', x: 100, y: 100 },
    { key: 'b', x: 130, y: 100 },
  ];

  it('finds the nearest marker within the tolerance', () => {
    expect(hitTest(c, { x: 104, y: 102 }, 10)).toBe('a');
    expect(hitTest(c, { x: 124, y: 100 }, 10)).toBe('b');
  });

  it('misses outside the tolerance', () => {
    expect(hitTest(c, { x: 115, y: 100 }, 10)).toBeNull();
    expect(hitTest(c, { x: 112, y: 100 }, hitTolerancePx('touch'))).toBe('a');
    expect(hitTest(c, { x: 115, y: 100 }, hitTolerancePx('touch'))).toBe('b');
  });

  it('prefers the preferred key among stacked markers, else the one drawn last', () => {
    const stacked: HitCandidate<string>[] = [
      { key: 'left', x: 50, y: 50 },
      { key: 'right', x: 50, y: 50 },
    ];
    expect(hitTest(stacked, { x: 51, y: 50 }, 10)).toBe('right');
    expect(hitTest(stacked, { x: 51, y: 50 }, 10, (k) => k === 'left')).toBe('left');
  });

  it('uses wider tolerances for fingers than for pens and mice', () => {
    expect(hitTolerancePx('touch')).toBeGreaterThan(hitTolerancePx('pen'));
    expect(hitTolerancePx('pen')).toBeGreaterThan(hitTolerancePx('mouse'));
  });
});

describe('landmarkCandidates', () => {
  it('places stored fractions on screen through the view transform', () => {
    const rows: FrameLandmarks[] = [{ frame: 0, side: 'left', points: { hip: { x: 0.5, y: 0.25 }, toe: { x: 1, y: 1 } } }];
    const out = landmarkCandidates(rows, { width: 200, height: 100 }, { scale: 2, tx: 10, ty: 20 });
    expect(out).toEqual([
      { key: { side: 'left', landmark: 'hip' }, x: 210, y: 70 },
      { key: { side: 'left', landmark: 'toe' }, x: 410, y: 220 },
    ]);
  });
});
