/**
 * The one place that names stored media. Keys are built from numeric ids and our own constant
 * names only (never from anything a user sent), so they cannot point outside their subject.
 */
import { FRAMES_DIR, MANIFEST_FILE, THUMBS_DIR, frameFileName } from '../media/manifest';

/** File name of an annotated clip's video inside its clip's `annotated/` folder. */
export function annotatedClipFile(annotatedClipId: number, version: number): string {
  return `${annotatedClipId}-v${version}.mp4`;
}

function id(value: number, what: string): number {
  if (!Number.isSafeInteger(value) || value <= 0) throw new Error(`bad ${what} id ${value}`);
  return value;
}

/** Keys of one clip's media. */
export interface ClipKeys {
  /** `clips/12/`: everything of the clip (removed with it). */
  readonly prefix: string;
  /** The uploaded file as stored: `clips/12/original.mp4` (`storedName` is ours, e.g. `original.mp4`). */
  original(storedName: string): string;
  /** `clips/12/manifest.json`: the one source of the clip's media facts. */
  readonly manifest: string;
  /** Working frame `index` (0-based): `clips/12/frames/000001.jpg` for 0. */
  frame(index: number): string;
  /** Thumbnail `index` (0-based): `clips/12/thumbs/000001.jpg` for 0. */
  thumb(index: number): string;
  /** A still's image, by render version: `clips/12/stills/5-v2.png` / `5-v2-phone.jpg`. */
  still(stillId: number, version: number, format: 'png' | 'jpeg'): string;
  /** `clips/12/annotated/`: the clip's annotated-clip videos. */
  readonly annotatedPrefix: string;
  /** An annotated clip's video, by render version: `clips/12/annotated/5-v1.mp4`. */
  annotated(annotatedClipId: number, version: number): string;
}

const STORED_NAME = /^original\.[a-z0-9]{2,5}$/;

export function clipKeys(clipId: number): ClipKeys {
  const prefix = `clips/${id(clipId, 'clip')}/`;
  return {
    prefix,
    original(storedName) {
      if (!STORED_NAME.test(storedName)) throw new Error(`bad stored name ${storedName}`);
      return `${prefix}${storedName}`;
    },
    manifest: `${prefix}${MANIFEST_FILE}`,
    frame: (index) => `${prefix}${FRAMES_DIR}/${frameFileName(index)}`,
    thumb: (index) => `${prefix}${THUMBS_DIR}/${frameFileName(index)}`,
    still(stillId, version, format) {
      const base = `${prefix}stills/${id(stillId, 'still')}-v${id(version, 'version')}`;
      return format === 'png' ? `${base}.png` : `${base}-phone.jpg`;
    },
    annotatedPrefix: `${prefix}annotated/`,
    annotated: (annotatedClipId, version) =>
      `${prefix}annotated/${annotatedClipFile(id(annotatedClipId, 'annotated clip'), id(version, 'version'))}`,
  };
}

/** `assessments/3/`: an assessment's own media (visit summaries), removed with it. */
export function assessmentPrefix(assessmentId: number): string {
  return `assessments/${id(assessmentId, 'assessment')}/`;
}

/** A visit summary's PDF: `assessments/3/summaries/summary-7.pdf`. */
export function summaryKey(assessmentId: number, summaryId: number): string {
  return `${assessmentPrefix(assessmentId)}summaries/summary-${id(summaryId, 'summary')}.pdf`;
}

/** `exports/3/`: an athlete's data exports (zips), removed with the athlete's data. */
export function exportPrefix(athleteId: number): string {
  return `exports/${id(athleteId, 'athlete')}/`;
}

/** A data export's zip: `exports/3/export-9.zip`. */
export function exportKey(athleteId: number, exportId: number): string {
  return `${exportPrefix(athleteId)}export-${id(exportId, 'export')}.zip`;
}

/**
 * The first part of every media key : what a backup
 * copies. Anything else under the uploads folder (upload temp files, a test's database) is not media.
 */
export const MEDIA_KEY_ROOTS = ['clips/', 'assessments/', 'exercises/', 'clinics/', 'exports/'] as const;

/** `exercises/4/demo/`: everything of an exercise's demonstrations. */
export function exerciseDemoPrefix(exerciseId: number): string {
  return `exercises/${id(exerciseId, 'exercise')}/demo/`;
}

/** A demonstration picture (`exercises/4/demo/9.jpg`) or its thumbnail (`9-thumb.jpg`). */
export function demoPictureKey(exerciseId: number, pictureId: number, size: 'full' | 'thumb'): string {
  return `${exerciseDemoPrefix(exerciseId)}${id(pictureId, 'picture')}${size === 'thumb' ? '-thumb' : ''}.jpg`;
}

/** Keys of one demonstration clip of an exercise. */
export interface DemoClipKeys {
  /** `exercises/4/demo/clip-7/`: everything of the clip (removed with it). */
  readonly prefix: string;
  /** The upload as received: `exercises/4/demo/clip-7/original.mov` (`storedName` is ours). */
  original(storedName: string): string;
  /** File name of the phone MP4 inside {@link prefix}, by version: `video-v1.mp4`. */
  videoFile(version: number): string;
  /** File name of the poster inside {@link prefix}, by version: `poster-v1.jpg`. */
  posterFile(version: number): string;
  video(version: number): string;
  poster(version: number): string;
}

export function demoClipKeys(exerciseId: number, clipId: number): DemoClipKeys {
  const prefix = `${exerciseDemoPrefix(exerciseId)}clip-${id(clipId, 'demo clip')}/`;
  const videoFile = (version: number) => `video-v${id(version, 'version')}.mp4`;
  const posterFile = (version: number) => `poster-v${id(version, 'version')}.jpg`;
  return {
    prefix,
    original(storedName) {
      if (!STORED_NAME.test(storedName)) throw new Error(`bad stored name ${storedName}`);
      return `${prefix}${storedName}`;
    },
    videoFile,
    posterFile,
    video: (version) => `${prefix}${videoFile(version)}`,
    poster: (version) => `${prefix}${posterFile(version)}`,
  };
}

/** A clinic's logo, by version: `clinics/1/logo-v2.png`. */
export function clinicLogoKey(clinicId: number, version: number): string {
  return `clinics/${id(clinicId, 'clinic')}/logo-v${id(version, 'version')}.png`;
}
