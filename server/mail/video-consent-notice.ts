import type { Knex } from 'knex';
import type { Logger } from 'pino';
import type { Mailer } from './mailer';

/** What the notice needs: the database, the mailer, where it logs, and the app's public address for the link. */
export interface VideoConsentNoticeDeps {
  db: Knex;
  mailer: Mailer;
  logger: Logger;
  publicUrl: string;
}

/**
 * Tells every active owner of the athlete's clinic that the athlete withdrew consent to video: new
 * uploads are refused from now on, and the owner decides whether the clips already held are erased
 * (on the athlete's Data tab, linked). The e-mail names the athlete and how many clips are held,
 * nothing about their health. Best-effort: a message that cannot be sent is logged and the
 * withdrawal stands. Answers how many owners were written to.
 */
export async function sendVideoConsentWithdrawnNotice(d: VideoConsentNoticeDeps, athleteId: number): Promise<number> {
  const athlete = await d
    .db('athletes as a')
    .join('clinics as c', 'c.id', 'a.clinic_id')
    .where('a.id', athleteId)
    .first<{ clinic_id: number; first_name: string; last_name: string; clinic_name: string } | undefined>(
      'a.clinic_id',
      'a.first_name',
      'a.last_name',
      'c.name as clinic_name',
    );
  if (!athlete) return 0;
  const owners = await d
    .db('users')
    .where({ clinic_id: athlete.clinic_id, role: 'owner', active: true })
    .orderBy('id')
    .select<{ email: string; name: string }[]>('email', 'name');
  const clips = await d.db('clips').where({ athlete_id: athleteId }).count<{ n: number | string }[]>({ n: '*' });
  const clipCount = Number(clips[0]?.n ?? 0);
  const name = `${athlete.first_name} ${athlete.last_name}`;
  const held =
    clipCount === 0
      ? 'No clips of theirs are held, so there is nothing to erase.'
      : `${clipCount === 1 ? 'One clip of theirs is' : `${clipCount} clips of theirs are`} still held. Should they be erased? The clips stay until you decide: erase them, or keep them if the law or your records require it.`;
  let sent = 0;
  for (const owner of owners) {
    try {
      await d.mailer.send({
        to: owner.email,
        clinicId: athlete.clinic_id,
        subject: `${name} withdrew consent to video`,
        text: [
          `Hello ${owner.name},`,
          '',
          `${name} has withdrawn their consent to video recording at ${athlete.clinic_name}. Uploads of new clips for them are stopped.`,
          '',
          held,
          '',
          `Decide on the athlete's Data tab: ${d.publicUrl}/athletes/${athleteId}?tab=data`,
        ].join('\n'),
      });
      sent++;
    } catch (err) {
      d.logger.warn({ athleteId, err: (err as Error).message }, 'video consent notice not sent');
    }
  }
  return sent;
}
