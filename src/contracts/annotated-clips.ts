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

/** Longest caption of an annotated clip, characters (as a still's). */
export const CLIP_CAPTION_MAX = 280;

/** Rendering state of an annotated clip. */
export type AnnotatedClipStatus = 'rendering' | 'ready' | 'failed';

/** One clip an annotated clip shows: which frames of which visit. */
export interface AnnotatedClipPanel {
  clipId: number;
  assessmentId: number;
  /** "Baseline · 6 Oct 2026". */
  label: string;
  /** First and last source frame shown (a Re-test panel: the warped frames at both ends). */
  fromFrame: number;
  toFrame: number;
}

/** An annotated clip: one clip's frame range in slow motion, or Baseline and Re-test side by side. */
export interface AnnotatedClip {
  id: number;
  athleteId: number;
  /** The first panel's assessment (a side-by-side clip: the Re-test's). */
  assessmentId: number;
  kind: 'single' | 'side_by_side';
  panels: AnnotatedClipPanel[];
  factor: SlowMotionFactor;
  caption: string;
  /** Whether angle arcs and degree labels are drawn. */
  showAngles: boolean;
  status: AnnotatedClipStatus;
  /** 0–1 while rendering. */
  progress: number;
  error: string | null;
  /** Once ready: video size, frames, frame rate, length, and the copies per source frame. */
  width: number | null;
  height: number | null;
  frameCount: number | null;
  fps: number | null;
  durationS: number | null;
  /** Video frames per source frame (the slow-motion rule): a "frame step" in the player moves this many. */
  repeat: number | null;
  /** What the clip says about its landmarks ("Landmarks marked on 12 frames and interpolated between marked frames on 48."). */
  note: string | null;
  publishedAt: string | null;
  publishedBy: string | null;
  createdAt: string;
  createdBy: string;
  /** Authorised URL of the MP4 (changes with each render). */
  videoUrl: string;
}

/** Body of `POST /api/clips/:clipId/annotated-clips` (from the review). */
export interface AnnotatedClipCreate {
  fromFrame: number;
  toFrame: number;
  factor: SlowMotionFactor;
  caption: string;
  showAngles: boolean;
}

/** Body of `POST /api/athletes/:athleteId/side-by-side-clips` (from the Re-test comparison). */
export interface SideBySideClipCreate {
  baselineClipId: number;
  retestClipId: number;
  /** Baseline frames to cover; default: every frame from the first to the last paired initial contact. */
  fromFrame?: number;
  toFrame?: number;
  factor: SlowMotionFactor;
  caption: string;
  showAngles: boolean;
}
