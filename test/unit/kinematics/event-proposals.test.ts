/**
 * Proposed gait events from landmarks over frames: hand-made landmark series that follow the
 * published rules exactly (coordinate method, Zeni et al. 2008 [pub]; heel vertical minimum and
 * peak knee extension, Fellin et al. 2010 [pub] — as quoted in REFERENCES.md), and the synthetic
 * runner of scripts/demo-clip. That runner is a synthetic fixture with known truth (not a real
 * person or a published dataset): its ground truth says which frames are initial contact (first
 * frame on the belt) and toe-off (last frame on the belt).
 */
import { describe, expect, it } from 'vitest';
import type { FrameLandmarks } from '../../../src/contracts/annotations';
import type { Direction, Side } from '../../../src/contracts/assessment';
import { minProposalFrames, proposeGaitEvents } from '../../../src/kinematics/event-proposals';
import { buildGroundTruth } from '../../../scripts/demo-clip/ground-truth';

/** Hand-made clip at 10 fps on a 1000 × 1000 frame, hip fixed at the centre; values are plane px (y up). */
const HEEL_REL = [0, 60, 120, 150, 110, 60, 10, -40, -90, -60, 0, 60]; // largest at frame 3 → contact window
const HEEL_UP = [100, 80, 60, 40, 20, 12, 10, 10, 30, 60, 90, 100]; // from frame 3 down to 10 px at frame 6 (frame 7 equal) → strike 6
const TOE_REL = [150, 180, 200, 160, 130, 80, 30, -20, -70, -90, -50, 20]; // rearmost at frame 9 → toe-off 9 (no knee marked)

function handMade(direction: Direction, frames = HEEL_REL.length, side: Side = 'right'): FrameLandmarks[] {
  const x = (px: number) => (direction === 'left_to_right' ? 0.5 + px / 1000 : 0.5 - px / 1000);
  return Array.from({ length: frames }, (_, f) => ({
    frame: f,
    side,
    points: {
      hip: { x: 0.5, y: 0.5 },
      heel: { x: x(HEEL_REL[f]!), y: 0.9 - HEEL_UP[f]! / 1000 },
      toe: { x: x(TOE_REL[f]!), y: 0.9 },
    },
  }));
}
const plane = (direction: Direction) => ({ frameSize: { width: 1000, height: 1000 }, direction });

describe('proposeGaitEvents on hand-made landmarks', () => {
  it('contact at the heel minimum after the heel’s foremost frame, toe-off at the toe’s rearmost frame without a knee', () => {
    // 10 fps: extremum window ±2 frames, 8 frames in a row needed; 12 frames given.
    const p = proposeGaitEvents(handMade('left_to_right'), plane('left_to_right'), 10, 12);
    expect(p.events).toEqual([
      { frame: 6, side: 'right', kind: 'initial_contact', rule: 'heel_minimum' },
      { frame: 9, side: 'right', kind: 'toe_off', rule: 'coordinate' },
    ]);
    expect(p.usableRun).toEqual({ left: 0, right: 12 });
  });

  it('the same events for a runner going right to left (mirrored image)', () => {
    const p = proposeGaitEvents(handMade('right_to_left'), plane('right_to_left'), 10, 12);
    expect(p.events.map((e) => [e.frame, e.kind])).toEqual([
      [6, 'initial_contact'],
      [9, 'toe_off'],
    ]);
  });

  it('no proposals for a side with fewer frames in a row than one slow stride (0.8 s)', () => {
    expect(minProposalFrames(10)).toBe(8);
    expect(minProposalFrames(120)).toBe(96);
    const p = proposeGaitEvents(handMade('left_to_right', 7), plane('left_to_right'), 10, 12);
    expect(p.events).toEqual([]);
    expect(p.usableRun.right).toBe(7);
  });

  it('a side without its own hip uses the other side’s hip on that frame', () => {
    const right = handMade('left_to_right').map((l) => ({ ...l, points: { heel: l.points.heel, toe: l.points.toe } }));
    const leftHips = right.map((l) => ({ frame: l.frame, side: 'left' as const, points: { hip: { x: 0.5, y: 0.5 } } }));
    const p = proposeGaitEvents([...right, ...leftHips], plane('left_to_right'), 10, 12);
    expect(p.events.map((e) => e.frame)).toEqual([6, 9]);
  });
});

describe('proposeGaitEvents on the synthetic runner (synthetic fixture, ground truth from scripts/demo-clip)', () => {
  for (const hipExtensionDeg of [4, 11])
    for (const facing of ['right', 'left'] as const)
      it(`120 fps, ${hipExtensionDeg}° hip extension, facing ${facing}: ≥ 95 % of true events have a proposal within 1 frame, none far from truth`, () => {
        const gt = buildGroundTruth({ fps: 120, width: 1280, height: 720, seconds: 3, hipExtensionDeg, facing });
        const near = gt.nearSide;
        const far: Side = near === 'right' ? 'left' : 'right';
        const landmarks: FrameLandmarks[] = gt.frames.flatMap((f) => [
          { frame: f.index, side: near, points: f.landmarksNormalised.near },
          { frame: f.index, side: far, points: f.landmarksNormalised.far },
        ]);
        const direction: Direction = facing === 'right' ? 'left_to_right' : 'right_to_left';
        const { events } = proposeGaitEvents(landmarks, { frameSize: { width: 1280, height: 720 }, direction }, 120, gt.frameCount);
        let total = 0;
        let within = 0;
        for (const [key, side] of [
          ['near', near],
          ['far', far],
        ] as const)
          for (const [kind, truth] of [
            ['initial_contact', gt.events[key].initialContact],
            ['toe_off', gt.events[key].toeOff],
          ] as const) {
            const proposed = events.filter((e) => e.side === side && e.kind === kind).map((e) => e.frame);
            for (const t of truth) {
              total++;
              if (proposed.some((p) => Math.abs(p - t) <= 1)) within++;
            }
            // Every proposal sits at a true event (within 1 frame): nothing invented between events.
            for (const p of proposed) expect(truth.some((t) => Math.abs(p - t) <= 1)).toBe(true);
          }
        expect(total).toBeGreaterThanOrEqual(16);
        expect(within / total).toBeGreaterThanOrEqual(0.95);
      });
});
