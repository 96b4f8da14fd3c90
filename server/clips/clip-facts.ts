import type { ClipManifest } from '../media/manifest';
import type { ClipRow } from './clips-repository';

/** The clip row's copies of media facts: what lists and queries need, no more. */
export type ClipFacts = Pick<
  ClipRow,
  'fps' | 'width' | 'height' | 'frame_count' | 'duration_s' | 'rotation' | 'codec' | 'thumb_count' | 'thumb_every'
>;

/**
 * The row's media facts, derived from the clip's manifest (the one source): the plan while frames
 * are extracted (the probe's frame count), the extraction's figures once complete.
 */
export function clipFacts(manifest: ClipManifest): ClipFacts {
  return {
    fps: manifest.fps,
    width: manifest.width,
    height: manifest.height,
    frame_count: manifest.frameCount,
    duration_s: manifest.durationS,
    rotation: manifest.rotationApplied,
    codec: manifest.source?.codec ?? null,
    thumb_count: manifest.thumbCount,
    thumb_every: manifest.thumbEvery,
  };
}
