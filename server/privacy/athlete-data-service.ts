import { randomBytes } from 'node:crypto';
import type { SessionUser } from '../../src/contracts/api';
import type { ResumableUploads } from '../clips/resumable-uploads';
import type { AthleteDataOverview, ClipErasureResult, ErasureResult } from '../../src/contracts/privacy';
import { audit } from '../audit/audit-log';
import type { ClipsService } from '../clips/clips-service';
import type { Db } from '../db/knex';
import type { AthleteRow } from '../db/rows';
import { NotFoundError, ValidationError } from '../errors';
import { revokeUserSessions, type UserRevocations } from '../http/sessions';
import { accessibleAthlete } from '../policy/athlete-resources';
import type { Processing } from '../processing/processing';
import { assessmentPrefix, clipKeys, exportPrefix } from '../storage/media-keys';
import type { MediaStore } from '../storage/media-store';
import { ATHLETE_TABLES, ATHLETE_TABLE_NAMES } from './athlete-tables';
import { redactKeptInvoices } from './redact-kept-invoices';
import { eraseCreateKeys } from '../db/create-once';

/** The owner's side of an athlete's data: the overview, erasure of everything, erasure of the clips only. */
export interface AthleteDataService {
  overview(user: SessionUser, athleteId: number): Promise<AthleteDataOverview>;
  /** Erases the athlete (typed confirmation: their full name); invoices stay with a reference instead of the name. */
  erase(user: SessionUser, athleteId: number, confirmName: string): Promise<ErasureResult>;
  /** Erases the athlete's clips (rows and files), e.g. after consent to video was withdrawn. */
  eraseClips(user: SessionUser, athleteId: number): Promise<ClipErasureResult>;
}

/** The name an erased athlete keeps (with the reference), on kept invoices and in the audit log. */
export const ERASED_NAME = 'Erased athlete';

/** Names compared as typed: spaces collapsed, letter case ignored. */
export function sameName(typed: string, fullName: string): boolean {
  const norm = (s: string) => s.normalize('NFC').trim().replace(/\s+/g, ' ').toLocaleLowerCase();
  return norm(typed) !== '' && norm(typed) === norm(fullName);
}

interface Latest {
  granted: number;
  recorded_at: string;
}

export function athleteDataService(d: {
  db: Db;
  store: MediaStore;
  processing: Processing;
  clips: ClipsService;
  revocations: UserRevocations;
  clock: () => Date;
  /** Partial resumable uploads (their bytes are the athlete's video too): removed with the athlete's clips. */
  partialUploads?: Pick<ResumableUploads, 'removeForAssessments'>;
}): AthleteDataService {
  const { db, store, processing, clips, revocations, clock } = d;

  const latestConsent = (athleteId: number, kind: string) =>
    db('consents').where({ athlete_id: athleteId, kind }).orderBy('id', 'desc').first<Latest | undefined>('granted', 'recorded_at');

  async function uniqueReference(clinicId: number): Promise<string> {
    for (let bytes = 2; ; bytes++) {
      for (let i = 0; i < 8; i++) {
        const ref = `E-${randomBytes(bytes).toString('hex').toUpperCase()}`;
        if (!(await db('athletes').where({ clinic_id: clinicId, erasure_ref: ref }).first('id'))) return ref;
      }
    }
  }

  /** Cancels the background work about the athlete's subjects (a running attempt is aborted). */
  async function cancelWork(athleteId: number): Promise<void> {
    const subjects: [string, string][] = [
      ['clip', 'clips'],
      ['still', 'stills'],
      ['summary', 'visit_summaries'],
      ['annotated_clip', 'annotated_clips'],
      ['data_export', 'data_exports'],
    ];
    for (const [subject, table] of subjects)
      for (const id of await db(table).where({ athlete_id: athleteId }).pluck('id')) await processing.cancel(subject, id as number);
  }

  return {
    async overview(user, athleteId) {
      const a = await accessibleAthlete(db, user, athleteId, 'athlete-data:read');
      const video = await latestConsent(athleteId, 'video_recording');
      const share = await latestConsent(athleteId, 'share_stills');
      const clipsRow = await db('clips')
        .where({ athlete_id: athleteId })
        .first<{ n: number; bytes: number | null }>(db.raw('count(*) as n'), db.raw('sum(size_bytes) as bytes'));
      const invoices = await db('invoices')
        .where({ athlete_id: athleteId })
        .whereNot({ status: 'draft' })
        .count<{ n: number }[]>('id as n');
      return {
        athleteId,
        fullName: `${a.first_name} ${a.last_name}`,
        videoConsent: video ? Boolean(video.granted) : null,
        shareConsent: share ? Boolean(share.granted) : null,
        videoWithdrawnAt: video && !video.granted && clipsRow.n > 0 ? video.recorded_at : null,
        clipCount: clipsRow.n,
        clipBytes: clipsRow.bytes ?? 0,
        keptInvoiceCount: Number(invoices[0]?.n ?? 0),
      };
    },

    async erase(user, athleteId, confirmName) {
      const a: AthleteRow = await accessibleAthlete(db, user, athleteId, 'athlete:erase');
      const fullName = `${a.first_name} ${a.last_name}`;
      if (!sameName(confirmName, fullName))
        throw new ValidationError('Type the athlete’s full name exactly as shown to confirm the erasure.', [
          { path: ['confirmName'], message: `Type “${fullName}” to confirm.` },
        ]);
      await cancelWork(athleteId);
      const clipIds = new Set((await db('clips').where({ athlete_id: athleteId }).pluck('id')) as number[]);
      const assessmentIds = new Set((await db('assessments').where({ athlete_id: athleteId }).pluck('id')) as number[]);
      const reference = await uniqueReference(user.clinicId);
      const at = clock().toISOString();
      let keptInvoices = 0;
      // Files before rows: a server stop halfway leaves the athlete to erase again (never files no row names).
      const removeFiles = async () => {
        for (const id of clipIds) await store.removePrefix(clipKeys(id).prefix);
        for (const id of assessmentIds) await store.removePrefix(assessmentPrefix(id));
        await store.removePrefix(exportPrefix(athleteId));
        await d.partialUploads?.removeForAssessments([...assessmentIds]);
      };
      await removeFiles();
      await db.transaction(async (trx) => {
        // Claimed first: a second erasure sent at the same moment (a double click, a retry) finds the
        // athlete erased and answers 404, so the reference the owner was given is the one kept. On
        // PostgreSQL it waits here for the first one's commit; a clip upload holding the row first
        // (see clips-service) commits its clip before this one reads the athlete's rows below.
        const claimed = await trx('athletes')
          .where({ id: athleteId, clinic_id: user.clinicId })
          .whereNull('erased_at')
          .update({ erased_at: at });
        if (!claimed) throw new NotFoundError('Athlete');
        // Clips and visits added since the list above (an upload that finished meanwhile): their files go too.
        for (const id of (await trx('clips').where({ athlete_id: athleteId }).pluck('id')) as number[]) clipIds.add(id);
        for (const id of (await trx('assessments').where({ athlete_id: athleteId }).pluck('id')) as number[]) assessmentIds.add(id);
        if (a.user_id !== null) await revokeUserSessions(trx, a.user_id);
        const planIds = (await trx('plans').where({ athlete_id: athleteId }).pluck('id')) as number[];
        await eraseCreateKeys(trx, user.clinicId, athleteId, [...assessmentIds], planIds);
        // Children before parents: the list names parents first.
        for (const name of [...ATHLETE_TABLE_NAMES].reverse()) {
          const t = ATHLETE_TABLES[name];
          if (t.erase === 'delete') await trx.raw(`DELETE FROM ${name} WHERE ${t.where}`, [athleteId]);
        }
        // Drafts were never issued: nothing requires keeping them.
        await trx('invoices').where({ athlete_id: athleteId, status: 'draft' }).delete();
        await trx('athletes').where({ id: athleteId }).update({
          first_name: ERASED_NAME,
          last_name: reference,
          email: null,
          user_id: null,
          coach_id: null,
          date_of_birth: null,
          height_cm: null,
          weekly_km: null,
          longest_run_km: null,
          goal_event: null,
          goal_date: null,
          surfaces: '[]',
          notes: null,
          updated_at: at,
          erased_at: at,
          erasure_ref: reference,
        });
        // Staff may have typed the athlete's name or contact into a kept invoice's note or line: the reference replaces it.
        await redactKeptInvoices(trx, athleteId, { firstName: a.first_name, lastName: a.last_name, email: a.email }, reference);
        // The demo inbox's copies of messages to or about the athlete.
        const mail = trx('mailbox_messages').where('text', 'like', `%${fullName}%`).orWhere('subject', 'like', `%${fullName}%`);
        if (a.email) mail.orWhereRaw('lower(to_address) = lower(?)', [a.email]).orWhere('text', 'like', `%${a.email}%`);
        await mail.delete();
        keptInvoices = Number(((await trx('invoices').where({ athlete_id: athleteId }).count('id as n')) as { n: number }[])[0]?.n ?? 0);
        await audit(
          trx,
          { clinicId: user.clinicId, actorId: user.id, athleteId, action: 'athlete.erased', detail: { reference, keptInvoices } },
          at,
        );
      });
      // Once more: what work still running elsewhere wrote meanwhile.
      await removeFiles();
      if (a.user_id !== null) revocations.revoke(a.user_id);
      return { reference, keptInvoices };
    },

    async eraseClips(user, athleteId) {
      await accessibleAthlete(db, user, athleteId, 'clip:erase-all');
      const rows = await db('clips').where({ athlete_id: athleteId }).select('id', 'assessment_id');
      await clips.removeClips(rows);
      await d.partialUploads?.removeForAssessments(await db('assessments').where({ athlete_id: athleteId }).pluck('id'));
      await audit(
        db,
        { clinicId: user.clinicId, actorId: user.id, athleteId, action: 'athlete.clips_erased', detail: { clips: rows.length } },
        clock().toISOString(),
      );
      return { removedClips: rows.length };
    },
  };
}
