/**
 * Temp folders beside a bucket: a worker killed mid-job (SIGKILL) never runs its cleanup, so the
 * next store sweeps folders untouched for longer than a job could run. Times are set on the folders
 * with utimes; no bucket is needed.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { S3_TEMP_PREFIX, S3_TEMP_STALE_MS, sweepStaleTempFolders } from '../../../server/storage/s3-media-store';

let root: string;
afterEach(() => fs.rmSync(root, { recursive: true, force: true }));

function folder(name: string, ageMs: number, now: number): string {
  const dir = path.join(root, name);
  fs.mkdirSync(dir);
  fs.writeFileSync(path.join(dir, 'frame-000001.jpg'), 'x');
  const at = new Date(now - ageMs);
  fs.utimesSync(dir, at, at);
  return dir;
}

describe('sweeping the S3 store’s temp folders', () => {
  it('removes only our folders untouched for longer than a job runs; live ones and other folders stay', async () => {
    root = fs.mkdtempSync(path.join(os.tmpdir(), 'tf-sweep-'));
    const now = Date.now();
    const stale = folder(`${S3_TEMP_PREFIX}killed`, S3_TEMP_STALE_MS + 60_000, now);
    const live = folder(`${S3_TEMP_PREFIX}running`, 60_000, now);
    const foreign = folder('someone-else', S3_TEMP_STALE_MS * 4, now);
    fs.writeFileSync(path.join(root, `${S3_TEMP_PREFIX}a-file`), 'not a folder');

    expect(await sweepStaleTempFolders(root, now)).toBe(1);
    expect(fs.existsSync(stale)).toBe(false);
    expect(fs.existsSync(live)).toBe(true);
    expect(fs.existsSync(foreign)).toBe(true);
    expect(fs.existsSync(path.join(root, `${S3_TEMP_PREFIX}a-file`))).toBe(true);
  });

  it('a missing temp root removes nothing and does not throw', async () => {
    root = path.join(os.tmpdir(), 'tf-sweep-missing-never-made');
    expect(await sweepStaleTempFolders(root)).toBe(0);
  });
});
