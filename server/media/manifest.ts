import { readFile, rename, writeFile } from 'node:fs/promises';
import path from 'node:path';

/** File name of the manifest inside a clip's output folder; its presence means "frames ready". */
export const MANIFEST_FILE = 'manifest.json';
/** Folder of full-size working frames: `frames/000001.jpg` is frame index 0. */
export const FRAMES_DIR = 'frames';
/** Folder of thumbnails: `thumbs/000001.jpg` shows frame index 0, `thumbs/k` frame (k − 1)·thumbEvery. */
export const THUMBS_DIR = 'thumbs';

export type { FrameManifest } from '../../src/contracts/api';
import type { FrameManifest } from '../../src/contracts/api';
import type { VideoProbe } from './probe-parse';

/**
 * A clip's manifest as stored: the frame manifest the review reads, plus the probe of the
 * original (`source`) taken when the upload was accepted, so processing need not probe again.
 * The one source of a clip's media facts; the clip row keeps copies only for queries.
 */
export interface ClipManifest extends FrameManifest {
  source?: VideoProbe;
}

/** Whether every frame of the manifest exists (manifests older than the `complete` field do). */
export function isComplete(manifest: FrameManifest): boolean {
  return manifest.complete !== false;
}

/** File name of frame `index` (0-based) inside `frames/` or `thumbs/`: `000001.jpg` for 0. */
export function frameFileName(index: number): string {
  return `${String(index + 1).padStart(6, '0')}.jpg`;
}

/** Writes the manifest atomically (temp file + rename), so readers never see half a file. */
export async function writeManifest(outDir: string, manifest: FrameManifest): Promise<void> {
  const target = path.join(outDir, MANIFEST_FILE);
  const temp = `${target}.${process.pid}.tmp`;
  await writeFile(temp, JSON.stringify(manifest));
  await rename(temp, target);
}

/** Reads a clip's manifest, or null when extraction has not finished there. */
export async function readManifest(outDir: string): Promise<FrameManifest | null> {
  try {
    return JSON.parse(await readFile(path.join(outDir, MANIFEST_FILE), 'utf8')) as FrameManifest;
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') return null;
    throw err;
  }
}
