import type { ClipManifest } from '../media/manifest';
import type { MediaStore } from '../storage/media-store';
import { readJson } from '../storage/stored-objects';
import { clipKeys } from '../storage/media-keys';
import type { ClipRow } from './clips-repository';

/** Ready clips whose manifest is kept in memory (a few hundred annotators at once). */
const KEPT = 500;

/**
 * Manifests of ready clips, kept in memory: every autosave computes the clip's measures from its
 * manifest (frame size, rate, timestamps), and reading a file from the store per save cost more
 * than the save's own writes. A ready clip's manifest changes only through a new extraction, which
 * first moves the clip out of `ready` and rewrites its row (`updated_at`), so an entry is used only
 * for a ready row with the same `updated_at` it was read for; any other clip is read from the store.
 */
export function readyManifests(store: MediaStore, max = KEPT) {
  const kept = new Map<number, { updatedAt: string; manifest: ClipManifest }>();
  return async (clip: Pick<ClipRow, 'id' | 'status' | 'updated_at'>): Promise<ClipManifest | null> => {
    const hit = kept.get(clip.id);
    if (clip.status === 'ready' && hit?.updatedAt === clip.updated_at) return hit.manifest;
    const manifest = await readJson<ClipManifest>(store, clipKeys(clip.id).manifest);
    if (clip.status === 'ready' && manifest) {
      kept.delete(clip.id);
      kept.set(clip.id, { updatedAt: clip.updated_at, manifest });
      if (kept.size > max) kept.delete(kept.keys().next().value!);
    }
    return manifest;
  };
}
