/**
 * The demonstration clip of an exercise through the API: upload through the media checks, the
 * `make_demo_clip` processed item with progress on the clinic's stream, the phone MP4 and poster
 * it makes, who may see them, refusals that leave nothing behind.
 *
 * References outside the project: Debian's ffprobe reads the served MP4 (codec, pix_fmt, size,
 * duration, streams); the ISO-BMFF top-level box order (moov before mdat = "fast start") is read
 * from the bytes as ISO/IEC 14496-12 lays boxes out (32-bit size, 4-character type); image-size
 * reads the poster's dimensions. 1920×1080 scaled to a long side of 1280 is 1280×720 [calc].
 */
import fs from 'node:fs';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { imageSize } from 'image-size';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DemoClip, ExerciseDemonstrations } from '../../src/contracts/demonstrations';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { UPLOAD_TEMP_SUFFIX, uploadTempDir } from '../../server/storage/upload-temps';
import { storedExerciseFiles, uploadFile } from '../support/demonstrations';
import { startPlanWith } from '../support/plans';
import { followProcessingEvents } from '../support/event-stream';
import { OTHER, signedIn, makeTestApp, type Client, type TestApp } from '../support/test-app';
import { ffprobeJson, makeClip, tempDir } from './media/fixtures';

const [, coach, , athlete] = DEMO_SIGN_INS;
let t: TestApp;
let c: Client;
let a: Client;
let other: Client;
let server: http.Server;
let url: string;
let work: { dir: string; cleanup: () => Promise<void> };
/** An exercise on Ada's running plan, one on no plan of hers, one more for refusals. */
let planned: number;
let unplanned: number;
let spare: number;

/** A clip as a phone records it (H.264 with an AAC tone), 1920×1080 at 60 frames/s unless said. */
function phoneClip(file: string, seconds: number, size = '1920x1080', rate = 60): Promise<string> {
  const [width, height] = size.split('x').map(Number) as [number, number];
  return makeClip(file, { width, height, fps: rate, seconds, audio: true });
}

const upload = (client: Client, exerciseId: number, file: string, caption?: string) =>
  uploadFile(client, `/api/exercises/${exerciseId}/demo-clip`, file, undefined, caption);

/** Top-level ISO-BMFF box types of a file, in order. */
function topLevelBoxes(bytes: Buffer): string[] {
  const types: string[] = [];
  for (let at = 0; at + 8 <= bytes.length;) {
    let size = bytes.readUInt32BE(at);
    const type = bytes.toString('latin1', at + 4, at + 8);
    if (size === 1) size = Number(bytes.readBigUInt64BE(at + 8));
    else if (size === 0) size = bytes.length - at;
    types.push(type);
    at += size;
  }
  return types;
}

const storedFiles = () => storedExerciseFiles(t.store);

/** Upload temp files still on disk. */
function uploadTemps(): string[] {
  const dir = uploadTempDir(t.config.uploadsDir);
  return fs.existsSync(dir) ? fs.readdirSync(dir).filter((f) => f.endsWith(UPLOAD_TEMP_SUFFIX)) : [];
}

beforeAll(async () => {
  work = await tempDir('demo-clips-');
  t = await makeTestApp({}, { fakeSmtp: false }); // no mail is sent here
  c = await signedIn(t.app, coach.email, coach.password);
  a = await signedIn(t.app, athlete.email, athlete.password);
  other = await signedIn(t.app, OTHER.coach.email, OTHER.coach.password);
  server = http.createServer(t.app).listen(0, '127.0.0.1');
  await new Promise((resolve) => server.once('listening', resolve));
  url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const ada = await t.db('athletes').where({ email: athlete.email }).first();
  const [e1, e2, e3] = (await c.get('/api/exercises')).body.exercises;
  [planned, unplanned, spare] = [e1.id, e2.id, e3.id];
  await startPlanWith(c, ada.id, e1);
}, 120_000);
afterAll(async () => {
  server?.close();
  await t?.close();
  await work?.cleanup();
});

describe('demonstration clip', () => {
  let clip: DemoClip;

  it('a coach uploads a phone clip: 201 processing, progress on the clinic stream to ready; the athlete sees it in their plan', async () => {
    const stream = await followProcessingEvents(`${url}/api/clinic/processing-events`, c.cookieHeader());
    try {
      const res = await upload(c, planned, await phoneClip(path.join(work.dir, 'heel-drops.mov'), 3), 'Slow down, three seconds');
      expect(res.status, JSON.stringify(res.body)).toBe(201);
      expect(res.body).toMatchObject({ exerciseId: planned, status: 'processing', caption: 'Slow down, three seconds', videoUrl: null });
      const ready = await stream.waitFor((e) => e.subject === 'demo_clip' && e.id === res.body.id && e.state === 'ready', 90_000);
      expect(ready.kind).toBe('make_demo_clip');
      expect(stream.events.some((e) => e.id === res.body.id && e.state === 'running' && e.progress !== null)).toBe(true);
    } finally {
      stream.close();
    }
    const list = (await c.get(`/api/exercises/${planned}/demonstrations`)).body as ExerciseDemonstrations;
    clip = list.clip!;
    expect(clip).toMatchObject({ status: 'ready', width: 1280, height: 720 });
    expect(clip.videoUrl).toMatch(/^\/api\/demo-clips\/\d+\/video\.mp4\?v=1$/);
    const mine = (await a.get(`/api/exercises/${planned}/demonstrations`)).body as ExerciseDemonstrations;
    expect(mine.clip?.id).toBe(clip.id);
  }, 150_000);

  it('the MP4 is phone-friendly by ffprobe: H.264 yuv420p, long side 1280, duration kept, no audio stream, moov before mdat', async () => {
    const res = await c.binary(clip.videoUrl!);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('video/mp4');
    const bytes = res.body as Buffer;
    const file = path.join(work.dir, 'served.mp4');
    fs.writeFileSync(file, bytes);
    const probe = (await ffprobeJson(file, ['-show_streams', '-show_format'])) as unknown as {
      streams: Record<string, unknown>[];
      format: Record<string, unknown>;
    };
    const video = probe.streams.filter((s) => s['codec_type'] === 'video');
    expect(video).toHaveLength(1);
    expect(probe.streams.filter((s) => s['codec_type'] === 'audio')).toHaveLength(0);
    expect(video[0]).toMatchObject({ codec_name: 'h264', pix_fmt: 'yuv420p', width: 1280, height: 720 });
    // The 3 s source, within three frames at 30 frames/s (dropping to 30 fps can end a frame later).
    expect(Math.abs(Number(probe.format['duration']) - 3)).toBeLessThanOrEqual(0.1);
    // At most 30 frames/s (the 60 fps source is halved).
    const [num, den] = String(video[0]!['avg_frame_rate']).split('/').map(Number);
    expect(num! / den!).toBeLessThanOrEqual(30.01);
    const boxes = topLevelBoxes(bytes);
    expect(boxes.indexOf('moov')).toBeGreaterThanOrEqual(0);
    expect(boxes.indexOf('moov')).toBeLessThan(boxes.indexOf('mdat'));
    // A phone player's byte-range request.
    const part = await c.agent.get(clip.videoUrl!).set('Range', 'bytes=0-99');
    expect(part.status).toBe(206);
  });

  it('the poster is a JPEG of the video’s size', async () => {
    const res = await c.binary(clip.posterUrl!);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('image/jpeg');
    expect(imageSize(res.body as Buffer)).toMatchObject({ type: 'jpg', width: 1280, height: 720 });
  });

  it('a portrait clip keeps its orientation with its long side at most 1280', async () => {
    const file = path.join(work.dir, 'portrait.mp4');
    await makeClip(file, { width: 720, height: 1600, fps: 25, seconds: 1 });
    const res = await upload(c, spare, file);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    await expect
      .poll(async () => ((await c.get(`/api/exercises/${spare}/demonstrations`)).body as ExerciseDemonstrations).clip?.status, {
        timeout: 60_000,
        interval: 250,
      })
      .toBe('ready');
    const ready = ((await c.get(`/api/exercises/${spare}/demonstrations`)).body as ExerciseDemonstrations).clip!;
    expect([ready.width, ready.height]).toEqual([576, 1280]); // 720 × 1280/1600 = 576 [calc]
    expect((await c.delete(`/api/demo-clips/${ready.id}`)).status).toBe(204);
    expect((await storedFiles()).filter((f) => f.includes(`clip-${ready.id}`))).toEqual([]);
  }, 90_000);

  it('one clip per exercise: a second is refused 409 before its body is read', async () => {
    const res = await upload(c, planned, await phoneClip(path.join(work.dir, 'second.mp4'), 1, '320x240', 25));
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('demo_clip_exists');
  }, 60_000);

  it('a clip over 30 s is refused 422 clip_too_long, leaving no row, no file and no temp file', async () => {
    const long = path.join(work.dir, 'long.mp4');
    await makeClip(long, { width: 160, height: 120, fps: 5, seconds: 31 });
    const before = await storedFiles();
    const res = await upload(c, unplanned, long);
    expect(res.status).toBe(422);
    expect(res.body.error.code).toBe('clip_too_long');
    expect(res.body.error.message).toMatch(/31 s long; a demonstration clip is at most 30 s/);
    expect(await t.db('demo_clips').where({ exercise_id: unplanned }).first()).toBeUndefined();
    expect(await storedFiles()).toEqual(before);
    expect(uploadTemps()).toEqual([]);
  }, 60_000);

  it('a text file named .mp4 is refused 422 not_video, leaving nothing', async () => {
    const fake = path.join(work.dir, 'notes.mp4');
    fs.writeFileSync(fake, 'These are my notes, not a video.\n'.repeat(50));
    const before = await storedFiles();
    const res = await upload(c, unplanned, fake);
    expect(res.status).toBe(422);
    expect(res.body.error.code).toBe('not_video');
    expect(await t.db('demo_clips').where({ exercise_id: unplanned }).first()).toBeUndefined();
    expect(await storedFiles()).toEqual(before);
  });

  it('who sees it: the athlete not for an exercise on no plan of theirs, another clinic never (404); captions and place by staff', async () => {
    const res = await upload(c, unplanned, await phoneClip(path.join(work.dir, 'unplanned.mp4'), 1, '320x240', 25));
    expect(res.status).toBe(201);
    expect((await a.get(`/api/exercises/${unplanned}/demonstrations`)).status).toBe(404);
    expect((await a.get(`/api/demo-clips/${res.body.id}/poster.jpg`)).status).toBe(404);
    expect((await other.get(clip.videoUrl!)).status).toBe(404);
    expect((await other.patch(`/api/demo-clips/${clip.id}`, { caption: 'x' })).status).toBe(404);
    expect((await a.patch(`/api/demo-clips/${clip.id}`, { caption: 'x' })).status).toBe(403);
    const moved = await c.patch(`/api/demo-clips/${clip.id}`, { caption: 'Heels below the step', position: 0 });
    expect(moved.body).toMatchObject({ caption: 'Heels below the step', position: 0 });
    expect((await c.patch(`/api/demo-clips/${clip.id}`, { caption: 'two\nlines' })).status).toBe(422);
    expect((await c.patch(`/api/demo-clips/${clip.id}`, { position: 9 })).status).toBe(422);
  }, 60_000);
});
