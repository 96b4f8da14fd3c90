import type { Knex } from 'knex';
import type { Logger } from 'pino';
import type { Mailer } from './mailer';

/** What was published, in words that carry no health data. */
export type SharedKind = 'still' | 'summary';

const WHAT: Record<SharedKind, string> = {
  still: 'an annotated still from your running assessment',
  summary: 'a visit summary',
};

/**
 * Tells an athlete that their clinic shared something, with a link into the portal. The e-mail
 * never carries the item itself: no captions, no measures, no findings — only that something is
 * waiting behind sign-in. Athletes without an account or e-mail get no notice (logged).
 * Sending is best-effort: a mail failure is logged and does not undo the publish.
 */
export async function sendShareNotice(
  d: { db: Knex; mailer: Mailer; logger: Logger; publicUrl: string },
  athleteId: number,
  kind: SharedKind,
): Promise<boolean> {
  const row = await d
    .db('athletes as a')
    .join('clinics as c', 'c.id', 'a.clinic_id')
    .where('a.id', athleteId)
    .first<{ email: string | null; first_name: string; user_id: number | null; clinic_name: string; clinic_id: number } | undefined>(
      'a.clinic_id',
      'a.email',
      'a.first_name',
      'a.user_id',
      'c.name as clinic_name',
    );
  if (!row?.email || !row.user_id) {
    d.logger.info({ athleteId, kind }, 'share notice not sent: athlete has no account');
    return false;
  }
  try {
    await d.mailer.send({
      to: row.email,
      clinicId: row.clinic_id,
      subject: `${row.clinic_name} shared something with you on Trailframe`,
      text: [
        `Hello ${row.first_name},`,
        '',
        `${row.clinic_name} has shared ${WHAT[kind]} with you.`,
        `Sign in to see it: ${d.publicUrl}/portal`,
        '',
        'For your privacy this e-mail does not contain the item itself.',
      ].join('\n'),
    });
    return true;
  } catch (err) {
    d.logger.warn({ athleteId, kind, err: (err as Error).message }, 'share notice failed');
    return false;
  }
}
