import { EMPTY } from 'rxjs';
import type { Assessment, Clip, FrameManifest } from '../../../contracts/api';
import { FrameCache } from './frame-cache';
import type { ReviewStore } from './review-store';

/** Frames of the test clip for specs: 20 frames of 1280 × 720 at 60 fps. */
export const TEST_MANIFEST: FrameManifest = {
  version: 1,
  frameCount: 20,
  width: 1280,
  height: 720,
  fps: 60,
  durationS: 20 / 60,
  rotationApplied: 0,
  timestampsMs: Array.from({ length: 20 }, (_, i) => (i * 1000) / 60),
  timestampsSource: 'computed',
  thumbEvery: 6,
  thumbCount: 4,
  thumbWidth: 160,
  thumbHeight: 90,
  quality: 4,
};

/** The test clip (id 7, left side nearest the camera, running left to right at 60 fps). */
export const TEST_CLIP = { id: 7, nearSide: 'left', direction: 'left_to_right', captureFps: null, fps: 60, effectiveFps: 60 } as Clip;

/** The test visit: treadmill at 3 m/s. */
export const TEST_ASSESSMENT = { surface: 'treadmill', speedMps: 3 } as Assessment;

/**
 * Opens the test clip in `store` for specs, with no marks yet and a frame cache that never
 * fetches or decodes a frame.
 */
export function openTestReview(store: ReviewStore): void {
  const cache = new FrameCache({
    frameCount: TEST_MANIFEST.frameCount,
    width: TEST_MANIFEST.width,
    height: TEST_MANIFEST.height,
    fetch: () => EMPTY,
    decode: () => Promise.reject(new Error('unused')),
  });
  store.open(
    { clip: TEST_CLIP, assessment: TEST_ASSESSMENT, manifest: TEST_MANIFEST },
    { clipId: TEST_CLIP.id, revision: 0, landmarks: [], events: [], scale: null, updatedAt: null, updatedByName: null },
    cache,
  );
}
