/**
 * What marker following means on the review page, pure: frames with a followed point the coach
 * should check, whether a point was followed, and a progress event's words.
 */
import type { FrameLandmarks, LandmarkPoint } from '../../../contracts/annotations';
import { FOLLOW_LOW_CONFIDENCE } from '../../../contracts/annotations';
import type { ProcessingEvent } from '../../../contracts/processing';

/** Whether a point was placed by marker following (drawn apart from placed points). */
export function isFollowed(p: LandmarkPoint | undefined): boolean {
  return p?.origin === 'followed';
}

/** Frames (ascending, each once) with a followed point below {@link FOLLOW_LOW_CONFIDENCE}. */
export function lowConfidenceFrames(landmarks: readonly FrameLandmarks[]): number[] {
  const frames = new Set<number>();
  for (const row of landmarks) {
    for (const p of Object.values(row.points)) {
      if (isFollowed(p) && (p!.confidence ?? 0) < FOLLOW_LOW_CONFIDENCE) frames.add(row.frame);
    }
  }
  return [...frames].sort((a, b) => a - b);
}

/** The frames to follow: `from`–`to` inclusive. */
export interface FollowRange {
  from: number;
  to: number;
}

/**
 * Why following from `frame` over `range` cannot start, in words, or null when it can: the range
 * must lie in the clip, span two frames or more, and hold the frame with the placed points.
 */
export function followRangeProblem(range: FollowRange, frame: number, frameCount: number): string | null {
  const last = frameCount - 1;
  if (!Number.isInteger(range.from) || !Number.isInteger(range.to)) return 'Frame numbers are whole numbers.';
  if (range.from < 0 || range.to > last) return `The clip's frames are 0–${last}.`;
  if (range.from >= range.to) return 'Follow over at least two frames: the first frame comes before the last.';
  if (frame < range.from || frame > range.to)
    return `This frame (${frame}) is outside ${range.from}–${range.to}: follow from a frame inside the range.`;
  return null;
}

/**
 * Why "Follow markers from this frame" is not available yet (range problems aside), in words, or
 * null when it is (or while a follow runs: its status says what happens).
 */
export function followBlockedReason(s: { running: boolean; pointsHere: number; unsaved: boolean }): string | null {
  if (s.running) return null;
  if (s.pointsHere === 0) return 'Place markers on this frame first: following starts from the points you placed here.';
  if (s.unsaved) return 'Saving your marks… following can start once they are saved.';
  return null;
}

/** A follow's state in words: "Following markers… 40 of 120 frames", "Markers followed.", the reason it failed. */
export function followStatusText(e: Pick<ProcessingEvent, 'state' | 'progress' | 'error'>): string {
  switch (e.state) {
    case 'queued':
      return 'Following markers: waiting for a free worker…';
    case 'running':
      return e.progress ? `Following markers… ${e.progress.done} of ${e.progress.total} frames` : 'Following markers…';
    case 'ready':
      return 'Markers followed.';
    case 'failed':
      return `Following stopped: ${e.error ?? 'unknown reason'}`;
    case 'cancelled':
      return 'Following cancelled: nothing it followed was kept, the landmarks are as they were.';
  }
}
