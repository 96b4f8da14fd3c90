/**
 * Synthetic runner clips for marker-following tests and the benchmark: rendered by
 * scripts/demo-clip (a test fixture with known truth, not a real person or a data set), decoded to
 * grey frames with ffmpeg, and read from memory.
 */
import type { GroundTruth, RunnerClipOptions } from '../../../scripts/demo-clip/clip';
import { generateRunnerClip } from '../../../scripts/demo-clip/clip';
import type { LandmarkName } from '../../../scripts/demo-clip/ground-truth';
import { decodeGray } from '../../../server/follow/gray-decode';
import type { GrayFrame } from '../../../server/follow/gray-frame';
import type { FollowedPoint, FrameReader } from '../../../server/follow/marker-follower';

/** The six near-side tape markers a coach places. */
export const NEAR_MARKERS: LandmarkName[] = ['shoulder', 'hip', 'knee', 'ankle', 'heel', 'toe'];

/** A generated clip, its truth and its decoded grey frames. */
export interface DecodedClip {
  file: string;
  truth: GroundTruth;
  frames: GrayFrame[];
  /** Wall time ffmpeg took to decode the clip to grey frames, ms. */
  decodeMs: number;
}

/** Renders a clip with `generateRunnerClip` and decodes it to grey frames. */
export async function decodedRunnerClip(opts: RunnerClipOptions): Promise<DecodedClip> {
  const truth = await generateRunnerClip(opts);
  const started = performance.now();
  const frames = await decodeGray(['-i', opts.outFile], truth.width, truth.height);
  return { file: opts.outFile, truth, frames, decodeMs: performance.now() - started };
}

/** A frame reader over decoded frames in memory. */
export function memoryReader(frames: GrayFrame[]): FrameReader {
  const first = frames[0]!;
  return { frameCount: frames.length, width: first.width, height: first.height, read: async (i) => frames[i]! };
}

/** Pixel distance of each followed point from the ground truth of that side. */
export function pointErrors(truth: GroundTruth, side: 'near' | 'far', key: LandmarkName, points: FollowedPoint[]): number[] {
  return points.map((p) => {
    const t = truth.frames[p.frame]!.landmarks[side][key];
    return Math.hypot(p.x - t.x, p.y - t.y);
  });
}

/** The q-quantile (0–1) of a list of numbers (nearest rank). */
export function quantile(values: number[], q: number): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1))]!;
}
