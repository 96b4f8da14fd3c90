/**
 * Annotation saves as the review workspace's autosave makes them, with the database on disk (the
 * stored marks are read on the reader connection and kept from the last save): concurrent saves
 * keep revision semantics, a save writes only the rows that changed, its answer is what a read
 * returns, and marks changed elsewhere (another process) are never overwritten from memory.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeTestApp, signedIn, type Client, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { makeClip, tempDir } from './media/fixtures';
import type { ClipAnnotations, ClipAnnotationsWrite, FrameLandmarks } from '../../src/contracts/annotations';

const [, coach, ilse, athlete] = DEMO_SIGN_INS;
let t: TestApp;
let c: Client;
let other: Client;
let dir: { dir: string; cleanup: () => Promise<void> };
const clipIds: number[] = [];

beforeAll(async () => {
  dir = await tempDir('autosave');
  t = await makeTestApp({}, { onDisk: true });
  c = await signedIn(t.app, coach.email, coach.password);
  other = await signedIn(t.app, ilse.email, ilse.password);
  const ada = await t.db('athletes').where({ email: athlete.email }).first();
  const assessmentId = (await t.db('assessments').where({ athlete_id: ada.id, kind: 'baseline' }).first()).id;
  const file = await makeClip(path.join(dir.dir, 'plain.mp4'), { fps: 30, width: 160, height: 90, seconds: 1 });
  for (let i = 0; i < 4; i++) {
    const res = await c.agent
      .post(`/api/assessments/${assessmentId}/clips`)
      .set('X-XSRF-TOKEN', await c.xsrf())
      .attach('file', file);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    clipIds.push(res.body.id);
  }
  await t.worker!.idle();
}, 180_000);
afterAll(async () => {
  await t?.close();
  await dir?.cleanup();
});

const frame = (n: number, side: 'left' | 'right', x: number): FrameLandmarks => ({
  frame: n,
  side,
  points: { shoulder: { x, y: 0.2 }, hip: { x, y: 0.4 }, knee: { x, y: 0.6 }, ankle: { x, y: 0.8 } },
});
const doc = (baseRevision: number, x = 0.5): ClipAnnotationsWrite => ({
  baseRevision,
  landmarks: [frame(2, 'right', x), frame(2, 'left', x - 0.1), frame(10, 'right', x + 0.05)],
  events: [
    { frame: 2, side: 'right', kind: 'initial_contact' },
    { frame: 10, side: 'right', kind: 'toe_off' },
  ],
  scale: { frame: 0, a: { x: 0.1, y: 0.9 }, b: { x: 0.6, y: 0.9 }, lengthM: 1 },
});
const put = (client: Client, clipId: number, body: unknown) => client.put(`/api/clips/${clipId}/annotations`, body);

/** SQL statements run on the writer while `fn` runs. */
async function writes(fn: () => Promise<unknown>): Promise<string[]> {
  const seen: string[] = [];
  const listen = (q: { sql: string }) => seen.push(q.sql);
  t.db.on('query', listen);
  try {
    await fn();
  } finally {
    t.db.off('query', listen);
  }
  return seen.filter((s) => /^(insert|update|delete)/i.test(s));
}

describe('autosave', () => {
  it('saves racing from one base revision: exactly one is answered 200, the others 409 with the winner; the winner is stored', async () => {
    const clipId = clipIds[0]!;
    expect((await put(c, clipId, doc(0))).status).toBe(200);
    const bodies = [0.3, 0.4, 0.6, 0.7].map((x) => doc(1, x));
    const answers = await Promise.all(bodies.map((b, i) => put(i % 2 ? other : c, clipId, b)));
    const won = answers.map((a, i) => ({ a, i })).filter(({ a }) => a.status === 200);
    expect(won).toHaveLength(1);
    for (const a of answers.filter((x) => x.status !== 200)) {
      expect(a.status).toBe(409);
      expect(a.body.error.code).toBe('stale_revision');
      expect(a.body.error.details.current.revision).toBe(2);
    }
    const stored = (await c.get(`/api/clips/${clipId}/annotations`)).body as ClipAnnotations;
    expect(stored.revision).toBe(2);
    expect(stored.landmarks).toEqual(won[0]!.a.body.landmarks);
    expect(stored.landmarks[1]!.points.hip).toEqual({ x: bodies[won[0]!.i]!.landmarks[0]!.points.hip!.x, y: 0.4, origin: 'placed' });
    // Sequential saves on the answered revision go on: 3, 4.
    expect((await put(c, clipId, doc(2, 0.45))).body.revision).toBe(3);
    expect((await put(c, clipId, doc(3, 0.46))).body.revision).toBe(4);
  });

  it('moving one point writes that landmark row, the revision and the audit line, nothing else; the measures follow on their next read', async () => {
    const clipId = clipIds[1]!;
    expect((await put(c, clipId, doc(0))).status).toBe(200);
    const body = doc(1);
    body.landmarks[1]!.points.knee = { x: 0.33, y: 0.61 };
    let answer: { status: number; body: ClipAnnotations } | undefined;
    const sql = await writes(async () => (answer = await put(c, clipId, body)));
    expect(answer!.status).toBe(200);
    expect(sql.filter((s) => /clip_landmarks/.test(s))).toEqual([expect.stringMatching(/^update [`"]clip_landmarks[`"]/)]);
    expect(sql.filter((s) => /gait_events|scale_bars|angle_gauges|measure_snapshots/.test(s))).toEqual([]);
    // The measures are computed when next read, from the marks of the revision now stored.
    const measures = await c.get(`/api/clips/${clipId}/measures`);
    expect(measures.status).toBe(200);
    const snapshot = await t.db('measure_snapshots').where({ clip_id: clipId }).first();
    expect(snapshot.annotation_revision).toBe(2);
    expect((await t.db('clip_landmarks').where({ clip_id: clipId, frame: 2, side: 'left', landmark: 'knee' }).first()).x).toBe(0.33);
  });

  it('a followed point the coach sets down where it was: one landmark row updated to placed, its confidence cleared', async () => {
    const clipId = clipIds[1]!;
    const base = (await c.get(`/api/clips/${clipId}/annotations`)).body as ClipAnnotations;
    const followed = doc(base.revision);
    followed.landmarks[0]!.points.ankle = { x: 0.5, y: 0.8, origin: 'followed', confidence: 0.6 };
    expect((await put(c, clipId, followed)).status).toBe(200);
    const row = () => t.db('clip_landmarks').where({ clip_id: clipId, frame: 2, side: 'right', landmark: 'ankle' }).first();
    expect(await row()).toMatchObject({ origin: 'followed', confidence: 0.6 });
    const placed = doc(base.revision + 1);
    placed.landmarks[0]!.points.ankle = { x: 0.5, y: 0.8 };
    const sql = await writes(() => put(c, clipId, placed));
    expect(sql.filter((s) => /clip_landmarks/.test(s))).toEqual([expect.stringMatching(/^update [`"]clip_landmarks[`"]/)]);
    expect(await row()).toMatchObject({ origin: 'placed', confidence: null });
  });

  it('the answer is what a read returns, whatever order the body had (entries without points dropped)', async () => {
    const clipId = clipIds[2]!;
    const body = {
      baseRevision: 0,
      landmarks: [frame(10, 'right', 0.5), { frame: 4, side: 'left', points: {} }, frame(2, 'right', 0.5), frame(2, 'left', 0.4)],
      events: [
        { frame: 10, side: 'right', kind: 'toe_off' },
        { frame: 2, side: 'right', kind: 'initial_contact' },
        { frame: 2, side: 'left', kind: 'midstance' },
      ],
      scale: null,
      gauges: [
        { id: 'z', frame: 5, a: { x: 0.1, y: 0.1 }, vertex: { x: 0.5, y: 0.5 }, b: { x: 0.9, y: 0.1 } },
        { id: 'a', frame: 5, a: { x: 0.2, y: 0.1 }, vertex: { x: 0.5, y: 0.5 }, b: { x: 0.9, y: 0.1 } },
      ],
    };
    const saved = await put(c, clipId, body);
    expect(saved.status, JSON.stringify(saved.body)).toBe(200);
    const read = (await c.get(`/api/clips/${clipId}/annotations`)).body;
    expect(saved.body).toEqual(read);
    expect(read.landmarks.map((l: FrameLandmarks) => `${l.frame}${l.side}`)).toEqual(['2left', '2right', '10right']);
  });

  it('marks changed by another process (revision raised) are not overwritten from what this process kept', async () => {
    const clipId = clipIds[3]!;
    expect((await put(c, clipId, doc(0))).status).toBe(200);
    // Elsewhere: a point moved and the revision raised, as any save does.
    await t.db.transaction(async (trx) => {
      await trx('clip_landmarks').where({ clip_id: clipId, frame: 10, side: 'right', landmark: 'ankle' }).update({ x: 0.9 });
      await trx('clips').where({ id: clipId }).update({ annotation_revision: 2 });
    });
    // A save on the old revision is refused with the stored marks.
    const stale = await put(c, clipId, doc(1, 0.51));
    expect(stale.status).toBe(409);
    expect(stale.body.error.details.current.landmarks[2].points.ankle.x).toBe(0.9);
    // On the current revision, the same marks this process saved first: compared with what is
    // stored (not with what it kept), the ankle moved elsewhere is written back.
    const next = doc(2);
    expect((await put(c, clipId, next)).status).toBe(200);
    const stored = (await c.get(`/api/clips/${clipId}/annotations`)).body as ClipAnnotations;
    expect(stored.revision).toBe(3);
    expect(stored.landmarks).toEqual(
      next.landmarks
        .map((l) => ({ ...l, points: Object.fromEntries(Object.entries(l.points).map(([k, p]) => [k, { ...p, origin: 'placed' }])) }))
        .sort((a, b) => a.frame - b.frame || (a.side < b.side ? -1 : 1)),
    );
  });
});
