/**
 * The same request sent twice at once (a double click, a retry after a lost answer) and writes that
 * race each other: a clinic gets what it asked for once, every answer is a clear 4xx or the result,
 * and nothing is left behind. Requests are started together with `Promise.all`; where the order
 * matters a step of one request is held (a spy on the store or the database) until the other ran.
 */
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import path from 'node:path';
import { makeClip, tempDir } from './media/fixtures';
import { baselineVisit, intakeWith, uploadClip } from '../support/bodies';
import { Client, makeTestApp, signedIn, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { exportPrefix } from '../../server/storage/media-keys';
import { REPEATED_INVITATION_MS } from '../../server/auth/invitations-service';

const [ownerCred, coachCred] = DEMO_SIGN_INS;

let t: TestApp;
let owner: Client;
let coach: Client;
let dir: { dir: string; cleanup: () => Promise<void> };
let clipFile: string;

const upload = (c: Client, assessmentId: number) => uploadClip(c, assessmentId, clipFile);

/** A new athlete of the clinic with consent to video and one visit. */
async function athleteWithVisit(first: string): Promise<{ id: number; name: string; visitId: number }> {
  const a = await coach.post('/api/athletes', { firstName: first, lastName: 'Racer', email: `${first.toLowerCase()}@runner.test` });
  expect(a.status).toBe(201);
  expect((await coach.put(`/api/athletes/${a.body.id}/intake`, intakeWith({ videoRecording: true, shareStills: true }))).status).toBe(200);
  const v = await coach.post(`/api/athletes/${a.body.id}/assessments`, baselineVisit());
  expect(v.status).toBe(201);
  return { id: a.body.id, name: `${first} Racer`, visitId: v.body.id };
}

beforeAll(async () => {
  t = await makeTestApp({}, { fakeSmtp: false });
  owner = await signedIn(t.app, ownerCred.email, ownerCred.password);
  coach = await signedIn(t.app, coachCred.email, coachCred.password);
  dir = await tempDir('concurrent');
  clipFile = await makeClip(path.join(dir.dir, 'run.mp4'), { fps: 30, width: 160, height: 90, seconds: 1 });
}, 60_000);

afterAll(async () => {
  await t?.close();
  await dir?.cleanup();
});

describe('athlete erasure sent more than once', () => {
  it('five erasures of one athlete at once: one answers with the reference, the others 404, and that reference is the one kept', async () => {
    const a = await athleteWithVisit('Quinn');
    const answers = await Promise.all(
      Array.from({ length: 5 }, () => owner.post(`/api/athletes/${a.id}/erasure`, { confirmName: a.name })),
    );
    const ok = answers.filter((r) => r.status === 200);
    expect(ok).toHaveLength(1);
    expect(answers.filter((r) => r.status !== 200).map((r) => r.status)).toEqual([404, 404, 404, 404]);
    const row = await t.db('athletes').where({ id: a.id }).first();
    expect(row.erasure_ref).toBe(ok[0]!.body.reference);
    expect(row.last_name).toBe(ok[0]!.body.reference);
    expect(await t.db('audit_log').where({ action: 'athlete.erased', athlete_id: a.id })).toHaveLength(1);
  });
});

describe('a clip upload racing the erasure of its athlete', () => {
  it('an upload that completes after the erasure listed the files: the clip goes with the athlete, rows and files', async () => {
    const a = await athleteWithVisit('Rowan');
    let uploaded: { status: number; body: { id?: number } } | null = null;
    // The erasure's first pass over the files is held while the upload runs to its end.
    const removePrefix = t.store.removePrefix.bind(t.store);
    const spy = vi.spyOn(t.store, 'removePrefix').mockImplementation(async (prefix) => {
      if (prefix === exportPrefix(a.id) && !uploaded) uploaded = await upload(coach, a.visitId);
      return removePrefix(prefix);
    });
    try {
      const erased = await owner.post(`/api/athletes/${a.id}/erasure`, { confirmName: a.name });
      console.log('ERASED', erased.status, JSON.stringify(erased.body));
      expect(erased.status).toBe(200);
    } finally {
      spy.mockRestore();
    }
    expect(uploaded!.status).toBe(201);
    const clipId = uploaded!.body.id!;
    // The video is gone when the erasure answers (not only once its extraction has run: a server stop
    // would keep it); what the extraction running meanwhile writes, it removes itself on finding the clip gone.
    expect(await t.db('clips').where({ id: clipId })).toEqual([]);
    expect((await t.store.list(`clips/${clipId}/`)).filter((k) => k.includes('original'))).toEqual([]);
    await t.worker?.idle();
    expect(await t.store.list(`clips/${clipId}/`)).toEqual([]);
  });

  it('an upload whose file was checked while the athlete was erased answers 404 and keeps nothing', async () => {
    const a = await athleteWithVisit('Sasha');
    const clipsBefore = Number((await t.db('clips').max('id as id').first())?.['id'] ?? 0);
    // The erasure runs to its end just before the upload's own transaction starts.
    const transaction = t.db.transaction.bind(t.db);
    let erased: number | null = null;
    const spy = vi.spyOn(t.db, 'transaction').mockImplementation(((...args: Parameters<typeof t.db.transaction>) => {
      if (erased === null && new Error().stack?.includes('acceptUpload')) {
        return owner.post(`/api/athletes/${a.id}/erasure`, { confirmName: a.name }).then((r) => {
          erased = r.status;
          return transaction(...args);
        });
      }
      return transaction(...args);
    }) as typeof t.db.transaction);
    let answer;
    try {
      answer = await upload(coach, a.visitId);
    } finally {
      spy.mockRestore();
    }
    expect(erased).toBe(200);
    expect(answer.status).toBe(404);
    expect(await t.db('clips').where('id', '>', clipsBefore).where({ athlete_id: a.id })).toEqual([]);
    expect((await t.mediaKeys()).filter((k) => /^clips\/(\d+)\//.test(k) && Number(k.split('/')[1]) > clipsBefore)).toEqual([]);
  });
});

describe('invitations sent more than once at the same moment', () => {
  const pending = (email: string) => t.db('invitations').where({ email }).whereNull('used_at').whereNull('revoked_at');
  const mailsTo = (email: string) => t.mailer.sent.filter((m) => m.to === email);

  it('a coach invitation sent three times at once: one invitation, one e-mail, the same answer each time', async () => {
    const email = 'twin.coach@larchwood-clinic.test';
    const answers = await Promise.all([1, 2, 3].map(() => owner.post('/api/staff/invitations', { email, name: 'Twin Coach' })));
    expect(answers.map((r) => r.status)).toEqual([201, 201, 201]);
    expect(new Set(answers.map((r) => r.body.id)).size).toBe(1);
    expect(await pending(email)).toHaveLength(1);
    expect(mailsTo(email)).toHaveLength(1);
    // Its link is the one that works.
    const token = t.mailer.lastLinkTo(email).split('/').pop()!;
    expect((await new Client(t.app).get(`/api/invitations/${token}`)).status).toBe(200);
  });

  it("an athlete's invitation sent twice at once: one e-mail; sent again afterwards (Resend) it goes out anew", async () => {
    const a = await athleteWithVisit('Tamsin');
    const email = 'tamsin@runner.test';
    const answers = await Promise.all([1, 2].map(() => coach.post(`/api/athletes/${a.id}/invitation`)));
    expect(answers.map((r) => r.status)).toEqual([201, 201]);
    expect(answers[0]!.body.id).toBe(answers[1]!.body.id);
    expect(mailsTo(email)).toHaveLength(1);
    t.advance(REPEATED_INVITATION_MS + 1_000);
    expect((await coach.post(`/api/athletes/${a.id}/invitation`)).status).toBe(201);
    expect(mailsTo(email)).toHaveLength(2);
    expect(await pending(email)).toHaveLength(1);
  });
});

describe('a visit summary asked for more than once while it renders', () => {
  it('three identical requests at once make one summary (one PDF queued); another text makes another', async () => {
    const a = await athleteWithVisit('Uma');
    const clip = await upload(coach, a.visitId);
    expect(clip.status).toBe(201);
    await t.worker!.idle();
    const still = await coach.post(`/api/clips/${clip.body.id}/stills`, { frameIndex: 0, caption: 'Toe-off', showAngles: false });
    expect(still.status).toBe(202);
    await t.worker!.idle();
    const body = { findings: 'Hip extension low at toe-off.', planText: 'Hip flexor mobility.', stillIds: [still.body.id] };
    const answers = await Promise.all([1, 2, 3].map(() => coach.post(`/api/assessments/${a.visitId}/summaries`, body)));
    expect(answers.map((r) => r.status)).toEqual([202, 202, 202]);
    expect(new Set(answers.map((r) => r.body.id)).size).toBe(1);
    const other = await coach.post(`/api/assessments/${a.visitId}/summaries`, { ...body, planText: 'Strength first.' });
    expect(other.status).toBe(202);
    expect(other.body.id).not.toBe(answers[0]!.body.id);
    await t.worker!.idle();
    const rows = await t.db('visit_summaries').where({ assessment_id: a.visitId });
    expect(rows.map((r) => r.status)).toEqual(['ready', 'ready']);
    const items = await t
      .db('processed_items')
      .where({ subject_type: 'summary' })
      .whereIn('subject_id', [answers[0]!.body.id, other.body.id]);
    expect(items).toHaveLength(2);
  });
});

describe('creates and acts sent more than once at the same moment', () => {
  it('the same new athlete sent three times at once: one is made, the others answer 409 email_in_use', async () => {
    const body = { firstName: 'Vera', lastName: 'Twice', email: 'vera.twice@runner.test' };
    const answers = await Promise.all([1, 2, 3].map(() => owner.post('/api/athletes', body)));
    expect(answers.map((r) => r.status).sort()).toEqual([201, 409, 409]);
    expect(answers.filter((r) => r.status === 409).map((r) => r.body.error.code)).toEqual(['email_in_use', 'email_in_use']);
    expect(await t.db('athletes').where({ email: body.email })).toHaveLength(1);
  });

  it('a data export asked for three times at once: one is built, the others answer 409 export_running', async () => {
    const a = await athleteWithVisit('Wren');
    const answers = await Promise.all([1, 2, 3].map(() => owner.post(`/api/athletes/${a.id}/data-exports`)));
    expect(answers.map((r) => r.status).sort()).toEqual([202, 409, 409]);
    expect(await t.db('data_exports').where({ athlete_id: a.id })).toHaveLength(1);
    await t.worker!.idle();
  });

  it('a still published three times at once: published once, one audit entry, one e-mail to the athlete', async () => {
    const a = await athleteWithVisit('Xena');
    const invite = await coach.post(`/api/athletes/${a.id}/invitation`);
    expect(invite.status).toBe(201);
    const accepted = await new Client(t.app).post(`/api/invitations/${t.mailer.lastLinkTo('xena@runner.test').split('/').pop()}/accept`, {
      name: 'Xena Racer',
      password: 'a-long-password',
    });
    expect(accepted.status).toBe(201);
    const clip = await upload(coach, a.visitId);
    await t.worker!.idle();
    const still = await coach.post(`/api/clips/${clip.body.id}/stills`, { frameIndex: 0, caption: '', showAngles: false });
    await t.worker!.idle();
    const mailsBefore = t.mailer.sent.filter((m) => m.to === 'xena@runner.test').length;
    const answers = await Promise.all([1, 2, 3].map(() => coach.post(`/api/stills/${still.body.id}/publish`)));
    expect(answers.map((r) => r.status)).toEqual([200, 200, 200]);
    expect(new Set(answers.map((r) => r.body.publishedAt)).size).toBe(1);
    expect(t.mailer.sent.filter((m) => m.to === 'xena@runner.test').length - mailsBefore).toBe(1);
    expect(await t.db('audit_log').where({ action: 'still.published', athlete_id: a.id })).toHaveLength(1);
  });
});

describe('a new invoice sent again after its answer was lost (Idempotency-Key)', () => {
  const invoiceBody = (athleteId: number) => ({
    athleteId,
    assessmentId: null,
    dueDate: '2026-12-31',
    note: null,
    lines: [{ priceId: null, description: 'Gait assessment', quantity: 1, unitAmountMinor: 9000, taxRateBp: null }],
  });
  const withKey = async (key: string, body: unknown) =>
    owner.agent
      .post('/api/invoices')
      .set('X-XSRF-TOKEN', await owner.xsrf())
      .set('Idempotency-Key', key)
      .send(body as object);

  it('the same key again, and three times at once, answers the one draft it made; no key makes a draft each time', async () => {
    const a = await athleteWithVisit('Yara');
    const first = await withKey('key-yara-0001', invoiceBody(a.id));
    expect(first.status).toBe(201);
    const retry = await withKey('key-yara-0001', invoiceBody(a.id));
    expect(retry.status).toBe(201);
    expect(retry.body.id).toBe(first.body.id);
    const together = await Promise.all([1, 2, 3].map(() => withKey('key-yara-0002', invoiceBody(a.id))));
    expect(together.map((r) => r.status)).toEqual([201, 201, 201]);
    expect(new Set(together.map((r) => r.body.id)).size).toBe(1);
    expect(await t.db('invoices').where({ athlete_id: a.id })).toHaveLength(2);
    // Without a key (an older client) nothing changes: each request is a draft.
    await owner.post('/api/invoices', invoiceBody(a.id));
    expect(await t.db('invoices').where({ athlete_id: a.id })).toHaveLength(3);
  });

  it("a key used for another athlete's invoice answers 422 idempotency_key_reused; a malformed key 422", async () => {
    const [a, b] = [await athleteWithVisit('Zora'), await athleteWithVisit('Zeno')];
    expect((await withKey('key-zora-0001', invoiceBody(a.id))).status).toBe(201);
    const reused = await withKey('key-zora-0001', invoiceBody(b.id));
    expect(reused.status).toBe(422);
    expect(reused.body.error.code).toBe('idempotency_key_reused');
    expect((await withKey('bad key!', invoiceBody(a.id))).status).toBe(422);
    expect(await t.db('invoices').where({ athlete_id: b.id })).toEqual([]);
  });
});

// Last: it deactivates the demo's coaches.
describe('deactivations sent more than once, or racing each other', () => {
  const staffId = async (email: string) => (await t.db('users').where({ email }).first()).id as number;

  it('a coach deactivated three times at once: one answer 200, the others 409 already_deactivated, one audit entry', async () => {
    const ilse = await staffId(DEMO_SIGN_INS[2].email);
    const answers = await Promise.all([1, 2, 3].map(() => owner.post(`/api/staff/${ilse}/deactivate`, {})));
    expect(answers.map((r) => r.status).sort()).toEqual([200, 409, 409]);
    expect(await t.db('audit_log').where({ action: 'staff.deactivated' }).whereLike('detail', `%"userId":${ilse}%`)).toHaveLength(1);
    const again = await Promise.all([1, 2, 3].map(() => owner.post(`/api/staff/${ilse}/reactivate`)));
    expect(again.map((r) => r.status).sort()).toEqual([200, 409, 409]);
  });

  it('a coach deactivated with their athletes going to a coach deactivated at the same moment: no athlete is left with a deactivated coach', async () => {
    const [tobin, ilse] = [await staffId(DEMO_SIGN_INS[1].email), await staffId(DEMO_SIGN_INS[2].email)];
    expect((await t.db('athletes').where({ coach_id: tobin })).length).toBeGreaterThan(0);
    const [ofIlse, ofTobin] = await Promise.all([
      owner.post(`/api/staff/${ilse}/deactivate`, {}),
      owner.post(`/api/staff/${tobin}/deactivate`, { reassignTo: ilse }),
    ]);
    expect(ofIlse.status).toBe(200);
    // Tobin's athletes went to Ilse before she left (and on with hers to the owner), or his deactivation is refused.
    expect([200, 422]).toContain(ofTobin.status);
    const stranded = await t
      .db('athletes')
      .join('users', 'users.id', 'athletes.coach_id')
      .where('users.active', false)
      .select('athletes.id');
    expect(stranded).toEqual([]);
  });
});
