/**
 * Synthetic runner clips for marker-following tests and the benchmark: rendered by
 * scripts/demo-clip (a test fixture with known truth, not a real person or a data set), decoded to
 * grey frames with ffmpeg, and read from memory.
 */
import type { GroundTruth, RunnerClipOptions } from '../../../scripts/demo-clip/clip';
import { generateRunnerClip } from '../../../scripts/demo-clip/clip';
import { ALL_REALISM } from '../../../scripts/demo-clip/clip';
import { anglesFromPixels, type LandmarkName, type SideLandmarkSet } from '../../../scripts/demo-clip/ground-truth';
import path from 'node:path';
import { afterAll, beforeAll, expect } from 'vitest';
import { FAR_MARKERS } from '../../../scripts/demo-clip/realism';
import { decodeGray } from '../../../server/follow/gray-decode';
import type { GrayFrame } from '../../../server/follow/gray-frame';
import { followMarkers, LOW_CONFIDENCE, type FollowedPoint, type FrameReader } from '../../../server/follow/marker-follower';
import { loadOpenCv, type OpenCv } from '../../../server/follow/opencv';
import { RIGID_LINKS } from '../../../server/follow/rigid-links';
import { tempDir } from '../media/fixtures';

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

/** What a test file following markers on one synthetic clip reads once its `beforeAll` has run. */
export interface FollowedClipSuite {
  cv: OpenCv;
  clip: DecodedClip;
  /** The truth positions of `keys` on `side` at `frame` (the suite's start frame by default), as starting points. */
  startOf(side: 'near' | 'far', keys: readonly LandmarkName[], frame?: number): { key: LandmarkName; start: { x: number; y: number } }[];
  /** Follows the six near markers over the whole clip from the start frame (rigid links on), with `extra` options. */
  followNear(extra?: Partial<Parameters<typeof followMarkers>[2]>): ReturnType<typeof followMarkers>;
}

/**
 * Registers `beforeAll`/`afterAll` that render a 1280×720 synthetic runner clip (facing right,
 * ultrafast preset, every realism option on unless `clip` says otherwise), decode it and load
 * OpenCV; the answer is filled in by the time the tests run.
 */
export function followedClipSuite(
  name: string,
  o: { startFrame: number; clip: Omit<RunnerClipOptions, 'outFile' | 'width' | 'height' | 'facing'>; timeoutMs?: number },
): FollowedClipSuite {
  let cleanup = async () => {};
  const suite: FollowedClipSuite = {
    cv: undefined as unknown as OpenCv,
    clip: undefined as unknown as DecodedClip,
    startOf: (side, keys, frame = o.startFrame) =>
      keys.map((key) => ({ key, start: suite.clip.truth.frames[frame]!.landmarks[side][key] })),
    followNear: (extra = {}) =>
      followMarkers(suite.cv, memoryReader(suite.clip.frames), {
        startFrame: o.startFrame,
        from: 0,
        to: suite.clip.frames.length - 1,
        markers: suite.startOf('near', NEAR_MARKERS),
        links: RIGID_LINKS,
        ...extra,
      }),
  };
  beforeAll(async () => {
    const tmp = await tempDir(`follow-${name}`);
    cleanup = tmp.cleanup;
    suite.cv = await loadOpenCv();
    suite.clip = await decodedRunnerClip({
      outFile: path.join(tmp.dir, `${name}.mp4`),
      width: 1280,
      height: 720,
      facing: 'right',
      preset: 'ultrafast',
      realism: ALL_REALISM,
      ...o.clip,
    });
  }, o.timeoutMs ?? 600_000);
  afterAll(() => cleanup());
  return suite;
}

/**
 * Root-mean-square error of the near thigh, knee-flexion and foot angles computed from followed
 * points (frames where all six near markers were followed) against the generator's truth angles.
 */
export function nearAngleRmse(
  clip: DecodedClip,
  points: ReadonlyMap<string, FollowedPoint[]>,
): { frames: number; rmse: { thighDeg: number; kneeFlexionDeg: number; footDeg: number } } {
  const byFrame = new Map<number, Partial<SideLandmarkSet>>();
  for (const key of NEAR_MARKERS)
    for (const p of points.get(key)!) byFrame.set(p.frame, { ...byFrame.get(p.frame), [key]: { x: p.x, y: p.y } });
  const sq = { thighDeg: 0, kneeFlexionDeg: 0, footDeg: 0 };
  let frames = 0;
  for (const [frame, set] of byFrame) {
    if (Object.keys(set).length < NEAR_MARKERS.length) continue;
    const got = anglesFromPixels(set as SideLandmarkSet, clip.truth.facing);
    const want = clip.truth.angles[frame]!.near;
    for (const k of Object.keys(sq) as Array<keyof typeof sq>) sq[k] += (got[k] - want[k]) ** 2;
    frames++;
  }
  const rmse = {
    thighDeg: Math.sqrt(sq.thighDeg / frames),
    kneeFlexionDeg: Math.sqrt(sq.kneeFlexionDeg / frames),
    footDeg: Math.sqrt(sq.footDeg / frames),
  };
  return { frames, rmse };
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

/** Frames where the generator says a far-side marker's centre is covered by the near leg, arm or trunk. */
export function hiddenFarFrames(truth: GroundTruth, key: string): number[] {
  return truth.frames.filter((f) => (f.hiddenFar as string[]).includes(key)).map((f) => f.index);
}

/**
 * Follows near and far markers together (as a coach does; keys 'near knee', 'far knee', …) from
 * the first frame at or after `after` where no far marker is covered, and checks against the
 * generator truth: every confident far point within 5 px of its marker, no confident far point on
 * a frame where its marker is covered (those frames flagged low), near markers p95 < 5 px.
 */
export async function expectFarMarkersNeverConfidentWhileCovered(cv: OpenCv, clip: DecodedClip, after: number): Promise<void> {
  const { truth } = clip;
  const visibleStart = truth.frames.findIndex((f, i) => i >= after && f.hiddenFar.length === 0);
  const sides = ['near', 'far'] as const;
  const keysOf = (side: (typeof sides)[number]) => (side === 'near' ? NEAR_MARKERS : FAR_MARKERS);
  const result = await followMarkers(cv, memoryReader(clip.frames), {
    startFrame: visibleStart,
    from: 0,
    to: clip.frames.length - 1,
    markers: sides.flatMap((side) =>
      keysOf(side).map((key) => ({ key: `${side} ${key}`, start: truth.frames[visibleStart]!.landmarks[side][key] })),
    ),
    links: sides.flatMap((side) => RIGID_LINKS.map(([a, b]) => [`${side} ${a}`, `${side} ${b}`] as const)),
  });
  for (const key of FAR_MARKERS) {
    const confident: FollowedPoint[] = result.points.get(`far ${key}`)!.filter((p) => p.confidence >= LOW_CONFIDENCE);
    expect(Math.max(0, ...pointErrors(truth, 'far', key, confident)), `${key}: confident points stay on the marker`).toBeLessThanOrEqual(5);
    const hidden = new Set(hiddenFarFrames(truth, key));
    expect(
      confident.filter((p) => hidden.has(p.frame)),
      `${key}: no confident point while covered`,
    ).toEqual([]);
    for (const f of hidden) if (f !== visibleStart) expect(result.lowConfidenceFrames).toContain(f);
  }
  // The near markers stay right meanwhile.
  for (const key of NEAR_MARKERS)
    expect(quantile(pointErrors(truth, 'near', key, result.points.get(`near ${key}`)!), 0.95)).toBeLessThan(5);
}
