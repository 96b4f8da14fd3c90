/**
 * Annotated clips: a frame range of a clip played back slowed down with the overlay drawn on every
 * frame, or a Baseline and a Re-test clip side by side, synchronised at each step's initial
 * contact. Types and limits only; the server renders (H.264 in MP4), the client requests and plays.
 */

/** Slow-motion factors a coach can choose: the clip plays at this fraction of real time. */
export const SLOW_MOTION_FACTORS = [1, 0.5, 0.25, 0.125] as const;
export type SlowMotionFactor = (typeof SLOW_MOTION_FACTORS)[number];

/** On-screen names of the factors (plain digits: the shipped font subset has no ⅛). */
export const SLOW_MOTION_LABELS: Record<SlowMotionFactor, string> = {
  1: 'Real time',
  0.5: '1/2 speed',
  0.25: '1/4 speed',
  0.125: '1/8 speed',
};

/** Most source frames one annotated clip may cover (a side-by-side clip: of the baseline). */
export const ANNOTATED_CLIP_MAX_SOURCE_FRAMES = 1000;

/**
 * The lowest output frame rate, frames/s. Slowed-down footage below it is shown by repeating each
 * source frame (see `slowMotionTiming` in `src/kinematics/slow-motion.ts`), so players that
 * assume a normal rate never stutter.
 */
export const MIN_OUTPUT_FPS = 24;

/** The longest side of an annotated clip's video, px (a side-by-side clip's two panels together). */
export const ANNOTATED_CLIP_MAX_LONG_SIDE = 1280;

/** Where the landmarks drawn on a frame came from. */
export type LandmarkOrigin = 'marked' | 'followed' | 'interpolated' | 'none';

/** How many source frames of a panel showed each landmark origin (the clip says which were interpolated). */
export type LandmarkOriginCounts = Record<LandmarkOrigin, number>;
