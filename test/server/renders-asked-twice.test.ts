/**
 * A still or an annotated clip asked for again while it renders (a double click, a retry after a lost
 * answer) is that one, not a second render: identical means the same clip and frame(s) with the same
 * marks frozen, the same caption, angles (and speed), and it is still rendering. A different caption,
 * other marks, or the same request once it is ready make another. Media is checked with ffprobe by
 * the render suites; here we count rows, queued items and audit entries.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import path from 'node:path';
import { makeClip, tempDir } from './media/fixtures';
import { baselineVisit, intakeWith } from '../support/bodies';
import { makeTestApp, signedIn, type Client, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';

const [, coachCred] = DEMO_SIGN_INS;
let t: TestApp;
let coach: Client;
let dir: { dir: string; cleanup: () => Promise<void> };
let clipId: number;

beforeAll(async () => {
  t = await makeTestApp({}, { fakeSmtp: false });
  coach = await signedIn(t.app, coachCred.email, coachCred.password);
  dir = await tempDir('renders-twice');
  const file = await makeClip(path.join(dir.dir, 'run.mp4'), { fps: 30, width: 160, height: 90, seconds: 1 });
  const a = await coach.post('/api/athletes', { firstName: 'Odile', lastName: 'Racer', email: 'odile@runner.test' });
  expect((await coach.put(`/api/athletes/${a.body.id}/intake`, intakeWith({ videoRecording: true, shareStills: true }))).status).toBe(200);
  const v = await coach.post(`/api/athletes/${a.body.id}/assessments`, baselineVisit());
  const clip = await coach.agent
    .post(`/api/assessments/${v.body.id}/clips`)
    .set('X-XSRF-TOKEN', await coach.xsrf())
    .attach('file', file);
  expect(clip.status).toBe(201);
  clipId = clip.body.id;
  await t.worker!.idle();
}, 60_000);

afterAll(async () => {
  await t?.close();
  await dir?.cleanup();
});

const itemsOf = (subjectType: string, ids: number[]) =>
  t.db('processed_items').where({ subject_type: subjectType }).whereIn('subject_id', ids);

describe('a still asked for more than once while it renders', () => {
  it('three identical requests at once make one still (one render queued, one audit entry); another caption makes another', async () => {
    const body = { frameIndex: 3, caption: 'Toe-off', showAngles: false };
    const answers = await Promise.all([1, 2, 3].map(() => coach.post(`/api/clips/${clipId}/stills`, body)));
    expect(answers.map((r) => r.status)).toEqual([202, 202, 202]);
    expect(new Set(answers.map((r) => r.body.id)).size).toBe(1);
    const other = await coach.post(`/api/clips/${clipId}/stills`, { ...body, caption: 'Toe-off, right' });
    expect(other.status).toBe(202);
    expect(other.body.id).not.toBe(answers[0]!.body.id);
    await t.worker!.idle();
    const ids = [answers[0]!.body.id, other.body.id];
    expect((await t.db('stills').whereIn('id', ids)).map((r) => r.status)).toEqual(['ready', 'ready']);
    expect(await t.db('stills').where({ clip_id: clipId })).toHaveLength(2);
    expect(await itemsOf('still', ids)).toHaveLength(2);
    expect(await t.db('audit_log').where({ action: 'still.created' }).whereLike('detail', `%"clipId":${clipId}%`)).toHaveLength(2);
  });

  it('the same request once the first is ready makes another (a deliberate second still); another frame or angles too', async () => {
    const before = (await t.db('stills').where({ clip_id: clipId })).length;
    const body = { frameIndex: 3, caption: 'Toe-off', showAngles: false };
    const again = await coach.post(`/api/clips/${clipId}/stills`, body);
    expect(again.status).toBe(202);
    const [frame, angles] = await Promise.all([
      coach.post(`/api/clips/${clipId}/stills`, { ...body, frameIndex: 4 }),
      coach.post(`/api/clips/${clipId}/stills`, { ...body, showAngles: true }),
    ]);
    expect(new Set([again.body.id, frame.body.id, angles.body.id]).size).toBe(3);
    await t.worker!.idle();
    expect(await t.db('stills').where({ clip_id: clipId })).toHaveLength(before + 3);
  });

  it('marks changed between two requests make two stills (the frozen marks differ)', async () => {
    const body = { frameIndex: 5, caption: 'Contact', showAngles: true };
    const first = await coach.post(`/api/clips/${clipId}/stills`, body);
    await t.db('stills').where({ id: first.body.id }).update({ status: 'rendering' });
    const panels = JSON.parse((await t.db('stills').where({ id: first.body.id }).first()).panels);
    // As if a landmark had been placed on frame 5 since: the stored panel no longer matches what is asked now.
    panels[0].landmarks = [{ frame: 5, joint: 'hip', x: 10, y: 10 }];
    await t
      .db('stills')
      .where({ id: first.body.id })
      .update({ panels: JSON.stringify(panels) });
    const second = await coach.post(`/api/clips/${clipId}/stills`, body);
    expect(second.status).toBe(202);
    expect(second.body.id).not.toBe(first.body.id);
    await t.worker!.idle();
  });
});

describe('an annotated clip asked for more than once while it renders', () => {
  it('three identical requests at once make one clip (one render queued, one audit entry); another caption or speed makes another', async () => {
    const body = { fromFrame: 0, toFrame: 9, factor: 0.5, caption: 'Stance', showAngles: false };
    const answers = await Promise.all([1, 2, 3].map(() => coach.post(`/api/clips/${clipId}/annotated-clips`, body)));
    expect(answers.map((r) => r.status)).toEqual([202, 202, 202]);
    expect(new Set(answers.map((r) => r.body.id)).size).toBe(1);
    const [caption, speed] = await Promise.all([
      coach.post(`/api/clips/${clipId}/annotated-clips`, { ...body, caption: 'Stance, left' }),
      coach.post(`/api/clips/${clipId}/annotated-clips`, { ...body, factor: 0.25 }),
    ]);
    const ids = [answers[0]!.body.id, caption.body.id, speed.body.id];
    expect(new Set(ids).size).toBe(3);
    await t.worker!.idle();
    expect((await t.db('annotated_clips').whereIn('id', ids)).map((r) => r.status)).toEqual(['ready', 'ready', 'ready']);
    expect(await t.db('annotated_clips').where({ clip_id: clipId })).toHaveLength(3);
    expect(await itemsOf('annotated_clip', ids)).toHaveLength(3);
    expect(await t.db('audit_log').where({ action: 'annotated_clip.created' })).toHaveLength(3);
  });
});
