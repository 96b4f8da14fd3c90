import type { Knex } from 'knex';
import { ConflictError } from '../errors';

/** What withdrawing consent to sharing took back from the athlete's portal. */
export interface Unpublished {
  stills: number;
  summaries: number;
  annotatedClips: number;
}

/** Unpublishes every shared still, visit summary and annotated clip of the athlete (consent to sharing withdrawn). */
export async function unpublishAll(trx: Knex, athleteId: number, at: string): Promise<Unpublished> {
  const off = { published_at: null, published_by: null, updated_at: at };
  const run = (table: string) => trx(table).where({ athlete_id: athleteId }).whereNotNull('published_at').update(off);
  return { stills: await run('stills'), summaries: await run('visit_summaries'), annotatedClips: await run('annotated_clips') };
}

/** Refuses to share with an athlete who withdrew consent to sharing (never asked: allowed, as before consents were recorded). */
export async function assertShareConsent(db: Knex, athleteId: number): Promise<void> {
  const latest = await db('consents')
    .where({ athlete_id: athleteId, kind: 'share_stills' })
    .orderBy('id', 'desc')
    .first<{ granted: number } | undefined>('granted');
  if (latest && !latest.granted)
    throw new ConflictError(
      'The athlete withdrew consent to sharing: nothing can be published to them until they give it again (in the intake).',
      'share_consent_withdrawn',
    );
}
