/**
 * The row locks services take as a mutex (`lockedForUpdate`) on PostgreSQL: they exclude each other
 * but let other transactions insert rows that refer to the locked one. With `FOR UPDATE` an insert
 * naming a locked person (an audit entry, a session) waited for the holder, and two deactivations
 * sent at once deadlocked: each held one coach's row and inserted an audit entry naming the
 * owner the other held (PostgreSQL answered 40P01 and the API 500). SQLite has one writer at a
 * time and takes no row locks, so these cases are PostgreSQL's.
 *
 * Reference: PostgreSQL 15 manual, "Explicit Locking", row-level lock conflicts (FOR NO KEY UPDATE
 * does not conflict with FOR KEY SHARE, which foreign-key checks take; FOR UPDATE does).
 */
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { usersRepository } from '../../server/auth/users-repository';
import { lockedForUpdate } from '../../server/db/dialect';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { Client, makeTestApp, signedIn, type TestApp } from '../support/test-app';
import { onPostgres, titleSkippedWhen } from '../support/test-db';

const why = 'SQLite takes no row locks';

let t: TestApp;
let ownerId: number;
let clinicId: number;

beforeAll(async () => {
  t = await makeTestApp({}, { fakeSmtp: false });
  const owner = await t.db('users').where({ role: 'owner' }).orderBy('id').first();
  ownerId = owner.id;
  clinicId = owner.clinic_id;
});

afterAll(async () => {
  await t?.close();
});

describe.skipIf(!onPostgres)('row locks on PostgreSQL', () => {
  it(titleSkippedWhen(!onPostgres, 'a locked person can still be named by an insert in another transaction', why), async () => {
    await t.db.transaction(async (holder) => {
      await lockedForUpdate(holder, holder('users').where({ id: ownerId }).select('id'));
      await t.db.transaction(async (other) => {
        // Without the fix this insert waits for `holder` until the timeout (55P03).
        await other.raw("SET LOCAL lock_timeout = '3s'");
        await other('audit_log').insert({ clinic_id: clinicId, actor_id: ownerId, action: 'test.lock', at: new Date().toISOString() });
      });
    });
    const [{ n }] = await t.db('audit_log').where({ action: 'test.lock' }).count({ n: '*' });
    expect(Number(n)).toBe(1);
  });

  it(titleSkippedWhen(!onPostgres, 'two holders of the same row still wait for each other', why), async () => {
    await t.db.transaction(async (holder) => {
      await lockedForUpdate(holder, holder('users').where({ id: ownerId }).select('id'));
      const second = t.db.transaction(async (other) => {
        await other.raw("SET LOCAL lock_timeout = '300ms'");
        await lockedForUpdate(other, other('users').where({ id: ownerId }).select('id'));
      });
      await expect(second).rejects.toMatchObject({ code: '55P03' });
    });
  });

  it(
    titleSkippedWhen(
      !onPostgres,
      'an athlete given to a coach whose deactivation is under way waits for it and is refused (create and change of coach)',
      why,
    ),
    async () => {
      const [owner, , ilse] = DEMO_SIGN_INS;
      const c = await signedIn(t.app, owner.email, owner.password);
      const coach = await t.db('users').where({ email: ilse.email }).first();
      const athlete = await t.db('athletes').where({ clinic_id: clinicId }).whereNot({ coach_id: coach.id }).orderBy('id').first();
      const sent: Promise<{ status: number }>[] = [];
      // A deactivation of the coach that has read the coach's athletes and not yet committed (as
      // staff-service holds it): the coach's row held, the account made inactive.
      await t.db.transaction(async (deactivation) => {
        await lockedForUpdate(deactivation, deactivation('users').where({ id: coach.id }).select('id'));
        await deactivation('users').where({ id: coach.id }).update({ active: false });
        sent.push(c.post('/api/athletes', { firstName: 'Late', lastName: 'Arrival', coachId: coach.id }));
        sent.push(c.patch(`/api/athletes/${athlete.id}`, { coachId: coach.id }));
        // Without the fix both were written meanwhile, naming the coach being deactivated.
        await new Promise((r) => setTimeout(r, 500));
      });
      const [created, changed] = await Promise.all(sent);
      expect(created!.status).toBe(422);
      expect(changed!.status).toBe(422);
      const [{ n }] = await t
        .db('athletes')
        .where({ coach_id: coach.id, first_name: 'Late' })
        .orWhere({ id: athlete.id, coach_id: coach.id })
        .count({ n: '*' });
      expect(Number(n)).toBe(0);
    },
  );

  it(
    titleSkippedWhen(!onPostgres, 'an export asked for while the athlete is being erased waits and answers 404, building nothing', why),
    async () => {
      const [owner] = DEMO_SIGN_INS;
      const c = await signedIn(t.app, owner.email, owner.password);
      const athlete = await t.db('athletes').where({ clinic_id: clinicId }).whereNull('erased_at').orderBy('id', 'desc').first();
      let sent: Promise<{ status: number }> | undefined;
      // An erasure that has claimed the athlete's row (as athlete-data-service does) and not yet committed.
      await t.db.transaction(async (erasure) => {
        await erasure('athletes').where({ id: athlete.id }).update({ erased_at: new Date().toISOString() });
        sent = c.post(`/api/athletes/${athlete.id}/data-exports`, {});
        // Without the fix the export was started for the erased athlete once the erasure committed.
        await new Promise((r) => setTimeout(r, 500));
      });
      expect((await sent!).status).toBe(404);
      expect(await t.db('data_exports').where({ athlete_id: athlete.id })).toEqual([]);
    },
  );

  it(
    titleSkippedWhen(
      !onPostgres,
      'an invitation accepted twice at once: the second finds it used (410), not the account the first made (409)',
      why,
    ),
    async () => {
      const [owner] = DEMO_SIGN_INS;
      const o = await signedIn(t.app, owner.email, owner.password);
      expect((await o.post('/api/staff/invitations', { email: 'twice@larchwood-clinic.test', name: 'Twice Over' })).status).toBe(201);
      const token = t.mailer.lastLinkTo('twice@larchwood-clinic.test').split('/').pop()!;
      const accept = () => new Client(t.app).post(`/api/invitations/${token}/accept`, { name: 'Twice Over', password: 'a-long-password' });
      // The first accept to look up the e-mail lets another accept of the same link run meanwhile
      // (for up to a second, as a slower request would): before the fix that one made the account
      // first, and the first then found the e-mail taken.
      const original = usersRepository.findByEmail.bind(usersRepository);
      let other: Promise<{ status: number; body: { error?: { code: string } } }> | undefined;
      const spy = vi.spyOn(usersRepository, 'findByEmail').mockImplementation(async (db, email) => {
        if (!other && email === 'twice@larchwood-clinic.test') {
          other = accept();
          await Promise.race([other, new Promise((r) => setTimeout(r, 1000))]);
        }
        return original(db, email);
      });
      try {
        const first = await accept();
        const second = await other!;
        expect([first.status, second.status].sort()).toEqual([201, 410]);
        expect([first, second].find((r) => r.status === 410)!.body.error!.code).toBe('token_used');
      } finally {
        spy.mockRestore();
      }
      expect(await t.db('users').where({ email: 'twice@larchwood-clinic.test' })).toHaveLength(1);
    },
  );
});
