import type { FrameLandmarks, GaitEventMark, ScaleBar } from '../../src/contracts/annotations';
import type { Side } from '../../src/contracts/assessment';
import type { GroundTruth } from './ground-truth';

/**
 * Marks for a demo clip as a careful coach would leave them: Initial contact and Toe-off of both
 * sides on every step, and all six landmarks of both sides on each of those event frames — taken
 * from the generator's ground truth, so the demo's measures match the clip (invented data, demo
 * only). Landmarks between events are left for the coach to add.
 */
export function demoMarks(truth: GroundTruth): { baseRevision: number; landmarks: FrameLandmarks[]; events: GaitEventMark[]; scale: ScaleBar | null } {
  const near: Side = truth.nearSide;
  const far: Side = near === 'right' ? 'left' : 'right';
  const events: GaitEventMark[] = [
    ...truth.events.near.initialContact.map((frame) => ({ frame, side: near, kind: 'initial_contact' as const })),
    ...truth.events.near.toeOff.map((frame) => ({ frame, side: near, kind: 'toe_off' as const })),
    ...truth.events.far.initialContact.map((frame) => ({ frame, side: far, kind: 'initial_contact' as const })),
    ...truth.events.far.toeOff.map((frame) => ({ frame, side: far, kind: 'toe_off' as const })),
  ].sort((a, b) => a.frame - b.frame);
  const frames = [...new Set(events.map((e) => e.frame))].sort((a, b) => a - b);
  const landmarks = frames.flatMap((frame) => {
    const f = truth.frames[frame]!;
    return [
      { frame, side: near, points: f.landmarksNormalised.near, source: 'manual' as const },
      { frame, side: far, points: f.landmarksNormalised.far, source: 'manual' as const },
    ];
  });
  return { baseRevision: 0, landmarks, events, scale: null };
}
