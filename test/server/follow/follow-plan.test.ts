/** Planning a follow from saved landmarks and merging the followed points back, on hand-made rows. */
import { describe, expect, it } from 'vitest';
import type { FrameLandmarks } from '../../../src/contracts/annotations';
import { mergeFollowed, planFollow } from '../../../server/follow/follow-plan';

const size = { width: 1000, height: 500 };
const range = { startFrame: 10, from: 5, to: 20 };
const rows: FrameLandmarks[] = [
  { frame: 10, side: 'right', points: { hip: { x: 0.5, y: 0.4, origin: 'placed' }, knee: { x: 0.52, y: 0.6 } } },
  {
    frame: 14,
    side: 'right',
    points: { knee: { x: 0.53, y: 0.61, origin: 'placed' }, hip: { x: 0.5, y: 0.4, origin: 'followed', confidence: 0.9 } },
  },
  { frame: 16, side: 'right', points: { knee: { x: 0.54, y: 0.62, origin: 'followed', confidence: 0.8 } } },
  { frame: 30, side: 'right', points: { knee: { x: 0.55, y: 0.63, origin: 'followed', confidence: 0.8 } } },
];

describe('planFollow', () => {
  it('starts from every landmark on the start frame, in pixels, with placed points of the range as anchors and rigid links', () => {
    const plan = planFollow(rows, range, size);
    expect(plan.markers).toEqual([
      { key: 'right hip', start: { x: 500, y: 200 } },
      { key: 'right knee', start: { x: 520, y: 300 } },
    ]);
    expect([...plan.placed.keys()]).toEqual(['right knee']);
    expect(plan.placed.get('right knee')!.get(14)).toEqual({ x: 530, y: 305 });
    expect(plan.links).toEqual([['right hip', 'right knee']]);
  });

  it('has no markers when nothing is on the start frame', () => {
    expect(planFollow(rows, { startFrame: 12, from: 5, to: 20 }, size).markers).toEqual([]);
  });
});

describe('mergeFollowed', () => {
  it('never replaces placed points, writes followed points with confidence, and drops stale followed points in the range', () => {
    const merged = mergeFollowed(
      rows,
      {
        points: new Map([
          [
            'right knee',
            [
              { frame: 14, x: 600, y: 400, confidence: 0.99 },
              { frame: 15, x: 535, y: 306, confidence: 0.7 },
            ],
          ],
          ['right hip', [{ frame: 15, x: 1200, y: 200, confidence: 0.6 }]],
        ]),
      },
      range,
      size,
    );
    const at = (frame: number) => merged.find((r) => r.frame === frame)?.points;
    expect(at(10)).toEqual(rows[0]!.points);
    // Frame 14: the placed knee stays; the old followed hip was not found again and goes.
    expect(at(14)).toEqual({ knee: { x: 0.53, y: 0.61, origin: 'placed' } });
    expect(at(15)).toEqual({
      knee: { x: 0.535, y: 0.612, origin: 'followed', confidence: 0.7 },
      hip: { x: 1, y: 0.4, origin: 'followed', confidence: 0.6 },
    });
    // Frame 16's stale followed knee is gone (its row with it); frame 30 is outside the range and stays.
    expect(at(16)).toBeUndefined();
    expect(at(30)).toEqual(rows[3]!.points);
  });
});
