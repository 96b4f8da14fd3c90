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
