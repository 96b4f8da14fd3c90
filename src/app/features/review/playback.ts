/**
 * Time on the clip and playback at a fraction of real time. Pure functions.
 *
 * Times are real (capture) time from the clip's first frame: the manifest's presentation
 * timestamps, or — for a slow-motion file with a capture rate set — frame ÷ capture rate (a 240 fps
 * capture stored at 30 fps plays 8× slower than it happened). The server's measures use the same
 * rule, so the live figures and the stored snapshot agree.
 */

/** Playback speeds offered, as fractions of real time. */
export const PLAYBACK_RATES = [0.125, 0.25, 0.5, 1] as const;
export type PlaybackRate = (typeof PLAYBACK_RATES)[number];

export const PLAYBACK_RATE_LABELS: Record<PlaybackRate, string> = { 0.125: '1/8×', 0.25: '1/4×', 0.5: '1/2×', 1: '1×' };

/**
 * Real time of each frame (ms from the first frame). `timestampsMs` are the container's
 * presentation times; with `slowMotion` (a capture rate was set) they are ignored and each frame
 * is `i × 1000 / effectiveFps`. Missing or short timestamp lists fall back to the same.
 */
export function realTimestamps(
  timestampsMs: readonly number[] | null | undefined,
  frameCount: number,
  slowMotion: boolean,
  effectiveFps: number | null,
): number[] {
  const eff = effectiveFps && effectiveFps > 0 ? effectiveFps : 30;
  const out: number[] = [];
  const usable = !slowMotion && timestampsMs && timestampsMs.length > 0;
  const first = usable ? timestampsMs[0] : 0;
  for (let i = 0; i < frameCount; i++) {
    const ts = usable ? timestampsMs[i] : undefined;
    out.push(typeof ts === 'number' && Number.isFinite(ts) ? ts - first : (i * 1000) / eff);
  }
  return out;
}

/** Index of the last frame whose time is ≤ `t` (0 before the first frame). Binary search. */
export function frameAtTime(times: readonly number[], t: number): number {
  if (!times.length) return 0;
  let lo = 0;
  let hi = times.length - 1;
  if (t <= times[0]) return 0;
  if (t >= times[hi]) return hi;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (times[mid] <= t) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/** Where playback has got to: started at `startFrame`, `elapsedWallMs` ago, at `rate` × real time. */
export function playbackFrame(times: readonly number[], startFrame: number, elapsedWallMs: number, rate: number): number {
  const start = times[startFrame] ?? 0;
  return frameAtTime(times, start + Math.max(0, elapsedWallMs) * rate);
}

/** The next slower / faster speed, staying at the ends. */
export function stepRate(rate: PlaybackRate, dir: -1 | 1): PlaybackRate {
  const i = PLAYBACK_RATES.indexOf(rate);
  return PLAYBACK_RATES[Math.min(PLAYBACK_RATES.length - 1, Math.max(0, (i < 0 ? PLAYBACK_RATES.length - 1 : i) + dir))];
}

/** "1 234.5 ms" style time for the frame counter (one decimal, thin grouping). */
export function formatMs(ms: number | null | undefined): string {
  if (ms === null || ms === undefined || !Number.isFinite(ms)) return '— ms';
  return `${ms.toLocaleString('en', { minimumFractionDigits: 1, maximumFractionDigits: 1 })} ms`;
}

/** Keeps a frame index inside the clip. */
export function clampFrame(frame: number, frameCount: number): number {
  if (frameCount <= 0) return 0;
  return Math.min(frameCount - 1, Math.max(0, Math.round(frame)));
}
