/**
 * Frames marker following could not follow a marker on, through the API: a finished follow run
 * (saved by the same `saveFollowRun` the follow kind calls, with a follower result written by
 * hand) keeps them beside the followed points; the annotations read gives them to the review; a
 * coach placing the marker on such a frame clears that frame only; the next run over the frames
 * replaces them; access is the annotations' own.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { annotationsService } from '../../../server/annotations/annotations-service';
import { saveFollowRun } from '../../../server/follow/follow-kind';
import { notFollowedAfterFollow } from '../../../server/follow/follow-plan';
import type { FollowedPoint, LostPoint } from '../../../server/follow/marker-follower';
import { DEMO_SIGN_INS } from '../../../seeds/demo-scenario';
import type { ClipAnnotations, FrameLandmarks, NotFollowedPoint } from '../../../src/contracts/annotations';
import { makeTestApp, OTHER, signedIn, type Client, type TestApp } from '../../support/test-app';
import { makeClip, tempDir } from '../media/fixtures';

const [, coach, , athlete] = DEMO_SIGN_INS;
const size = { width: 320, height: 180 };
let t: TestApp;
let c: Client;
let dir: { dir: string; cleanup: () => Promise<void> };
let clipId: number;
let actor: { id: number; name: string; clinicId: number };

beforeAll(async () => {
  dir = await tempDir('not-followed');
  t = await makeTestApp();
  c = await signedIn(t.app, coach.email, coach.password);
  const ada = await t.db('athletes').where({ email: athlete.email }).first();
  const assessmentId = (await t.db('assessments').where({ athlete_id: ada.id, kind: 'baseline' }).first()).id;
  const file = await makeClip(path.join(dir.dir, 'plain.mp4'), { fps: 30, width: size.width, height: size.height, seconds: 1 });
  const res = await c.agent
    .post(`/api/assessments/${assessmentId}/clips`)
    .set('X-XSRF-TOKEN', await c.xsrf())
    .attach('file', file);
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  clipId = res.body.id;
  await t.worker!.idle();
  const u = await t.db('users').where({ email: coach.email }).first();
  actor = { id: u.id, name: u.name, clinicId: u.clinic_id };
}, 120_000);
afterAll(async () => {
  await t?.close();
  await dir?.cleanup();
});

const read = async (client = c) => (await client.get(`/api/clips/${clipId}/annotations`)).body as ClipAnnotations;
const START = 5;
const startRow: FrameLandmarks = {
  frame: START,
  side: 'right',
  points: { knee: { x: 0.5, y: 0.5 }, ankle: { x: 0.5, y: 0.7 } },
};

/** A follower result over `from`–`to`: the knee followed everywhere, the ankle lost on `lostAnkle`. */
function result(from: number, to: number, lostAnkle: LostPoint[]) {
  const lostFrames = new Set(lostAnkle.map((l) => l.frame));
  const knee: FollowedPoint[] = [];
  const ankle: FollowedPoint[] = [];
  for (let f = from; f <= to; f++) {
    if (f === START) continue;
    knee.push({ frame: f, x: 160, y: 90, confidence: 0.9 });
    if (!lostFrames.has(f)) ankle.push({ frame: f, x: 160, y: 126, confidence: 0.8 });
  }
  return {
    points: new Map([
      ['right knee', knee],
      ['right ankle', ankle],
    ]),
    lost: new Map<string, LostPoint[]>([
      ['right knee', []],
      ['right ankle', lostAnkle],
    ]),
    lowConfidenceFrames: [],
    repeatedFrames: [],
  };
}

describe('frames not followed', () => {
  it('a follow run keeps its lost frames with the followed points; the annotations read gives them, with their reasons', async () => {
    const saved = await c.put(`/api/clips/${clipId}/annotations`, { baseRevision: 0, landmarks: [startRow], events: [], scale: null });
    expect(saved.status, JSON.stringify(saved.body)).toBe(200);
    expect(saved.body.notFollowed).toEqual([]);
    const annotations = annotationsService({ db: t.db, clips: null as never, validateEvents: () => [] });
    await saveFollowRun(
      annotations,
      actor,
      clipId,
      { startFrame: START, from: 0, to: 29 },
      size,
      result(0, 29, [
        { frame: 12, reason: 'not_found' },
        { frame: 13, reason: 'broke_links' },
        { frame: 20, reason: 'on_other_marker' },
      ]),
    );
    const after = await read();
    expect(after.notFollowed).toEqual([
      { frame: 12, side: 'right', landmark: 'ankle', reason: 'not_found' },
      { frame: 13, side: 'right', landmark: 'ankle', reason: 'broke_links' },
      { frame: 20, side: 'right', landmark: 'ankle', reason: 'on_other_marker' },
    ]);
    // The lost frames have no ankle point; the knee is followed there.
    const row12 = after.landmarks.find((l) => l.frame === 12 && l.side === 'right')!;
    expect(row12.points.ankle).toBeUndefined();
    expect(row12.points.knee?.origin).toBe('followed');
  });

  it('placing the marker by hand on one such frame clears that frame only; a followed point sent there does not', async () => {
    const before = await read();
    const landmarks = before.landmarks.map((l) =>
      l.frame === 12 && l.side === 'right'
        ? { ...l, points: { ...l.points, ankle: { x: 0.51, y: 0.71 } } }
        : l.frame === 13 && l.side === 'right'
          ? { ...l, points: { ...l.points, ankle: { x: 0.5, y: 0.7, origin: 'followed' as const, confidence: 0.2 } } }
          : l,
    );
    const res = await c.put(`/api/clips/${clipId}/annotations`, {
      baseRevision: before.revision,
      landmarks,
      events: before.events,
      scale: before.scale,
    });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const left: NotFollowedPoint[] = [
      { frame: 13, side: 'right', landmark: 'ankle', reason: 'broke_links' },
      { frame: 20, side: 'right', landmark: 'ankle', reason: 'on_other_marker' },
    ];
    expect(res.body.notFollowed).toEqual(left);
    expect((await read()).notFollowed).toEqual(left);
    const audit = await t.db('audit_log').where({ action: 'clip.annotated' }).orderBy('id', 'desc').first();
    expect(JSON.parse(audit.detail).notFollowedChecked).toBe(1);
  });

  it('is read-only in a save: a body carrying its own list is refused (422) and the list stays', async () => {
    const before = await read();
    const res = await c.put(`/api/clips/${clipId}/annotations`, {
      baseRevision: before.revision,
      landmarks: before.landmarks,
      events: before.events,
      scale: before.scale,
      notFollowed: [],
    });
    expect(res.status).toBe(422);
    expect((await read()).notFollowed).toEqual(before.notFollowed);
  });

  it('the next follow run replaces the frames of its markers inside its range, and keeps the rest', async () => {
    const annotations = annotationsService({ db: t.db, clips: null as never, validateEvents: () => [] });
    // Over 0–15 only: frame 13 is followed this time, 14 is lost; frame 20 lies outside and stays.
    await saveFollowRun(
      annotations,
      actor,
      clipId,
      { startFrame: START, from: 0, to: 15 },
      size,
      result(0, 15, [{ frame: 14, reason: 'not_found' }]),
    );
    expect((await read()).notFollowed).toEqual([
      { frame: 14, side: 'right', landmark: 'ankle', reason: 'not_found' },
      { frame: 20, side: 'right', landmark: 'ankle', reason: 'on_other_marker' },
    ]);
  });

  it('a run that finds what the last one lost removes those entries in one statement, not one each (a long clip has tens of thousands)', async () => {
    const annotations = annotationsService({ db: t.db, clips: null as never, validateEvents: () => [] });
    const range = { startFrame: START, from: 0, to: 29 };
    const everyFrame = Array.from({ length: 30 }, (_, f) => f).filter((f) => f !== START);
    await saveFollowRun(
      annotations,
      actor,
      clipId,
      range,
      size,
      result(
        0,
        29,
        everyFrame.map((frame) => ({ frame, reason: 'not_found' })),
      ),
    );
    // Every frame but 12, where the ankle was placed by hand above.
    expect((await read()).notFollowed).toHaveLength(everyFrame.length - 1);
    const deletes: string[] = [];
    const count = (q: { sql: string }) => {
      if (/^delete\b/i.test(q.sql) && q.sql.includes('clip_not_followed')) deletes.push(q.sql);
    };
    t.db.on('query', count);
    try {
      await saveFollowRun(annotations, actor, clipId, range, size, result(0, 29, []));
    } finally {
      t.db.off('query', count);
    }
    expect((await read()).notFollowed).toEqual([]);
    // Back as the tests below expect it: frames 14 and 20 lost as before.
    await saveFollowRun(
      annotations,
      actor,
      clipId,
      range,
      size,
      result(0, 29, [
        { frame: 14, reason: 'not_found' },
        { frame: 20, reason: 'on_other_marker' },
      ]),
    );
    expect((await read()).notFollowed).toHaveLength(2);
    expect(deletes).toHaveLength(1);
  });

  it('is read like the annotations: the athlete 403, another clinic 404, neither can clear it', async () => {
    const a = await signedIn(t.app, athlete.email, athlete.password);
    const asAthlete = await a.get(`/api/clips/${clipId}/annotations`);
    expect(asAthlete.status).toBe(403);
    expect(asAthlete.body.notFollowed).toBeUndefined();
    const other = await signedIn(t.app, OTHER.coach.email, OTHER.coach.password);
    const asOther = await other.get(`/api/clips/${clipId}/annotations`);
    expect(asOther.status).toBe(404);
    expect(asOther.body.notFollowed).toBeUndefined();
    const before = await read();
    const body = { baseRevision: before.revision, landmarks: [], events: [], scale: null };
    expect((await a.put(`/api/clips/${clipId}/annotations`, body)).status).toBe(403);
    expect((await other.put(`/api/clips/${clipId}/annotations`, body)).status).toBe(404);
    expect((await read()).notFollowed).toHaveLength(2);
  });

  it('goes with the clip when it is deleted', async () => {
    expect((await c.delete(`/api/clips/${clipId}`)).status).toBe(204);
    expect(await t.db('clip_not_followed').where({ clip_id: clipId }).count({ n: '*' })).toEqual([{ n: 0 }]);
  });
});

describe('notFollowedAfterFollow', () => {
  it('leaves other markers and frames outside the range alone, sorted as the database reads them', () => {
    const stored: NotFollowedPoint[] = [
      { frame: 3, side: 'right', landmark: 'ankle', reason: 'not_found' },
      { frame: 8, side: 'left', landmark: 'toe', reason: 'not_found' },
      { frame: 9, side: 'right', landmark: 'ankle', reason: 'broke_links' },
    ];
    const run = {
      points: new Map([['right ankle', []]]),
      lost: new Map([['right ankle', [{ frame: 7, reason: 'on_other_marker' as const }]]]),
    };
    expect(notFollowedAfterFollow(stored, run, { from: 5, to: 10 })).toEqual([
      { frame: 3, side: 'right', landmark: 'ankle', reason: 'not_found' },
      { frame: 7, side: 'right', landmark: 'ankle', reason: 'on_other_marker' },
      { frame: 8, side: 'left', landmark: 'toe', reason: 'not_found' },
    ]);
  });
});
