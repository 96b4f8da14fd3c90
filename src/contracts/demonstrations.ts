/**
 * Demonstration media of an exercise (pictures now; a short clip later) and the clinic's brand
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

/** GET `/api/exercises/:id/demonstrations`. */
export interface ExerciseDemonstrations {
  exerciseId: number;
  pictures: DemoPicture[];
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
