/**
 * A clip through the whole media path with media in an S3-compatible bucket (s3rver, the local S3
 * fake from npm): uploaded, its frames extracted by ffmpeg from the store's local copy, served from
 * the bucket through the app's authorised routes; the bucket holds only the clip's objects, and
 * deleting the clip empties it. Reference: the frame count ffprobe reads from the source (Debian's ffprobe).
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import S3rver from '@20minutes/s3rver';
import { CreateBucketCommand } from '@aws-sdk/client-s3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_SIGN_INS } from '../../../seeds/demo-scenario';
import { s3MediaStore } from '../../../server/storage/s3-media-store';
import { ffprobeCounted, makeClip } from '../media/fixtures';
import { makeTestApp, signedIn, type Client, type TestApp } from '../../support/test-app';

const [, coach, , athlete] = DEMO_SIGN_INS;
const root = fs.mkdtempSync(path.join(os.tmpdir(), 's3-clips-'));
let s3rver: S3rver;
let store: ReturnType<typeof s3MediaStore>;
let t: TestApp;
let c: Client;

beforeAll(async () => {
  s3rver = new S3rver({ port: 0, address: '127.0.0.1', silent: true, directory: path.join(root, 's3'), allowMismatchedSignatures: true });
  const { port } = await s3rver.run();
  store = s3MediaStore({
    bucket: 'media',
    endpoint: `http://127.0.0.1:${port}`,
    region: 'us-east-1',
    accessKeyId: 'S3RVER',
    secretAccessKey: 'S3RVER',
    forcePathStyle: true,
  });
  await store.client.send(new CreateBucketCommand({ Bucket: 'media' }));
  t = await makeTestApp({}, { store, fakeSmtp: false }); // no mail is sent here
  c = await signedIn(t.app, coach.email, coach.password);
}, 60_000);
afterAll(async () => {
  await t?.close();
  await s3rver?.close();
  fs.rmSync(root, { recursive: true, force: true });
});

describe('clips with media in an S3-compatible bucket', () => {
  it('uploads a clip, extracts its frames into the bucket and serves them through the authorised routes', async () => {
    const file = await makeClip(path.join(root, 'run.mp4'), { fps: 30, width: 320, height: 240, seconds: 1 });
    const ref = await ffprobeCounted(file);
    const adaId = (await t.db('athletes').where({ email: athlete.email }).first()).id;
    const assessmentId = (await t.db('assessments').where({ athlete_id: adaId }).first()).id;
    const up = await c.agent
      .post(`/api/assessments/${assessmentId}/clips`)
      .set('X-XSRF-TOKEN', await c.xsrf())
      .attach('file', file);
    expect(up.status, JSON.stringify(up.body)).toBe(201);
    const id = up.body.id as number;
    await expect.poll(async () => (await c.get(`/api/clips/${id}`)).body.status, { timeout: 90_000, interval: 200 }).toBe('ready');

    const keys = await store.list(`clips/${id}/`);
    expect(keys.filter((k) => k.includes('/frames/'))).toHaveLength(ref.nbReadFrames);
    expect(keys).toContain(`clips/${id}/manifest.json`);
    const frame = await c.binary(`/api/clips/${id}/frames/${ref.nbReadFrames - 1}`);
    expect(frame.status).toBe(200);
    expect((frame.body as Buffer).subarray(0, 2)).toEqual(Buffer.from([0xff, 0xd8]));
    const original = await c.binary(`/api/clips/${id}/original`);
    expect(Buffer.compare(original.body as Buffer, fs.readFileSync(file))).toBe(0);

    expect((await c.delete(`/api/clips/${id}`)).status).toBe(204);
    expect(await store.list(`clips/${id}/`)).toEqual([]);
  }, 120_000);
});
