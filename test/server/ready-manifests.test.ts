/**
 * Manifests of ready clips kept in memory (server/clips/ready-manifests.ts): one read of the stored
 * file per ready clip row, a new read once the row changes (`updated_at`) or while the clip is not
 * ready, and what is answered is always the stored document of that moment.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { localMediaStore } from '../../server/storage/local-media-store';
import type { MediaStore } from '../../server/storage/media-store';
import { putJson } from '../../server/storage/stored-objects';
import { clipKeys } from '../../server/storage/media-keys';
import { readyManifests } from '../../server/clips/ready-manifests';

const dirs: string[] = [];
afterEach(() => {
  for (const d of dirs.splice(0)) fs.rmSync(d, { recursive: true, force: true });
});

/** A local store that counts reads. */
function countingStore(): { store: MediaStore; reads: () => number } {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'tf-manifests-'));
  dirs.push(dir);
  const inner = localMediaStore(dir);
  let reads = 0;
  const store: MediaStore = {
    ...inner,
    get: (key, range) => {
      reads++;
      return inner.get(key, range);
    },
  };
  return { store, reads: () => reads };
}

describe('ready manifests', () => {
  it('reads a ready clip’s manifest once per row version, and again after the row changed', async () => {
    const { store, reads } = countingStore();
    await putJson(store, clipKeys(7).manifest, { frameCount: 10 });
    const manifestOf = readyManifests(store);
    const row = { id: 7, status: 'ready' as const, updated_at: '2026-12-05T10:00:00.000Z' };
    expect(await manifestOf(row)).toEqual({ frameCount: 10 });
    expect(await manifestOf(row)).toEqual({ frameCount: 10 });
    expect(reads()).toBe(1);
    // A new extraction rewrote it and the row changed with it.
    await putJson(store, clipKeys(7).manifest, { frameCount: 12 });
    expect(await manifestOf({ ...row, updated_at: '2026-12-05T10:05:00.000Z' })).toEqual({ frameCount: 12 });
    expect(reads()).toBe(2);
  });

  it('a clip that is not ready is read from the store every time, and not kept', async () => {
    const { store, reads } = countingStore();
    const manifestOf = readyManifests(store);
    const row = { id: 8, status: 'extracting' as const, updated_at: '2026-12-05T10:00:00.000Z' };
    expect(await manifestOf(row)).toBeNull();
    await putJson(store, clipKeys(8).manifest, { frameCount: 3 });
    expect(await manifestOf(row)).toEqual({ frameCount: 3 });
    await putJson(store, clipKeys(8).manifest, { frameCount: 240 });
    expect(await manifestOf(row)).toEqual({ frameCount: 240 });
    expect(await manifestOf({ ...row, status: 'ready' })).toEqual({ frameCount: 240 });
    expect(reads()).toBe(4);
  });
});
