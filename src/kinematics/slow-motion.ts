import { MIN_OUTPUT_FPS } from '../contracts/annotated-clips';

/** How a slowed-down clip is timed. */
export interface SlowMotionTiming {
  /** Times each source frame is written to the video (≥ 1). */
  repeat: number;
  /** Frame rate of the video, frames/s: source rate × factor × repeat. */
  outputFps: number;
}

/**
 * The slow-motion rule of annotated clips. A clip shot at `sourceFps` played at `factor` of real
 * time shows `sourceFps × factor` source frames per second. When that is at least
 * {@link MIN_OUTPUT_FPS} the video runs at that rate with one video frame per source frame; below
 * it, each source frame is repeated the smallest whole number of times that lifts the rate to at
 * least {@link MIN_OUTPUT_FPS}:
 *
 *   repeat = max(1, ⌈MIN_OUTPUT_FPS ÷ (sourceFps × factor)⌉), outputFps = sourceFps × factor × repeat
 *
 * So N source frames give N × repeat video frames lasting N ÷ (sourceFps × factor) seconds
 * (e.g. 240 frames of 120 fps at ¼: 240 frames at 30 fps, 8 s; of 30 fps at ¼: 960 frames at 30 fps, 32 s).
 */
export function slowMotionTiming(sourceFps: number, factor: number): SlowMotionTiming {
  if (!(sourceFps > 0) || !Number.isFinite(sourceFps)) throw new RangeError(`bad frame rate ${sourceFps}`);
  if (!(factor > 0) || factor > 1) throw new RangeError(`bad slow-motion factor ${factor}`);
  const shown = sourceFps * factor;
  // A tiny tolerance keeps 24.000000001 from asking for a second copy.
  const repeat = Math.max(1, Math.ceil(MIN_OUTPUT_FPS / shown - 1e-9));
  return { repeat, outputFps: shown * repeat };
}

/** Video frames and seconds of `sourceFrames` source frames under {@link slowMotionTiming}. */
export function slowMotionLength(sourceFrames: number, sourceFps: number, factor: number): { frames: number; seconds: number } {
  const { repeat } = slowMotionTiming(sourceFps, factor);
  return { frames: sourceFrames * repeat, seconds: sourceFrames / (sourceFps * factor) };
}

/** Why a frame range cannot become an annotated clip, in words, or null when it can. */
export function frameRangeProblem(from: number, to: number, frameCount: number, maxFrames: number): string | null {
  if (!Number.isInteger(from) || !Number.isInteger(to)) return 'The first and last frame must be whole frame numbers.';
  if (from < 0 || to >= frameCount) return `Choose frames from 0 to ${Math.max(0, frameCount - 1)}.`;
  if (to < from) return 'The last frame comes before the first.';
  const n = to - from + 1;
  if (n > maxFrames) return `That range has ${n} frames; an annotated clip can cover at most ${maxFrames}. Choose a shorter range.`;
  return null;
}

/**
 * The default frame range of an annotated clip: two strides centred on `current` (one before, one
 * after), kept inside the clip. A stride is the median gap between successive initial contacts
 * of one side in `contactFrames` (by side); without two of one side, 0.7 s of the clip (a common
 * running stride period, common practice).
 */
export function defaultClipRange(
  current: number,
  contactFrames: { left: readonly number[]; right: readonly number[] },
  frameCount: number,
  fps: number,
  maxFrames: number,
): { from: number; to: number } {
  const gaps: number[] = [];
  for (const list of [contactFrames.left, contactFrames.right]) {
    const sorted = [...list].sort((a, b) => a - b);
    for (let i = 1; i < sorted.length; i++) gaps.push(sorted[i]! - sorted[i - 1]!);
  }
  gaps.sort((a, b) => a - b);
  const stride = gaps.length ? gaps[Math.floor(gaps.length / 2)]! : Math.round(0.7 * fps);
  const length = Math.min(frameCount, maxFrames, 2 * stride + 1);
  let from = Math.round(current - (length - 1) / 2);
  from = Math.max(0, Math.min(from, frameCount - length));
  return { from, to: from + length - 1 };
}
