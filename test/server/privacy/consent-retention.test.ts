/**
 * Consent withdrawal and clip retention. Withdrawing consent to sharing takes back everything
 * shared (stills, summaries, annotated clips) and blocks publishing; withdrawing consent to video
 * stops uploads and asks the owner whether to erase the clips (erased only on the owner's action).
 * Retention (off by default): the daily check lists the clips of athletes without activity for N
 * months, with sizes, and nothing goes before the owner confirms that list; the app's clock is moved
 * forward (fake clock).
 */
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { makeClip, tempDir } from '../media/fixtures';
import { intakeWith, uploadClip } from '../../support/bodies';
import { Client, makeTestApp, signedIn, type TestApp } from '../../support/test-app';
import { DEMO_SIGN_INS } from '../../../seeds/demo-scenario';

const [ownerCred, coachCred, , athleteCred] = DEMO_SIGN_INS;
const DAY = 86_400_000;

const intake = intakeWith;

let t: TestApp;
let owner: Client;
let coach: Client;
let athlete: Client;
let adaId: number;
let teodorId: number;
let dir: { dir: string; cleanup: () => Promise<void> };
let clipFile: string;

const upload = (c: Client, assessmentId: number) => uploadClip(c, assessmentId, clipFile);

async function assessmentOf(athleteId: number): Promise<number> {
  const row = await t.db('assessments').where({ athlete_id: athleteId }).orderBy('id').first();
  if (row) return row.id;
  return (
    await coach.post(`/api/athletes/${athleteId}/assessments`, {
      date: '2026-11-30',
      kind: 'baseline',
      surface: 'treadmill',
      speed: { value: 11, unit: 'kmh' },
      inclinePercent: 1,
      shoes: null,
      cameraNotes: null,
      notes: null,
    })
  ).body.id;
}

beforeAll(async () => {
  t = await makeTestApp({}, { fakeSmtp: false });
  owner = await signedIn(t.app, ownerCred.email, ownerCred.password);
  coach = await signedIn(t.app, coachCred.email, coachCred.password);
  athlete = await signedIn(t.app, athleteCred.email, athleteCred.password);
  adaId = (await t.db('athletes').where({ email: athleteCred.email }).first()).id;
  teodorId = (await t.db('athletes').where({ email: 'teodor.brannick@runner.test' }).first()).id;
  dir = await tempDir('consent');
  clipFile = await makeClip(path.join(dir.dir, 'run.mp4'), { fps: 30, width: 160, height: 90, seconds: 1 });
}, 60_000);

afterAll(async () => {
  await t?.close();
  await dir?.cleanup();
});

describe('consent withdrawal', () => {
  it('withdrawing consent to sharing unpublishes every shared still, summary and annotated clip, and publishing is refused', async () => {
    expect((await owner.put(`/api/athletes/${adaId}/intake`, intake({ videoRecording: true, shareStills: true }))).status).toBe(200);
    const assessmentId = await assessmentOf(adaId);
    const up = await upload(coach, assessmentId);
    expect(up.status, JSON.stringify(up.body)).toBe(201);
    await t.worker!.idle();
    const still = (await coach.post(`/api/clips/${up.body.id}/stills`, { frameIndex: 0, caption: '', showAngles: true })).body.id;
    const summary = (await coach.post(`/api/assessments/${assessmentId}/summaries`, { findings: '', planText: '', stillIds: [] })).body.id;
    const video = (
      await coach.post(`/api/clips/${up.body.id}/annotated-clips`, { fromFrame: 0, toFrame: 5, factor: 1, caption: '', showAngles: true })
    ).body.id;
    await t.worker!.idle();
    for (const p of [`/api/stills/${still}/publish`, `/api/summaries/${summary}/publish`, `/api/annotated-clips/${video}/publish`])
      expect((await coach.post(p)).status, p).toBe(200);
    const shared = (await athlete.get('/api/portal/shared')).body;
    expect(shared.stills.length + shared.summaries.length).toBeGreaterThanOrEqual(2);
    expect((await athlete.get(`/api/annotated-clips/${video}`)).status).toBe(200);

    // The athlete withdraws it in their portal profile.
    expect((await athlete.put(`/api/athletes/${adaId}/intake`, intake({ videoRecording: true, shareStills: false }))).status).toBe(200);
    for (const table of ['stills', 'visit_summaries', 'annotated_clips'])
      expect(await t.db(table).where({ athlete_id: adaId }).whereNotNull('published_at').count('* as n'), table).toEqual([{ n: 0 }]);
    const after = (await athlete.get('/api/portal/shared')).body;
    expect(after.stills).toEqual([]);
    expect(after.summaries).toEqual([]);
    expect((await athlete.get(`/api/annotated-clips/${video}`)).status).toBe(404);
    const entry = await t.db('audit_log').where({ athlete_id: adaId, action: 'athlete.intake_updated' }).orderBy('id', 'desc').first();
    expect(JSON.parse(entry.detail).unpublished).toMatchObject({ summaries: 1, annotatedClips: 1 });
    const refused = await coach.post(`/api/stills/${still}/publish`);
    expect(refused.status).toBe(409);
    expect(refused.body.error).toMatchObject({
      code: 'share_consent_withdrawn',
      message: expect.stringMatching(/withdrew consent to sharing/),
    });
  }, 90_000);

  it('withdrawing consent to video stops uploads and asks the owner; the clips go only when the owner erases them', async () => {
    const assessmentId = await assessmentOf(adaId);
    const before = await owner.get(`/api/athletes/${adaId}/data`);
    expect(before.body).toMatchObject({ videoConsent: true, videoWithdrawnAt: null, fullName: 'Ada Kestrel' });
    expect(before.body.clipCount).toBeGreaterThan(0);
    expect((await athlete.put(`/api/athletes/${adaId}/intake`, intake({ videoRecording: false, shareStills: false }))).status).toBe(200);

    const refused = await upload(athlete, assessmentId);
    expect(refused.status).toBe(409);
    expect(refused.body.error).toMatchObject({
      code: 'consent_required',
      message: expect.stringMatching(/withdrawn: uploads are stopped/),
    });

    const asked = (await owner.get(`/api/athletes/${adaId}/data`)).body;
    expect(asked.videoConsent).toBe(false);
    expect(asked.videoWithdrawnAt).toEqual(expect.any(String));
    const clips = await t.db('clips').where({ athlete_id: adaId }).pluck('id');
    expect(clips.length).toBe(asked.clipCount);
    // Nothing goes by itself.
    for (const id of clips) expect(await t.store.list(`clips/${id}/`)).not.toEqual([]);

    expect((await owner.post(`/api/athletes/${adaId}/clips/erasure`, {})).status).toBe(422);
    expect((await coach.post(`/api/athletes/${adaId}/clips/erasure`, { confirm: true })).status).toBe(403);
    const erased = await owner.post(`/api/athletes/${adaId}/clips/erasure`, { confirm: true });
    expect(erased.status, JSON.stringify(erased.body)).toBe(200);
    expect(erased.body).toEqual({ removedClips: clips.length });
    expect(await t.db('clips').where({ athlete_id: adaId }).count('* as n')).toEqual([{ n: 0 }]);
    for (const id of clips) expect(await t.store.list(`clips/${id}/`)).toEqual([]);
    expect((await owner.get(`/api/athletes/${adaId}/data`)).body).toMatchObject({ clipCount: 0, videoWithdrawnAt: null });
    expect(await t.db('audit_log').where({ athlete_id: adaId, action: 'athlete.clips_erased' }).first()).toBeDefined();
  }, 60_000);
});

describe('clip retention', () => {
  let teodorClip: number;
  let carysClip: number;

  it('is off by default; months outside 1–120 or fractional are refused', async () => {
    expect((await owner.get('/api/clinic/retention')).body).toEqual({ months: null, review: null });
    for (const months of [0, 121, 1.5, '6'])
      expect((await owner.put('/api/clinic/retention', { months })).status, String(months)).toBe(422);
    expect((await coach.get('/api/clinic/retention')).status).toBe(403);
    const off = await owner.post('/api/clinic/retention/reviews');
    expect(off.status).toBe(409);
    expect(off.body.error.code).toBe('retention_off');
  });

  it('the daily check lists clips of athletes without activity for the set months, with sizes; nothing is removed before the owner confirms', async () => {
    const carysId = (await t.db('athletes').where({ email: 'carys.holmgren@runner.test' }).first()).id;
    for (const id of [teodorId, carysId])
      expect((await coach.put(`/api/athletes/${id}/intake`, intake({ videoRecording: true, shareStills: false }))).status).toBe(200);
    teodorClip = (await upload(coach, await assessmentOf(teodorId))).body.id;
    carysClip = (await upload(coach, await assessmentOf(carysId))).body.id;
    await t.worker!.idle();
    expect((await owner.put('/api/clinic/retention', { months: 6 })).body).toMatchObject({ months: 6 });

    await t.runDailyPrivacyCheck();
    let s = (await owner.get('/api/clinic/retention')).body;
    expect(s.review.items).toEqual([]); // everyone active today

    // Seven months later (the demo's visits lie within the weeks before today).
    t.advance(7 * 31 * DAY);
    await t.runDailyPrivacyCheck();
    s = (await owner.get('/api/clinic/retention')).body;
    const ids = s.review.items.map((i: { clipId: number }) => i.clipId);
    expect(ids).toEqual(expect.arrayContaining([teodorClip, carysClip]));
    const item = s.review.items.find((i: { clipId: number }) => i.clipId === teodorClip);
    expect(item).toMatchObject({
      athleteId: teodorId,
      athleteName: 'Teodor Brannick',
      originalName: 'run.mp4',
      sizeBytes: fs.statSync(clipFile).size,
    });
    expect(s.review.totalBytes).toBe(s.review.items.reduce((n: number, i: { sizeBytes: number }) => n + i.sizeBytes, 0));
    expect(s.review.confirmedAt).toBeNull();
    // The same day's check lists nothing new; the clips are all still there.
    const reviews = await t.db('clip_retention_reviews').count('* as n');
    await t.runDailyPrivacyCheck();
    expect(await t.db('clip_retention_reviews').count('* as n')).toEqual(reviews);
    expect(await t.db('clips').whereIn('id', [teodorClip, carysClip]).count('* as n')).toEqual([{ n: 2 }]);
  });

  it('confirming removes the listed clips still due (an athlete active since keeps theirs); an older list cannot be confirmed', async () => {
    const first = (await owner.get('/api/clinic/retention')).body.review.id;
    // Teodor comes back: a profile change is activity.
    expect((await coach.patch(`/api/athletes/${teodorId}`, { firstName: 'Teodor' })).status).toBe(200);
    const s = (await owner.get('/api/clinic/retention')).body;
    expect(s.review.items.map((i: { clipId: number }) => i.clipId)).not.toContain(teodorClip);

    t.advance(DAY);
    await t.runDailyPrivacyCheck();
    const latest = (await owner.get('/api/clinic/retention')).body.review.id;
    expect(latest).toBeGreaterThan(first);
    const old = await owner.post(`/api/clinic/retention/reviews/${first}/confirm`);
    expect(old.status).toBe(409);
    expect(old.body.error.code).toBe('review_outdated');

    const done = await owner.post(`/api/clinic/retention/reviews/${latest}/confirm`);
    expect(done.status, JSON.stringify(done.body)).toBe(200);
    expect(done.body.review).toMatchObject({ confirmedAt: expect.any(String), items: [] });
    expect(done.body.review.removedCount).toBeGreaterThanOrEqual(1);
    expect(await t.db('clips').where({ id: carysClip }).first()).toBeUndefined();
    expect(await t.store.list(`clips/${carysClip}/`)).toEqual([]);
    expect(await t.db('clips').where({ id: teodorClip }).first()).toBeDefined();
    expect((await owner.post(`/api/clinic/retention/reviews/${latest}/confirm`)).status).toBe(409);
  });

  it('turned off, the daily check lists nothing more', async () => {
    expect((await owner.put('/api/clinic/retention', { months: null })).body.months).toBeNull();
    const n = await t.db('clip_retention_reviews').count('* as n');
    t.advance(2 * DAY);
    await t.runDailyPrivacyCheck();
    expect(await t.db('clip_retention_reviews').count('* as n')).toEqual(n);
  });

  it('confirmed twice at once (a double click, a resend): the clips go once; the other answer is 409 review_confirmed; one audit entry per athlete', async () => {
    const clipId = (await upload(coach, await assessmentOf(teodorId))).body.id as number;
    await t.worker!.idle();
    expect((await owner.put('/api/clinic/retention', { months: 1 })).status).toBe(200);
    t.advance(2 * 31 * DAY);
    const review = (await owner.post('/api/clinic/retention/reviews')).body.review;
    const items = review.items as { clipId: number; athleteId: number }[];
    expect(items.map((i) => i.clipId)).toContain(clipId);
    const lastAudit = ((await t.db('audit_log').max('id as id').first()) as { id: number }).id;

    const answers = await Promise.all([1, 2].map(() => owner.post(`/api/clinic/retention/reviews/${review.id}/confirm`)));
    expect(answers.map((a) => a.status).sort()).toEqual([200, 409]);
    expect(answers.find((a) => a.status === 409)!.body.error.code).toBe('review_confirmed');
    expect(answers.find((a) => a.status === 200)!.body.review.removedCount).toBe(items.length);
    expect(
      await t
        .db('clips')
        .whereIn(
          'id',
          items.map((i) => i.clipId),
        )
        .count('* as n'),
    ).toEqual([{ n: 0 }]);
    const entries = (await t.db('audit_log').where('id', '>', lastAudit).where({ action: 'athlete.clips_removed_by_retention' })) as {
      athlete_id: number;
      detail: string;
    }[];
    // Counted here from the list itself: one entry per athlete, naming that athlete's clips.
    const perAthlete = new Map<number, number>();
    for (const i of items) perAthlete.set(i.athleteId, (perAthlete.get(i.athleteId) ?? 0) + 1);
    expect(new Map(entries.map((e) => [e.athlete_id, (JSON.parse(e.detail) as { clips: number }).clips]))).toEqual(perAthlete);
    expect(entries).toHaveLength(perAthlete.size);
  });
});

describe('athlete erasure and a server stop', () => {
  it("a stop while the athlete's files are removed leaves the athlete to erase again, and that erasure leaves no file", async () => {
    const farid = await t.db('athletes').where({ first_name: 'Farid' }).first();
    expect((await coach.put(`/api/athletes/${farid.id}/intake`, intake({ videoRecording: true, shareStills: false }))).status).toBe(200);
    const clipId = (await upload(coach, await assessmentOf(farid.id))).body.id as number;
    await t.worker!.idle();
    expect((await t.store.list(`clips/${clipId}/`)).length).toBeGreaterThan(0);
    const confirmName = `${farid.first_name} ${farid.last_name}`;

    // What a SIGKILL halfway through the removal leaves: some files gone, the request unanswered.
    const removePrefix = vi.spyOn(t.store, 'removePrefix').mockImplementationOnce(async (prefix) => {
      await t.store.remove(`${prefix}original.mp4`);
      throw new Error('the server stopped');
    });
    try {
      expect((await owner.post(`/api/athletes/${farid.id}/erasure`, { confirmName })).status).not.toBe(200);
    } finally {
      removePrefix.mockRestore();
    }
    // Not erased yet, so the owner can ask again (else the clip's frames would stay with nothing naming them).
    expect((await owner.get(`/api/athletes/${farid.id}`)).status).toBe(200);
    expect((await owner.post(`/api/athletes/${farid.id}/erasure`, { confirmName })).status).toBe(200);
    expect(await t.store.list(`clips/${clipId}/`)).toEqual([]);
    expect((await owner.get(`/api/athletes/${farid.id}`)).status).toBe(404);
  });
});
