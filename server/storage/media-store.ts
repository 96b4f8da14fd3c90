import fs from 'node:fs';
import path from 'node:path';
import crypto from 'node:crypto';

/**
 * Where media lives. Local folders now (`uploads/`); an S3-compatible store later implements the
 * same calls. Paths never come from user input: clip folders are named by numeric id only.
 */
export interface MediaStore {
  /** Folder for incoming uploads (multer writes here under random names). */
  readonly tmpDir: string;
  /** A clip's folder: original, `frames/`, `thumbs/`, `manifest.json`. */
  clipDir(clipId: number): string;
  /** Moves an accepted upload into the clip's folder as `name`; returns the new path. */
  adopt(tmpFile: string, clipId: number, name: string): Promise<string>;
  /** Removes a clip's folder and everything in it. */
  removeClip(clipId: number): Promise<void>;
  /** An assessment's folder (visit summaries). */
  assessmentDir(assessmentId: number): string;
  /** Removes an assessment's folder and everything in it. */
  removeAssessment(assessmentId: number): Promise<void>;
  /** A fresh temp file path (for tests and generators). */
  tempPath(ext: string): string;
}

export function localMediaStore(root: string): MediaStore {
  const tmpDir = path.join(root, 'tmp');
  const clipsDir = path.join(root, 'clips');
  const assessmentsDir = path.join(root, 'assessments');
  fs.mkdirSync(tmpDir, { recursive: true });
  fs.mkdirSync(clipsDir, { recursive: true });
  const clipDir = (clipId: number) => {
    if (!Number.isSafeInteger(clipId) || clipId <= 0) throw new Error(`bad clip id ${clipId}`);
    return path.join(clipsDir, String(clipId));
  };
  const assessmentDir = (assessmentId: number) => {
    if (!Number.isSafeInteger(assessmentId) || assessmentId <= 0) throw new Error(`bad assessment id ${assessmentId}`);
    return path.join(assessmentsDir, String(assessmentId));
  };
  return {
    tmpDir,
    clipDir,
    async adopt(tmpFile, clipId, name) {
      if (path.basename(name) !== name) throw new Error(`bad file name ${name}`);
      const dir = clipDir(clipId);
      await fs.promises.mkdir(dir, { recursive: true });
      const target = path.join(dir, name);
      await fs.promises.rename(tmpFile, target);
      return target;
    },
    async removeClip(clipId) {
      await fs.promises.rm(clipDir(clipId), { recursive: true, force: true });
    },
    assessmentDir,
    async removeAssessment(assessmentId) {
      await fs.promises.rm(assessmentDir(assessmentId), { recursive: true, force: true });
    },
    tempPath(ext) {
      return path.join(tmpDir, `${crypto.randomUUID()}${ext}`);
    },
  };
}
