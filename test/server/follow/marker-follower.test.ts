/**
 * Marker following on synthetic runner clips. Every clip here is a synthetic fixture rendered by
 * scripts/demo-clip with all realism options on (textured wall, motion blur, compression noise,
 * lighting flicker, far markers passing behind the near limbs, camera shake); the reference is the
 * generator's ground truth of every marker on every frame, not the follower's own output.
 */
import { describe, expect, it } from 'vitest';
import { ALL_REALISM } from '../../../scripts/demo-clip/clip';
import { followMarkers, LOW_CONFIDENCE } from '../../../server/follow/marker-follower';
import {
  expectFarMarkersNeverConfidentWhileCovered,
  followedClipSuite,
  hiddenFarFrames,
  memoryReader,
  nearAngleRmse,
  NEAR_MARKERS,
  pointErrors,
  quantile,
} from './follow-fixture';

const START = 90;
// Synthetic fixture: 1280×720 at 120 fps, 1.5 s, every realism option on.
const s = followedClipSuite('realistic', { startFrame: START, clip: { fps: 120, seconds: 1.5, hipExtensionDeg: 10 } });

describe('following six near-side markers over a realistic synthetic clip (1280 wide, 120 fps)', () => {
  it('median error ≤ 2 px and 95th percentile ≤ 5 px against the generator truth, on every frame', async () => {
    const result = await s.followNear();
    const errors: number[] = [];
    for (const key of NEAR_MARKERS) {
      const points = result.points.get(key)!;
      // Every frame but the start frame has a point (the near markers are never covered).
      expect(points).toHaveLength(s.clip.frames.length - 1);
      errors.push(...pointErrors(s.clip.truth, 'near', key, points));
    }
    const median = quantile(errors, 0.5);
    const p95 = quantile(errors, 0.95);
    console.log(`synthetic fixture, all realism on: median ${median.toFixed(2)} px, p95 ${p95.toFixed(2)} px over ${errors.length} points`);
    expect(median).toBeLessThanOrEqual(2);
    expect(p95).toBeLessThanOrEqual(5);
  });

  it('hip, knee and foot angles from followed points: RMSE ≤ 2° against truth (below the smallest detectable differences of Dingenen et al. 2018 [pub])', async () => {
    const result = await s.followNear();
    const { frames, rmse } = nearAngleRmse(s.clip, result.points);
    expect(frames).toBe(s.clip.frames.length - 1);
    console.log(`synthetic fixture: angle RMSE ${JSON.stringify(rmse)}`);
    expect(rmse.thighDeg).toBeLessThanOrEqual(2);
    expect(rmse.kneeFlexionDeg).toBeLessThanOrEqual(2);
    expect(rmse.footDeg).toBeLessThanOrEqual(2);
  });

  it('points a person placed are never replaced, and following re-anchors on them', async () => {
    const placedKnee = new Map([
      [40, s.clip.truth.frames[40]!.landmarks.near.knee],
      [140, s.clip.truth.frames[140]!.landmarks.near.knee],
    ]);
    const result = await s.followNear({ placed: new Map([['knee', placedKnee]]) });
    const kneeFrames = result.points.get('knee')!.map((p) => p.frame);
    expect(kneeFrames).not.toContain(40);
    expect(kneeFrames).not.toContain(140);
    expect(kneeFrames).not.toContain(START);
    expect(kneeFrames).toHaveLength(s.clip.frames.length - 3);
  });

  it('following resumes from a correction: only frames inside the new range are given, near the truth', async () => {
    const correction = 120;
    const result = await followMarkers(s.cv, memoryReader(s.clip.frames), {
      startFrame: correction,
      from: correction,
      to: s.clip.frames.length - 1,
      markers: s.startOf('near', ['knee'], correction),
    });
    const points = result.points.get('knee')!;
    expect(points[0]!.frame).toBe(correction + 1);
    expect(points.at(-1)!.frame).toBe(s.clip.frames.length - 1);
    expect(Math.max(...pointErrors(s.clip.truth, 'near', 'knee', points))).toBeLessThan(5);
  });

  it('far-side markers lost behind the near leg for many frames: low confidence or none, never a confident wrong point', async () => {
    // The fixture really hides them, the knee for many frames in a row.
    expect(hiddenFarFrames(s.clip.truth, 'knee').length).toBeGreaterThanOrEqual(8);
    await expectFarMarkersNeverConfidentWhileCovered(s.cv, s.clip, 60);
  });

  it('bad requests are refused with a message naming the problem', async () => {
    const reader = memoryReader(s.clip.frames);
    const last = s.clip.frames.length - 1;
    await expect(followMarkers(s.cv, reader, { startFrame: 0, from: 0, to: last, markers: [] })).rejects.toThrow(/no starting points/);
    await expect(
      followMarkers(s.cv, reader, { startFrame: 0, from: 0, to: last + 10, markers: s.startOf('near', ['hip'], 0) }),
    ).rejects.toThrow(/outside the clip/);
    await expect(followMarkers(s.cv, reader, { startFrame: 50, from: 0, to: 20, markers: s.startOf('near', ['hip'], 50) })).rejects.toThrow(
      /start frame is outside the range/,
    );
  });
});

describe('a synthetic clip with no tape markers at all', () => {
  // Synthetic fixture without markers (texture, noise, flicker and shake on; 0.25 s).
  const b = followedClipSuite('bare', {
    startFrame: 0,
    clip: { fps: 120, seconds: 0.25, hipExtensionDeg: 10, tapeMarkers: false, realism: { ...ALL_REALISM, motionBlur: false } },
    timeoutMs: 300_000,
  });

  it('says the starting points are not on markers and gives only low-confidence points', async () => {
    const result = await b.followNear({ links: undefined });
    expect(result.notOnDot.sort()).toEqual([...NEAR_MARKERS].sort());
    for (const points of result.points.values()) for (const p of points) expect(p.confidence).toBeLessThan(LOW_CONFIDENCE);
    expect(result.lowConfidenceFrames).toHaveLength(b.clip.frames.length - 1);
  });
});
