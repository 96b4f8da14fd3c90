/**
 * Demonstration media of an exercise (pictures and one short clip) and the clinic's brand
 * (logo and legal details): API shapes shared by client and server.
 */
import type { ClinicLegalDetails } from './billing';

/** Limits of an exercise's demonstrations. */
export const DEMO_LIMITS = {
  /** Pictures per exercise. */
  pictures: 4,
  /** Characters of a caption (one line). */
  caption: 120,
  /** Bytes of one uploaded picture or logo. */
  pictureBytes: 20 * 1024 * 1024,
  /** Clips per exercise. */
  clips: 1,
  /** Seconds of a demonstration clip. */
  clipSeconds: 30,
} as const;

/** One demonstration picture of an exercise, processed (upright, metadata-free JPEG). */
export interface DemoPicture {
  id: number;
  exerciseId: number;
  /** 0-based place in the exercise's order. */
  position: number;
  /** One line shown under the picture; may be empty. */
  caption: string;
  /** The picture (long side ≤ 1600 px), versioned URL. */
  url: string;
  /** Its thumbnail (long side ≤ 400 px), versioned URL. */
  thumbUrl: string;
  width: number;
  height: number;
  createdAt: string;
}

/** State of a demonstration clip: its phone MP4 and poster being made, made, or not makeable. */
export type DemoClipStatus = 'processing' | 'ready' | 'failed';

/**
 * The demonstration clip of an exercise (≤ {@link DEMO_LIMITS.clipSeconds} s): a phone MP4 (H.264,
 * long side ≤ 1280, no sound) and its poster once `ready`. Processing reports on the clinic's
 * progress stream (subject `demo_clip`).
 */
export interface DemoClip {
  id: number;
  exerciseId: number;
  /** Its place among the pictures: shown before picture `position` (after the last when larger). */
  position: number;
  caption: string;
  status: DemoClipStatus;
  /** Why it could not be made (failed only). */
  error: string | null;
  durationS: number;
  /** Video size (ready only). */
  width: number | null;
  height: number | null;
  /** The MP4 and its poster JPEG, versioned (ready only). */
  videoUrl: string | null;
  posterUrl: string | null;
  createdAt: string;
}

/** PATCH `/api/demo-clips/:id`: a new caption and/or place among the pictures. */
export interface DemoClipUpdate {
  caption?: string;
  position?: number;
}

/** GET `/api/exercises/:id/demonstrations`. Athletes get the clip only once it is ready. */
export interface ExerciseDemonstrations {
  exerciseId: number;
  pictures: DemoPicture[];
  clip: DemoClip | null;
}

/** PATCH `/api/demo-pictures/:id`: a new caption and/or place. */
export interface DemoPictureUpdate {
  caption?: string;
  position?: number;
}

/** GET `/api/clinic/brand`: what every page and document of the clinic shows of it. */
export interface ClinicBrand {
  /** The clinic's name as the app shows it. */
  name: string;
  legal: ClinicLegalDetails;
  /** Versioned URL of the logo PNG, or null when the clinic has none. */
  logoUrl: string | null;
}
