/**
 * Temp files of uploads that no live request owns (left by a server killed mid-upload) are
 * removed at start-up and, while the server runs, once they are older than the age limit; a file
 * a live request is still writing is never touched.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { makeTestApp, type TestApp } from '../support/test-app';
import { uploadTemps } from '../../server/storage/upload-temps';

const dirs: string[] = [];
function tmpFolder(): string {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'tf-temps-'));
  dirs.push(dir);
  return dir;
}
function write(dir: string, name: string, ageMs: number): string {
  const file = path.join(dir, name);
  fs.writeFileSync(file, 'partial upload');
  const t = (Date.now() - ageMs) / 1000;
  fs.utimesSync(file, t, t);
  return file;
}
afterAll(() => {
  for (const d of dirs) fs.rmSync(d, { recursive: true, force: true });
});

describe('upload temp files', () => {
  it('start-up removes every upload temp file left by a killed server', async () => {
    const uploadsDir = tmpFolder();
    const tmp = path.join(uploadsDir, 'tmp');
    fs.mkdirSync(tmp, { recursive: true });
    write(tmp, '2b1f0c1e-0000-4000-8000-000000000001.upload', 5_000);
    write(tmp, '2b1f0c1e-0000-4000-8000-000000000002.upload', 0);
    let t: TestApp | null = null;
    try {
      t = await makeTestApp({ uploadsDir });
      expect(fs.readdirSync(tmp)).toEqual([]);
    } finally {
      await t?.close();
    }
  });

  it('while running, removes unowned files past the age limit and keeps owned and young ones', async () => {
    const dir = tmpFolder();
    const temps = uploadTemps(dir);
    const old = write(dir, 'a.upload', 2 * 3_600_000);
    const young = write(dir, 'b.upload', 60_000);
    const owned = temps.create();
    write(dir, path.basename(owned), 2 * 3_600_000);
    const other = write(dir, 'notes.txt', 2 * 3_600_000);
    const removed = await temps.sweep(3_600_000);
    expect(removed).toEqual([old]);
    expect(fs.existsSync(young)).toBe(true);
    expect(fs.existsSync(owned)).toBe(true);
    expect(fs.existsSync(other)).toBe(true); // not an upload temp file
    temps.release(owned);
    expect(await temps.sweep(3_600_000)).toEqual([owned]);
  });

  it('sweeps on a timer that does not keep the process alive', async () => {
    const dir = tmpFolder();
    const temps = uploadTemps(dir);
    const file = write(dir, 'c.upload', 10_000);
    const timer = temps.startSweeping({ everyMs: 20, maxAgeMs: 1_000 });
    try {
      expect(timer.hasRef()).toBe(false);
      for (let i = 0; i < 100 && fs.existsSync(file); i++) await new Promise((r) => setTimeout(r, 20));
      expect(fs.existsSync(file)).toBe(false);
    } finally {
      clearInterval(timer);
    }
  });
});
