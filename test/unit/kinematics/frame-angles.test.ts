/**
 * FrameStore (landmarks by frame and side, angles once per frame) and angleSamples (the chart's
 * per-frame angle series), called directly. Expected angles are recomputed in the test with atan2
 * from the metre coordinates of REFERENCES.md's worked example ([calc]) or of poses chosen here.
 */
import { describe, expect, it } from 'vitest';
import type { FrameLandmarks } from '../../../src/contracts/annotations';
import type { FrameClock } from '../../../src/kinematics/events';
import { angleSamples, FrameStore } from '../../../src/kinematics/frame-angles';
import type { PlaneFrame } from '../../../src/kinematics/geometry';
import { deg, H, IC_POSE, landmarksAt, TO_POSE, W, type MetrePose } from './helpers';

const PLANE: PlaneFrame = { frameSize: { width: W, height: H }, direction: 'left_to_right' };
/** 240 fps: frame f at f / 240 s. */
const CLOCK_240: FrameClock = { timeMs: (f) => (f / 240) * 1000, source: 'fps', fps: 240, fallbackReason: null };

// Independent angles of the worked example (metres, y up, +x running direction).
const thighOf = (p: MetrePose) => deg(Math.atan2(p.knee!.x - p.hip!.x, p.hip!.y - p.knee!.y));
const shankOf = (p: MetrePose) => deg(Math.atan2(p.ankle!.x - p.knee!.x, p.knee!.y - p.ankle!.y));
const trunkOf = (p: MetrePose) => deg(Math.atan2(p.shoulder!.x - p.hip!.x, p.shoulder!.y - p.hip!.y));
const footOf = (p: MetrePose) => deg(Math.atan2(p.toe!.y - p.heel!.y, p.toe!.x - p.heel!.x));

describe('FrameStore: which landmark entries count', () => {
  it('keeps whole, non-negative frames of the left or right side; frames ascending without repeats; lastFrame is the largest', () => {
    const bad = [
      { ...landmarksAt(3, 'right', IC_POSE, 'left_to_right'), frame: 2.5 },
      landmarksAt(-1, 'right', IC_POSE, 'left_to_right'),
      { ...landmarksAt(9, 'right', IC_POSE, 'left_to_right'), side: 'middle' } as unknown as FrameLandmarks,
    ];
    const store = new FrameStore(
      [
        landmarksAt(7, 'left', IC_POSE, 'left_to_right'),
        landmarksAt(0, 'right', IC_POSE, 'left_to_right'),
        landmarksAt(7, 'right', IC_POSE, 'left_to_right'),
        ...bad,
        landmarksAt(3, 'left', IC_POSE, 'left_to_right'),
        landmarksAt(3, 'right', IC_POSE, 'left_to_right'),
      ],
      PLANE,
    );
    expect(store.frames).toEqual([0, 3, 7]);
    expect(store.lastFrame).toBe(7);
    expect(store.angles(0, 'left')).toBeUndefined();
    expect(new FrameStore([landmarksAt(0, 'left', IC_POSE, 'left_to_right')], PLANE).angles(0, 'right')).toBeUndefined();
    expect(store.angles(0, 'right')?.thighDeg).toBeCloseTo(thighOf(IC_POSE), 9);
  });

  it('an empty store has no frames and lastFrame −1; frames are sorted as numbers (10 after 9)', () => {
    const empty = new FrameStore([], PLANE);
    expect(empty.frames).toEqual([]);
    expect(empty.lastFrame).toBe(-1);
    const s = new FrameStore(
      [10, 9, 100, 2].map((f) => landmarksAt(f, 'left', IC_POSE, 'left_to_right')),
      PLANE,
    );
    expect(s.frames).toEqual([2, 9, 10, 100]);
    expect(s.lastFrame).toBe(100);
  });

  it('the last entry for a frame and side wins', () => {
    const s = new FrameStore([landmarksAt(4, 'right', IC_POSE, 'left_to_right'), landmarksAt(4, 'right', TO_POSE, 'left_to_right')], PLANE);
    // TO_POSE thigh: atan2(−0.17, 0.41) = −22.521° (REFERENCES.md worked example).
    expect(s.angles(4, 'right')?.thighDeg).toBeCloseTo(thighOf(TO_POSE), 9);
    expect(s.angles(4, 'right')?.thighDeg).toBeCloseTo(-22.521, 3);
  });
});

describe('FrameStore: angles, the trunk fallback, poses and hips', () => {
  it('[calc] a side without shoulder and hip takes the trunk from the other side, flagged; hip relative to trunk = thigh + trunk', () => {
    const { shoulder: _s, hip: _h, ...noTrunk } = IC_POSE;
    const s = new FrameStore(
      [landmarksAt(5, 'left', { ...noTrunk, hip: IC_POSE.hip }, 'left_to_right'), landmarksAt(5, 'right', IC_POSE, 'left_to_right')],
      PLANE,
    );
    const right = s.angles(5, 'right')!;
    expect(right.trunkDeg).toBeCloseTo(trunkOf(IC_POSE), 9); // atan2(0.1, 0.5) = 11.310°
    expect(right.trunkFromFallback).toBeUndefined();
    const left = s.angles(5, 'left')!;
    expect(left.trunkDeg).toBeCloseTo(11.31, 3);
    expect(left.trunkFromFallback).toBe(true);
    expect(left.hipRelTrunkDeg).toBeCloseTo(thighOf(IC_POSE) + trunkOf(IC_POSE), 9);
    // Neither side has a shoulder: no trunk on either.
    const none = new FrameStore(
      [landmarksAt(5, 'left', noTrunk, 'left_to_right'), landmarksAt(5, 'right', { ...noTrunk, hip: IC_POSE.hip }, 'left_to_right')],
      PLANE,
    );
    expect(none.angles(5, 'left')?.trunkDeg).toBeUndefined();
    expect(none.angles(5, 'right')?.trunkDeg).toBeUndefined();
  });

  it('pose() is made once per frame and side and reused; undefined where the side is not marked', () => {
    const s = new FrameStore([landmarksAt(2, 'right', IC_POSE, 'left_to_right')], PLANE);
    const p = s.pose(2, 'right');
    expect(p).toBeDefined();
    expect(s.pose(2, 'right')).toBe(p);
    expect(s.pose(2, 'left')).toBeUndefined();
    expect(s.pose(3, 'right')).toBeUndefined();
    // Plane pixels, y up: hip at image (640, 680 − 0.9·400 = 320) → (640, −320).
    expect(p!.hip!.x).toBeCloseTo(640, 9);
    expect(p!.hip!.y).toBeCloseTo(-320, 9);
  });

  it('hip() in plane pixels; undefined for an unmarked side, an entry without points or a hip that is not a finite point', () => {
    const noPoints = { frame: 1, side: 'left' } as unknown as FrameLandmarks;
    const nanHip: FrameLandmarks = { frame: 1, side: 'right', points: { hip: { x: Number.NaN, y: 0.5 } } };
    const s = new FrameStore([landmarksAt(0, 'right', IC_POSE, 'left_to_right'), noPoints, nanHip], PLANE);
    expect(s.hip(0, 'right')).toEqual({ x: 640, y: -320 });
    expect(s.hip(0, 'left')).toBeUndefined();
    expect(s.hip(1, 'left')).toBeUndefined();
    expect(s.hip(1, 'right')).toBeUndefined();
    expect(s.pose(1, 'left')).toEqual({});
    expect(s.angles(1, 'left')).toEqual({});
  });
});

describe('angleSamples: the per-frame angle series of the chart', () => {
  it('[calc] worked example at initial contact: every angle of each side, left before right, time = frame ÷ 240 fps', () => {
    const s = new FrameStore(
      [landmarksAt(12, 'right', IC_POSE, 'left_to_right'), landmarksAt(12, 'left', IC_POSE, 'left_to_right')],
      PLANE,
    );
    const samples = angleSamples(s, CLOCK_240);
    const thigh = thighOf(IC_POSE); // atan2(0.2, 0.4) = 26.565°
    const shank = shankOf(IC_POSE); // atan2(0.1, 0.4) = 14.036°
    const trunk = trunkOf(IC_POSE);
    const expected = (side: 'left' | 'right') => ({
      frame: 12,
      timeMs: 50,
      side,
      thighDeg: expect.closeTo(thigh, 9),
      kneeFlexionDeg: expect.closeTo(thigh - shank, 9),
      shankDeg: expect.closeTo(shank, 9),
      trunkDeg: expect.closeTo(trunk, 9),
      footDeg: expect.closeTo(footOf(IC_POSE), 9),
      hipRelTrunkDeg: expect.closeTo(thigh + trunk, 9),
    });
    expect(samples).toStrictEqual([expected('left'), expected('right')]);
    expect(samples[0]!.kneeFlexionDeg).toBeCloseTo(12.529, 3); // REFERENCES.md
    expect(samples[0]!.footDeg).toBeCloseTo(14.744, 3);
  });

  it('a sample holds only the angles its landmarks allow; one angle alone is enough; a side with no angle gives no sample', () => {
    const only = (frame: number, pose: MetrePose) => landmarksAt(frame, 'right', pose, 'left_to_right');
    const store = new FrameStore(
      [
        only(1, { hip: IC_POSE.hip, knee: IC_POSE.knee }), // thigh only
        only(2, { knee: IC_POSE.knee, ankle: IC_POSE.ankle }), // shank only
        only(3, { hip: IC_POSE.hip, shoulder: IC_POSE.shoulder }), // trunk only
        only(4, { heel: IC_POSE.heel, toe: IC_POSE.toe }), // foot only
        only(5, { hip: IC_POSE.hip }), // no angle
        only(6, { hip: IC_POSE.hip, knee: IC_POSE.knee, shoulder: IC_POSE.shoulder }), // thigh, trunk, hip rel. trunk
      ],
      PLANE,
    );
    const samples = angleSamples(store, CLOCK_240);
    expect(samples.map((x) => x.frame)).toEqual([1, 2, 3, 4, 6]);
    const t = (f: number) => (f / 240) * 1000;
    expect(samples[0]).toStrictEqual({ frame: 1, timeMs: t(1), side: 'right', thighDeg: expect.closeTo(thighOf(IC_POSE), 9) });
    expect(samples[1]).toStrictEqual({ frame: 2, timeMs: t(2), side: 'right', shankDeg: expect.closeTo(shankOf(IC_POSE), 9) });
    expect(samples[2]).toStrictEqual({ frame: 3, timeMs: t(3), side: 'right', trunkDeg: expect.closeTo(trunkOf(IC_POSE), 9) });
    expect(samples[3]).toStrictEqual({ frame: 4, timeMs: t(4), side: 'right', footDeg: expect.closeTo(footOf(IC_POSE), 9) });
    expect(samples[4]).toStrictEqual({
      frame: 6,
      timeMs: t(6),
      side: 'right',
      thighDeg: expect.closeTo(thighOf(IC_POSE), 9),
      trunkDeg: expect.closeTo(trunkOf(IC_POSE), 9),
      hipRelTrunkDeg: expect.closeTo(thighOf(IC_POSE) + trunkOf(IC_POSE), 9),
    });
  });

  it('a frame without a usable time reads 0 ms rather than NaN', () => {
    const noTime: FrameClock = { timeMs: () => Number.NaN, source: 'fps', fps: Number.NaN, fallbackReason: null };
    const samples = angleSamples(new FrameStore([landmarksAt(30, 'left', IC_POSE, 'left_to_right')], PLANE), noTime);
    expect(samples).toHaveLength(1);
    expect(samples[0]!.timeMs).toBe(0);
  });
});
