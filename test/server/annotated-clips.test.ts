/**
 * Annotated clips through the API: made from the review (a frame range) and from the comparison
 * (side by side), rendered as a processed item with progress on the athlete's one progress stream, published with an e-mail notice, played with
 * byte ranges, refused with clear 4xx answers, and hidden (404) from athletes who may not see them.
 * References outside the project: ffprobe (Debian's) for the served file; the synthetic runner's
 * ground truth (scripts/demo-clip) for frame counts and initial contacts; the slow-motion rule as
 * documented in src/kinematics/slow-motion.ts, recomputed by hand ([calc]).
 */
import path from 'node:path';
import fs from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeTestApp, OTHER, signedIn, storedNames, type Client, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { ffprobeCounted, makeClip, tempDir } from './media/fixtures';
import { generateRunnerClip, type GroundTruth } from '../../scripts/demo-clip/clip';
import { marksFromTruth } from '../../scripts/demo-clip/demo-marks';
import type { AnnotatedClip } from '../../src/contracts/annotated-clips';
import type { ProcessingEvent } from '../../src/contracts/processing';

const [, coach, , athlete] = DEMO_SIGN_INS;
let t: TestApp;
let c: Client;
let ada: Client;
let dir: { dir: string; cleanup: () => Promise<void> };
let adaId: number;
let baselineClipId: number;
let retestClipId: number;
let longClipId: number;
let truth: GroundTruth;

async function upload(assessmentId: number, file: string): Promise<number> {
  const res = await c.agent
    .post(`/api/assessments/${assessmentId}/clips`)
    .set('X-XSRF-TOKEN', await c.xsrf())
    .attach('file', file);
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.id;
}

async function settled(id: number, as: Client = c): Promise<AnnotatedClip> {
  await t.worker!.idle();
  const res = await as.get(`/api/annotated-clips/${id}`);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body as AnnotatedClip;
}

beforeAll(async () => {
  dir = await tempDir('annotated-clips');
  t = await makeTestApp();
  c = await signedIn(t.app, coach.email, coach.password);
  ada = await signedIn(t.app, athlete.email, athlete.password);
  adaId = (await t.db('athletes').where({ email: athlete.email }).first()).id;
  const baselineId = (await t.db('assessments').where({ athlete_id: adaId, kind: 'baseline' }).first()).id;
  const retestId = (await t.db('assessments').where({ athlete_id: adaId, kind: 'retest' }).first()).id;
  const file = path.join(dir.dir, 'runner.mp4');
  truth = await generateRunnerClip({
    fps: 60,
    width: 320,
    height: 180,
    seconds: 2,
    hipExtensionDeg: 8,
    facing: 'right',
    beltSpeedMps: 3,
    outFile: file,
    preset: 'ultrafast',
  });
  baselineClipId = await upload(baselineId, file);
  retestClipId = await upload(retestId, file);
  // 1,020 frames: past the limit of 1,000 source frames.
  longClipId = await upload(retestId, await makeClip(path.join(dir.dir, 'long.mp4'), { fps: 120, width: 160, height: 90, seconds: 8.5 }));
  await t.worker!.idle();
  for (const id of [baselineClipId, retestClipId]) {
    await c.patch(`/api/clips/${id}`, { nearSide: truth.nearSide, direction: 'left_to_right' });
    const res = await c.put(`/api/clips/${id}/annotations`, marksFromTruth(truth, 'events'));
    expect(res.status, JSON.stringify(res.body).slice(0, 300)).toBe(200);
  }
}, 240_000);
afterAll(async () => {
  await t?.close();
  await dir?.cleanup();
});

describe('an annotated clip from the review', () => {
  let made: AnnotatedClip;
  const events: ProcessingEvent[] = [];

  beforeAll(async () => {
    const stop = t.processing.channel.subscribe(adaId, (n) => {
      if (n.event.subject === 'annotated_clip') events.push(n.event);
    });
    const res = await c.post(`/api/clips/${baselineClipId}/annotated-clips`, {
      fromFrame: 10,
      toFrame: 69,
      factor: 0.25,
      caption: 'SECRET-CAPTION: hip drive at toe-off',
      showAngles: true,
    });
    expect(res.status, JSON.stringify(res.body)).toBe(202);
    expect(res.body).toMatchObject({ status: 'rendering', kind: 'single', factor: 0.25, publishedAt: null });
    made = await settled(res.body.id);
    stop();
  }, 120_000);

  it('reports its render on the athlete’s progress stream: queued, running with progress, ready', () => {
    const mine = events.filter((e) => e.id === made.id);
    expect(mine.every((e) => e.kind === 'render_annotated_clip')).toBe(true);
    expect(mine[0]).toMatchObject({ state: 'queued' });
    const running = mine.filter((e) => e.state === 'running' && e.progress);
    expect(running.length).toBeGreaterThan(0);
    // Hundredths, rising (the renderer reports at least every 2 % of the steps).
    const done = running.map((e) => e.progress!.done);
    expect(running.every((e) => e.progress!.total === 100)).toBe(true);
    expect(done).toEqual([...done].sort((a, b) => a - b));
    expect(mine[mine.length - 1]).toMatchObject({ state: 'ready', error: null });
  });

  it('is rendered with progress to ready, and says which landmarks were interpolated', () => {
    // 60 fps at 1/4 shows 15 source frames a second: ⌈24 ÷ 15⌉ = 2 copies → 30 fps; 60 frames → 120 video frames, 4 s.
    expect(made).toMatchObject({ status: 'ready', progress: 1, error: null, frameCount: 120, fps: 30, repeat: 2, durationS: 4 });
    expect(made.panels).toEqual([expect.objectContaining({ clipId: baselineClipId, fromFrame: 10, toFrame: 69 })]);
    // Marked on event frames only: the rest of the range is interpolated, and the clip says so.
    const marked = new Set(marksFromTruth(truth, 'events').landmarks.map((l) => l.frame));
    const inRange = [...marked].filter((f) => f >= 10 && f <= 69).length;
    expect(made.note).toBe(`Landmarks marked on ${inRange} frames and interpolated between marked frames on ${60 - inRange}.`);
  });

  it('serves an MP4 privately, with byte ranges for phone players; ffprobe counts its frames', async () => {
    const res = await c.agent.get(made.videoUrl).buffer(true);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('video/mp4');
    expect(res.headers['cache-control']).toContain('private');
    expect(res.headers['accept-ranges']).toBe('bytes');
    const file = path.join(dir.dir, 'served.mp4');
    fs.writeFileSync(file, res.body as Buffer);
    const probe = await ffprobeCounted(file);
    expect(probe.nbReadFrames).toBe(120);
    const part = await c.agent.get(made.videoUrl).set('Range', 'bytes=0-99').buffer(true);
    expect(part.status).toBe(206);
    expect((part.body as Buffer).length).toBe(100);
    const size = (res.body as Buffer).length;
    // RFC 9110 §14.4: the answer names the bytes sent and the whole length; they are the file's own bytes.
    expect(part.headers['content-range']).toBe(`bytes 0-99/${size}`);
    const tail = await c.agent
      .get(made.videoUrl)
      .set('Range', `bytes=${size - 10}-`)
      .buffer(true);
    expect(tail.status).toBe(206);
    expect((tail.body as Buffer).equals((res.body as Buffer).subarray(size - 10))).toBe(true);
    // RFC 9110 §15.5.17: a range wholly past the end is 416 with the length, never a 500.
    const outside = await c.agent.get(made.videoUrl).set('Range', `bytes=${size + 5}-${size + 10}`);
    expect(outside.status).toBe(416);
    expect(outside.headers['content-range']).toBe(`bytes */${size}`);
  });

  it('is hidden from the athlete until published; publishing sends one notice without caption or measures', async () => {
    expect((await ada.get(`/api/annotated-clips/${made.id}`)).status).toBe(404);
    expect((await ada.agent.get(made.videoUrl)).status).toBe(404);
    expect((await ada.get(`/api/athletes/${adaId}/annotated-clips`)).body.clips).toEqual([]);
    const sentBefore = t.mailer.sent.length;
    const pub = await c.post(`/api/annotated-clips/${made.id}/publish`, {});
    expect(pub.status).toBe(200);
    expect(pub.body.publishedAt).not.toBeNull();
    const mail = t.mailer.sent.slice(sentBefore);
    expect(mail).toHaveLength(1);
    expect(mail[0]!.to).toBe(athlete.email);
    expect(mail[0]!.text).toContain('/portal');
    expect(mail[0]!.text).not.toContain('SECRET-CAPTION');
    expect(mail[0]!.text).not.toMatch(/°|hip|knee|ankle/i);
    // Publishing again sends nothing more.
    await c.post(`/api/annotated-clips/${made.id}/publish`, {});
    expect(t.mailer.sent.length).toBe(sentBefore + 1);
    // The athlete now lists and plays it.
    expect((await ada.get(`/api/athletes/${adaId}/annotated-clips`)).body.clips.map((x: AnnotatedClip) => x.id)).toEqual([made.id]);
    expect((await ada.agent.get(made.videoUrl)).status).toBe(200);
    // Unpublished again: gone for the athlete.
    expect((await c.post(`/api/annotated-clips/${made.id}/unpublish`, {})).status).toBe(200);
    expect((await ada.agent.get(made.videoUrl)).status).toBe(404);
  });

  it('answers 404 to another clinic and to another athlete of the clinic', async () => {
    await c.post(`/api/annotated-clips/${made.id}/publish`, {});
    const other = await signedIn(t.app, OTHER.coach.email, OTHER.coach.password);
    expect((await other.get(`/api/annotated-clips/${made.id}`)).status).toBe(404);
    expect((await other.agent.get(made.videoUrl)).status).toBe(404);
    expect((await other.post(`/api/annotated-clips/${made.id}/publish`, {})).status).toBe(404);
    const otherAthlete = await signedIn(t.app, OTHER.athlete.email, OTHER.athlete.password);
    expect((await otherAthlete.get(`/api/annotated-clips/${made.id}`)).status).toBe(404);
    expect((await otherAthlete.agent.get(made.videoUrl)).status).toBe(404);
    // Another athlete of the same clinic: Ada's clip is not theirs.
    const teodor = await t.db('athletes').where({ email: 'teodor.brannick@runner.test' }).first();
    expect((await c.get(`/api/athletes/${teodor.id}/annotated-clips`)).body.clips).toEqual([]);
  });
});

describe('bad input for annotated clips', () => {
  const count = async () => (await t.db('annotated_clips').count<{ n: number }[]>('id as n'))[0]!.n;

  it('refuses more than 1,000 source frames with the limit in the message, writing nothing', async () => {
    const before = await count();
    const res = await c.post(`/api/clips/${longClipId}/annotated-clips`, {
      fromFrame: 0,
      toFrame: 1000,
      factor: 1,
      caption: '',
      showAngles: false,
    });
    expect(res.status).toBe(422);
    expect(res.body.error.message).toBe('That range has 1001 frames; an annotated clip can cover at most 1000. Choose a shorter range.');
    expect(res.body.error.details[0].path).toEqual(['toFrame']);
    expect(await count()).toBe(before);
  });

  it('refuses a speed outside the four, frames outside the clip and a reversed range (422 with the field)', async () => {
    const before = await count();
    const speed = await c.post(`/api/clips/${baselineClipId}/annotated-clips`, { fromFrame: 0, toFrame: 5, factor: 0.3, caption: '' });
    expect(speed.status).toBe(422);
    expect(speed.body.error.details[0].path).toEqual(['factor']);
    const outside = await c.post(`/api/clips/${baselineClipId}/annotated-clips`, { fromFrame: 0, toFrame: truth.frameCount, factor: 1 });
    expect(outside.status).toBe(422);
    expect(outside.body.error.message).toBe(`Choose frames from 0 to ${truth.frameCount - 1}.`);
    const reversed = await c.post(`/api/clips/${baselineClipId}/annotated-clips`, { fromFrame: 9, toFrame: 3, factor: 1 });
    expect(reversed.status).toBe(422);
    const caption = await c.post(`/api/clips/${baselineClipId}/annotated-clips`, {
      fromFrame: 0,
      toFrame: 3,
      factor: 1,
      caption: 'x'.repeat(281),
    });
    expect(caption.status).toBe(422);
    expect(await count()).toBe(before);
  });

  it('refuses side by side without initial contacts to line up, and clips of another athlete', async () => {
    const before = await count();
    const none = await c.post(`/api/athletes/${adaId}/side-by-side-clips`, {
      baselineClipId,
      retestClipId: longClipId,
      factor: 1,
      caption: '',
    });
    expect(none.status).toBe(422);
    expect(none.body.error.code).toBe('no_initial_contacts');
    const teodor = await t.db('athletes').where({ email: 'teodor.brannick@runner.test' }).first();
    const wrong = await c.post(`/api/athletes/${teodor.id}/side-by-side-clips`, { baselineClipId, retestClipId, factor: 1, caption: '' });
    expect(wrong.status).toBe(422);
    expect(wrong.body.error.details[0].path).toEqual(['baselineClipId']);
    expect(await count()).toBe(before);
  });
});

describe('side by side from the comparison', () => {
  it('covers the Baseline from its first to its last initial contact, Re-test frames warped to line up', async () => {
    const res = await c.post(`/api/athletes/${adaId}/side-by-side-clips`, {
      baselineClipId,
      retestClipId,
      factor: 0.5,
      caption: 'Then and now',
    });
    expect(res.status, JSON.stringify(res.body)).toBe(202);
    const made = await settled(res.body.id);
    // Both sides' initial contacts from the generator's truth, in order.
    const contacts = [...truth.events.near.initialContact, ...truth.events.far.initialContact].sort((a, b) => a - b);
    const first = contacts[0]!;
    const last = contacts[contacts.length - 1]!;
    expect(made).toMatchObject({ status: 'ready', kind: 'side_by_side', error: null });
    expect(made.panels.map((p) => p.clipId)).toEqual([baselineClipId, retestClipId]);
    // The same runner on both: the warp maps each frame to itself.
    expect(made.panels[0]).toMatchObject({ fromFrame: first, toFrame: last });
    expect(made.panels[1]).toMatchObject({ fromFrame: first, toFrame: last });
    // 60 fps at 1/2 = 30 a second: one video frame per Baseline frame.
    expect(made.frameCount).toBe(last - first + 1);
  }, 120_000);
});

/** The stored videos of annotated clip `id` of clip `clipId` (in the app's store, local or bucket). */
async function annotatedVideos(clipId: number, id: number): Promise<string[]> {
  return (await storedNames(t.store, `clips/${clipId}/annotated/`)).filter((f) => f.startsWith(`${id}-`));
}

describe('delete', () => {
  it('removes the row and the video; the id answers 404 afterwards', async () => {
    const res = await c.post(`/api/clips/${retestClipId}/annotated-clips`, { fromFrame: 0, toFrame: 9, factor: 1, caption: '' });
    const made = await settled(res.body.id);
    const videos = () => annotatedVideos(retestClipId, made.id);
    expect(await videos()).toHaveLength(1);
    expect((await c.delete(`/api/annotated-clips/${made.id}`)).status).toBe(204);
    expect(await videos()).toHaveLength(0);
    expect((await c.get(`/api/annotated-clips/${made.id}`)).status).toBe(404);
  }, 60_000);
});

describe('a side-by-side clip whose Baseline clip is deleted', () => {
  it('shows as failed with the reason, cannot be played or published, and deletes with its video', async () => {
    const retestId = (await t.db('clips').where({ id: retestClipId }).first()).assessment_id;
    const file = path.join(dir.dir, 'runner.mp4');
    const spareId = await upload(retestId, file);
    await t.worker!.idle();
    await c.patch(`/api/clips/${spareId}`, { nearSide: truth.nearSide, direction: 'left_to_right' });
    await c.put(`/api/clips/${spareId}/annotations`, marksFromTruth(truth, 'events'));
    const res = await c.post(`/api/athletes/${adaId}/side-by-side-clips`, {
      baselineClipId: spareId,
      retestClipId,
      factor: 1,
      caption: '',
    });
    expect(res.status, JSON.stringify(res.body)).toBe(202);
    const made = await settled(res.body.id);
    expect(made.status).toBe('ready');
    await c.post(`/api/annotated-clips/${made.id}/publish`, {});
    expect((await c.delete(`/api/clips/${spareId}`)).status).toBe(204);

    const after = (await c.get(`/api/annotated-clips/${made.id}`)).body as AnnotatedClip;
    expect(after).toMatchObject({
      status: 'failed',
      error: expect.stringContaining('Baseline clip of this side-by-side clip was deleted'),
    });
    expect((await c.agent.get(after.videoUrl)).status).toBe(404);
    expect((await ada.get(`/api/annotated-clips/${made.id}`)).status).toBe(404);
    expect((await c.post(`/api/annotated-clips/${made.id}/unpublish`, {})).status).toBe(200);
    const pub = await c.post(`/api/annotated-clips/${made.id}/publish`, {});
    expect(pub.status).toBe(409);
    const videos = () => annotatedVideos(retestClipId, made.id);
    expect(await videos()).toHaveLength(1);
    expect((await c.delete(`/api/annotated-clips/${made.id}`)).status).toBe(204);
    expect(await videos()).toHaveLength(0);
  }, 120_000);
});
