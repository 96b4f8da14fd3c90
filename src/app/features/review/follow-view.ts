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
      return 'Following was cancelled.';
  }
}
