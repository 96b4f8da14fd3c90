/**
 * Data export: the owner (athlete page) or the athlete (portal) asks for one zip of everything held
 * about the athlete; it is built as a processed item with progress on the athlete's stream, can be
 * downloaded until its link expires (24 h), and each download is audited. The zip is read back with
 * Debian's `unzip` (outside the project) and the clip inside is compared by SHA-256 with the file
 * that was uploaded.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { execFile } from 'node:child_process';
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import http from 'node:http';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import { promisify } from 'node:util';
import { makeClip, tempDir } from '../media/fixtures';
import { Client, makeTestApp, OTHER, signedIn, type TestApp } from '../../support/test-app';
import { followProcessingEvents } from '../../support/event-stream';
import { DEMO_SIGN_INS } from '../../../seeds/demo-scenario';
import { ATHLETE_TABLE_NAMES } from '../../../server/privacy/athlete-tables';
import { exportKey } from '../../../server/storage/media-keys';

const run = promisify(execFile);
const [ownerCred, coachCred, , athleteCred] = DEMO_SIGN_INS;

let t: TestApp;
let server: http.Server;
let owner: Client;
let coach: Client;
let athlete: Client;
let adaId: number;
let dir: { dir: string; cleanup: () => Promise<void> };
let clipFile: string;
let clipId: number;

/** Saves a download to a file and lists the zip with `unzip -Z1`. */
async function saveZip(body: Buffer, name: string): Promise<{ file: string; entries: string[] }> {
  const file = path.join(dir.dir, name);
  fs.writeFileSync(file, body);
  const { stdout } = await run('unzip', ['-Z1', file]);
  return { file, entries: stdout.split('\n').filter(Boolean) };
}

async function unzipEntry(file: string, entry: string): Promise<Buffer> {
  const { stdout } = await run('unzip', ['-p', file, entry], { encoding: 'buffer', maxBuffer: 64 * 1024 * 1024 });
  return stdout;
}

beforeAll(async () => {
  t = await makeTestApp({}, { fakeSmtp: false });
  server = http.createServer(t.app).listen(0, '127.0.0.1');
  owner = await signedIn(t.app, ownerCred.email, ownerCred.password);
  coach = await signedIn(t.app, coachCred.email, coachCred.password);
  athlete = await signedIn(t.app, athleteCred.email, athleteCred.password);
  adaId = (await t.db('athletes').where({ email: athleteCred.email }).first()).id;
  dir = await tempDir('export');
  clipFile = await makeClip(path.join(dir.dir, 'side view.mp4'), { fps: 30, width: 160, height: 90, seconds: 1 });
  const assessmentId = (await t.db('assessments').where({ athlete_id: adaId }).orderBy('id').first()).id;
  const up = await coach.agent
    .post(`/api/assessments/${assessmentId}/clips`)
    .set('X-XSRF-TOKEN', await coach.xsrf())
    .attach('file', clipFile);
  expect(up.status, JSON.stringify(up.body)).toBe(201);
  clipId = up.body.id;
  await t.worker!.idle();
  const still = await coach.post(`/api/clips/${clipId}/stills`, { frameIndex: 0, caption: 'Toe-off', showAngles: true });
  await t.worker!.idle();
  expect((await coach.post(`/api/stills/${still.body.id}/publish`)).status).toBe(200);
  await coach.post(`/api/clips/${clipId}/stills`, { frameIndex: 1, caption: 'Not shared', showAngles: true });
  await t.worker!.idle();
  // Marks saved and never read since: a save leaves the measures to their first read.
  const marks = { hip: { x: 0.5, y: 0.4 }, knee: { x: 0.53, y: 0.6 }, ankle: { x: 0.5, y: 0.8 } };
  const saved = await coach.put(`/api/clips/${clipId}/annotations`, {
    baseRevision: 0,
    landmarks: [{ frame: 2, side: 'right', points: marks }],
    events: [],
    scale: null,
  });
  expect(saved.status, JSON.stringify(saved.body)).toBe(200);
}, 120_000);

afterAll(async () => {
  server?.close();
  await t?.close();
  await dir?.cleanup();
});

describe('data export', () => {
  let exportId: number;

  it('the athlete starts an export from the portal; it builds with rising progress on their stream, then is ready', async () => {
    const port = (server.address() as AddressInfo).port;
    const stream = await followProcessingEvents(`http://127.0.0.1:${port}/api/athletes/${adaId}/processing-events`, athlete.cookieHeader());
    try {
      const res = await athlete.post(`/api/athletes/${adaId}/data-exports`);
      expect(res.status, JSON.stringify(res.body)).toBe(202);
      expect(res.body).toMatchObject({ status: 'building', downloadUrl: null });
      exportId = res.body.id;
      const again = await owner.post(`/api/athletes/${adaId}/data-exports`);
      expect(again.status).toBe(409);
      expect(again.body.error.code).toBe('export_running');
      await stream.waitFor((e) => e.subject === 'data_export' && e.id === exportId && e.state === 'ready', 60_000);
      const progress = stream.events
        .filter((e) => e.subject === 'data_export' && e.state === 'running' && e.progress)
        .map((e) => e.progress!);
      expect(progress.length).toBeGreaterThan(0);
      for (let i = 1; i < progress.length; i++) expect(progress[i]!.done).toBeGreaterThanOrEqual(progress[i - 1]!.done);
    } finally {
      stream.close();
    }
    const list = await athlete.get(`/api/athletes/${adaId}/data-exports`);
    expect(list.body.exports[0]).toMatchObject({
      id: exportId,
      status: 'ready',
      progress: 1,
      downloadUrl: `/api/data-exports/${exportId}/download`,
    });
    const { readyAt, expiresAt } = list.body.exports[0];
    expect(new Date(expiresAt).getTime() - new Date(readyAt).getTime()).toBe(24 * 3_600_000);
  }, 90_000);

  it('the zip holds data.json with every athlete table, the original clip byte for byte, stills by publication, the receipt and a README', async () => {
    const res = await athlete.binary(`/api/data-exports/${exportId}/download`);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/zip');
    expect(res.headers['content-disposition']).toMatch(/^attachment; filename="trailframe-data-\d+-\d{4}-\d{2}-\d{2}\.zip"/);
    const { file, entries } = await saveZip(res.body as Buffer, 'a.zip');
    expect(entries).toContain('data.json');
    expect(entries).toContain('README.txt');
    expect(entries).toContain(`clips/${clipId}-side view.mp4`);
    expect(entries.filter((e) => e.startsWith('stills/published/'))).toHaveLength(1);
    expect(entries.filter((e) => e.startsWith('stills/unpublished/'))).toHaveLength(1);
    expect(entries.some((e) => /^receipts\/receipt-TF-\d{4}-\d{4}\.pdf$/.test(e))).toBe(true);
    // The clip inside is the uploaded file: SHA-256 of the source file, computed here.
    const inZip = await unzipEntry(file, `clips/${clipId}-side view.mp4`);
    expect(createHash('sha256').update(inZip).digest('hex')).toBe(createHash('sha256').update(fs.readFileSync(clipFile)).digest('hex'));
    const receipt = entries.find((e) => e.startsWith('receipts/'))!;
    expect((await unzipEntry(file, receipt)).subarray(0, 5).toString()).toBe('%PDF-');
    const still = entries.find((e) => e.startsWith('stills/published/'))!;
    expect((await unzipEntry(file, still)).subarray(1, 4).toString()).toBe('PNG');

    const data = JSON.parse((await unzipEntry(file, 'data.json')).toString('utf8'));
    expect(data).toMatchObject({ format: 'trailframe-athlete-data', version: 1, athleteId: adaId });
    expect(Object.keys(data.tables)).toEqual(ATHLETE_TABLE_NAMES);
    expect(data.tables.athletes).toEqual([expect.objectContaining({ id: adaId, last_name: 'Kestrel', email: athleteCred.email })]);
    expect(data.tables.clips.map((c: { id: number }) => c.id)).toContain(clipId);
    expect(data.tables.users).toHaveLength(1);
    expect(data.tables.users[0]).not.toHaveProperty('password_hash');
    for (const i of data.tables.invitations) expect(i).not.toHaveProperty('token_hash');
    expect(data.tables.invoices.length).toBeGreaterThan(0);
    expect(data.tables.consents.length).toBeGreaterThan(0);
    // Every ready clip's measures are those of its latest marks, though none was read after the save.
    const ready = (data.tables.clips as { id: number; status: string; annotation_revision: number }[]).filter((c) => c.status === 'ready');
    expect(ready.map((c) => c.id)).toContain(clipId);
    for (const c of ready) {
      const snapshot = (data.tables.measure_snapshots as { clip_id: number; annotation_revision: number }[]).find(
        (m) => m.clip_id === c.id,
      );
      expect(snapshot?.annotation_revision, `clip ${c.id}`).toBe(c.annotation_revision);
    }
    expect(ready.find((c) => c.id === clipId)!.annotation_revision).toBe(1);
    // Rows counted here straight from the database, table by table.
    for (const table of ['assessments', 'stills', 'plans', 'log_entries', 'consents', 'injuries']) {
      const n = ((await t.db(table).where({ athlete_id: adaId }).count('* as n')) as { n: number }[])[0]!.n;
      expect(data.tables[table], table).toHaveLength(n);
    }
    const readme = (await unzipEntry(file, 'README.txt')).toString('utf8');
    expect(readme).toMatch(/data\.json/);
    expect(readme).toMatch(/clips\//);
    expect(readme).toMatch(/receipts\//);
  });

  it('each download is audited with who downloaded it', async () => {
    await owner.binary(`/api/data-exports/${exportId}/download`);
    const rows = await t.db('audit_log').where({ athlete_id: adaId, action: 'athlete.data_export_downloaded' }).orderBy('id');
    const users = await t.db('users').whereIn('email', [athleteCred.email, ownerCred.email]).select('id', 'email');
    const idOf = (email: string) => users.find((u) => u.email === email)!.id;
    expect(rows.map((r) => r.actor_id)).toEqual([idOf(athleteCred.email), idOf(ownerCred.email)]);
    expect(JSON.parse(rows[0].detail)).toEqual({ exportId });
  });

  it('a coach may not export (403); another clinic gets 404; another athlete cannot download', async () => {
    expect((await coach.post(`/api/athletes/${adaId}/data-exports`)).status).toBe(403);
    const otherOwner = await signedIn(t.app, OTHER.owner.email, OTHER.owner.password);
    expect((await otherOwner.post(`/api/athletes/${adaId}/data-exports`)).status).toBe(404);
    expect((await otherOwner.get(`/api/data-exports/${exportId}/download`)).status).toBe(404);
    const otherAthlete = await signedIn(t.app, OTHER.athlete.email, OTHER.athlete.password);
    expect((await otherAthlete.get(`/api/data-exports/${exportId}/download`)).status).toBe(404);
  });

  it('after 24 hours the link answers 410 with a clear message, the list says expired, and the daily check removes the zip', async () => {
    const key = exportKey(adaId, exportId);
    expect(await t.store.stat(key)).not.toBeNull();
    t.advance(24 * 3_600_000 + 1000);
    const res = await athlete.get(`/api/data-exports/${exportId}/download`);
    expect(res.status).toBe(410);
    expect(res.body.error).toMatchObject({ code: 'export_expired', message: expect.stringMatching(/expired.*24 hours.*new export/) });
    const list = await athlete.get(`/api/athletes/${adaId}/data-exports`);
    expect(list.body.exports[0]).toMatchObject({ status: 'expired', downloadUrl: null });
    await t.runDailyPrivacyCheck();
    expect(await t.store.stat(key)).toBeNull();
    // A new export can be asked for and downloaded again.
    const again = await owner.post(`/api/athletes/${adaId}/data-exports`);
    expect(again.status).toBe(202);
    await t.worker!.idle();
    expect((await owner.binary(`/api/data-exports/${again.body.id}/download`)).status).toBe(200);
  }, 60_000);
});
