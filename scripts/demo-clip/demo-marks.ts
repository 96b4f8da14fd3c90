import type { FrameLandmarks, GaitEventMark, ScaleBar } from '../../src/contracts/annotations';
import type { Side } from '../../src/contracts/assessment';
import type { GroundTruth } from './ground-truth';

/** A `PUT /api/clips/:id/annotations` body at revision 0. */
export interface TruthMarks {
  baseRevision: number;
  landmarks: FrameLandmarks[];
  events: GaitEventMark[];
  scale: ScaleBar | null;
}

/**
 * Marks taken from the generator's ground truth, as a careful coach would place them: Initial
 * contact and Toe-off of both sides on every step, and all six landmarks of both sides on every
 * frame (`'all'`, what tests compare against) or only on the event frames (`'events'`, what the
 * demo leaves for a coach to continue). Invented motion, not a data set.
 */
export function marksFromTruth(truth: GroundTruth, landmarkFrames: 'all' | 'events'): TruthMarks {
  const near: Side = truth.nearSide;
  const far: Side = near === 'right' ? 'left' : 'right';
  const events: GaitEventMark[] = [
    ...truth.events.near.initialContact.map((frame) => ({ frame, side: near, kind: 'initial_contact' as const })),
    ...truth.events.near.toeOff.map((frame) => ({ frame, side: near, kind: 'toe_off' as const })),
    ...truth.events.far.initialContact.map((frame) => ({ frame, side: far, kind: 'initial_contact' as const })),
    ...truth.events.far.toeOff.map((frame) => ({ frame, side: far, kind: 'toe_off' as const })),
  ].sort((a, b) => a.frame - b.frame);
  const frames =
    landmarkFrames === 'all' ? truth.frames.map((f) => f.index) : [...new Set(events.map((e) => e.frame))].sort((a, b) => a - b);
  const landmarks = frames.flatMap((frame) => {
    const f = truth.frames[frame]!;
    return [
      { frame, side: near, points: f.landmarksNormalised.near },
      { frame, side: far, points: f.landmarksNormalised.far },
    ];
  });
  return { baseRevision: 0, landmarks, events, scale: null };
}

/** The demo clips' marks: events of both sides, landmarks on the event frames. */
export const demoMarks = (truth: GroundTruth): TruthMarks => marksFromTruth(truth, 'events');
