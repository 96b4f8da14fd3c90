import type { SessionUser } from '../../src/contracts/api';
import { selectRows } from '../db/dialect';
import type { RetentionItem, RetentionReview, RetentionSettings } from '../../src/contracts/privacy';
import { audit } from '../audit/audit-log';
import type { ClipsService } from '../clips/clips-service';
import type { Db } from '../db/knex';
import { ConflictError, NotFoundError } from '../errors';
import { assertRole } from '../policy/enforce';
import { latestOf, pastRetention } from './retention-rules';

/** Clip retention: the owner's setting, the daily list of clips due for removal, and the owner's confirmation. */
export interface RetentionService {
  settings(user: SessionUser): Promise<RetentionSettings>;
  setMonths(user: SessionUser, months: number | null): Promise<RetentionSettings>;
  /** Lists the clips due now (a new review), as the daily check does. */
  review(user: SessionUser): Promise<RetentionSettings>;
  /** Removes the clips of the latest review that are still due; 409 for an older or confirmed review. */
  confirm(user: SessionUser, reviewId: number): Promise<RetentionSettings>;
  /** The daily check: a new review for every clinic with retention on whose last one is a day old (or none). */
  runDaily(): Promise<number>;
}

interface ReviewRow {
  id: number;
  clinic_id: number;
  items: string;
  total_bytes: number;
  listed_at: string;
  confirmed_at: string | null;
  removed_count: number | null;
}

interface CandidateRow {
  clip_id: number;
  athlete_id: number;
  assessment_id: number;
  first_name: string;
  last_name: string;
  original_name: string;
  size_bytes: number;
  assessment_date: string;
  athlete_updated: string;
  last_visit: string | null;
  last_visit_change: string | null;
  last_clip: string | null;
  last_log: string | null;
  last_plan: string | null;
}

const CANDIDATES_SQL = `SELECT c.id AS clip_id, c.athlete_id, c.assessment_id, a.first_name, a.last_name, c.original_name, c.size_bytes,
    s.date AS assessment_date, a.updated_at AS athlete_updated,
    (SELECT MAX(x.date) FROM assessments x WHERE x.athlete_id = a.id) AS last_visit,
    (SELECT MAX(x.updated_at) FROM assessments x WHERE x.athlete_id = a.id) AS last_visit_change,
    (SELECT MAX(x.created_at) FROM clips x WHERE x.athlete_id = a.id) AS last_clip,
    (SELECT MAX(x.created_at) FROM log_entries x WHERE x.athlete_id = a.id) AS last_log,
    (SELECT MAX(x.updated_at) FROM plans x WHERE x.athlete_id = a.id) AS last_plan
  FROM clips c JOIN athletes a ON a.id = c.athlete_id JOIN assessments s ON s.id = c.assessment_id
  WHERE c.clinic_id = ? AND a.erased_at IS NULL
  ORDER BY a.last_name, a.first_name, s.date, c.id`;

const DAY_MS = 86_400_000;

export function retentionService(d: { db: Db; clips: ClipsService; clock: () => Date }): RetentionService {
  const { db, clips, clock } = d;

  const monthsOf = async (clinicId: number): Promise<number | null> =>
    (await db('clinics').where({ id: clinicId }).first<{ clip_retention_months: number | null }>('clip_retention_months'))
      ?.clip_retention_months ?? null;

  /** The clips due for removal now. */
  async function due(clinicId: number, months: number): Promise<RetentionItem[]> {
    const rows = await selectRows<CandidateRow>(db, CANDIDATES_SQL, [clinicId]);
    const now = clock();
    const out: RetentionItem[] = [];
    for (const r of rows) {
      const last =
        latestOf([r.athlete_updated, r.last_visit, r.last_visit_change, r.last_clip, r.last_log, r.last_plan]) ?? r.athlete_updated;
      if (!pastRetention(last, months, now)) continue;
      out.push({
        clipId: r.clip_id,
        athleteId: r.athlete_id,
        athleteName: `${r.first_name} ${r.last_name}`,
        assessmentDate: r.assessment_date,
        originalName: r.original_name,
        sizeBytes: r.size_bytes,
        lastActivity: last,
      });
    }
    return out;
  }

  async function latestReview(clinicId: number): Promise<ReviewRow | undefined> {
    return db<ReviewRow>('clip_retention_reviews').where({ clinic_id: clinicId }).orderBy('id', 'desc').first();
  }

  /** A review as shown: its clips that are still due (an athlete active since, or a clip deleted since, drops out). */
  async function view(clinicId: number, row: ReviewRow | undefined, months: number | null): Promise<RetentionReview | null> {
    if (!row) return null;
    const listed = new Set((JSON.parse(row.items) as { clipId: number }[]).map((i) => i.clipId));
    const items = row.confirmed_at || months === null ? [] : (await due(clinicId, months)).filter((i) => listed.has(i.clipId));
    return {
      id: row.id,
      listedAt: row.listed_at,
      items,
      totalBytes: items.reduce((s, i) => s + i.sizeBytes, 0),
      confirmedAt: row.confirmed_at,
      removedCount: row.removed_count,
    };
  }

  async function settingsOf(clinicId: number): Promise<RetentionSettings> {
    const months = await monthsOf(clinicId);
    return { months, review: await view(clinicId, await latestReview(clinicId), months) };
  }

  async function list(clinicId: number, months: number): Promise<void> {
    const items = await due(clinicId, months);
    await db('clip_retention_reviews').insert({
      clinic_id: clinicId,
      items: JSON.stringify(items.map((i) => ({ clipId: i.clipId, athleteId: i.athleteId, sizeBytes: i.sizeBytes }))),
      total_bytes: items.reduce((s, i) => s + i.sizeBytes, 0),
      listed_at: clock().toISOString(),
    });
  }

  return {
    async settings(user) {
      assertRole(user, 'retention:read');
      return settingsOf(user.clinicId);
    },

    async setMonths(user, months) {
      assertRole(user, 'retention:update');
      const at = clock().toISOString();
      await db.transaction(async (trx) => {
        await trx('clinics').where({ id: user.clinicId }).update({ clip_retention_months: months });
        await audit(trx, { clinicId: user.clinicId, actorId: user.id, action: 'clinic.clip_retention_set', detail: { months } }, at);
      });
      return settingsOf(user.clinicId);
    },

    async review(user) {
      assertRole(user, 'retention:review');
      const months = await monthsOf(user.clinicId);
      if (months === null) throw new ConflictError('Set how many months clips are kept before checking.', 'retention_off');
      await list(user.clinicId, months);
      return settingsOf(user.clinicId);
    },

    async confirm(user, reviewId) {
      assertRole(user, 'retention:confirm');
      const row = await db<ReviewRow>('clip_retention_reviews').where({ id: reviewId, clinic_id: user.clinicId }).first();
      if (!row) throw new NotFoundError('Retention list');
      const latest = await latestReview(user.clinicId);
      if (row.confirmed_at) throw new ConflictError('This list was already confirmed.', 'review_confirmed');
      if (latest?.id !== row.id) throw new ConflictError('A newer list exists; confirm that one.', 'review_outdated');
      const months = await monthsOf(user.clinicId);
      const shown = await view(user.clinicId, row, months);
      const items = shown?.items ?? [];
      const at = clock().toISOString();
      // Taken before anything is removed: the same list confirmed twice at once (a double click, a
      // resend) removes and audits once; the other answer is 409. A stop part-way leaves the rest due:
      // the next daily check lists them again.
      const claimed = await db('clip_retention_reviews')
        .where({ id: row.id })
        .whereNull('confirmed_at')
        .update({ confirmed_at: at, confirmed_by: user.id, removed_count: items.length });
      if (!claimed) throw new ConflictError('This list was already confirmed.', 'review_confirmed');
      await clips.removeClips(
        await db('clips')
          .whereIn(
            'id',
            items.map((i) => i.clipId),
          )
          .select('id', 'assessment_id'),
      );
      for (const athleteId of new Set(items.map((i) => i.athleteId)))
        await audit(
          db,
          {
            clinicId: user.clinicId,
            actorId: user.id,
            athleteId,
            action: 'athlete.clips_removed_by_retention',
            detail: { clips: items.filter((i) => i.athleteId === athleteId).length, months },
          },
          at,
        );
      return settingsOf(user.clinicId);
    },

    async runDaily() {
      const clinics = (await db('clinics').whereNotNull('clip_retention_months').select('id', 'clip_retention_months')) as {
        id: number;
        clip_retention_months: number;
      }[];
      let listed = 0;
      for (const c of clinics) {
        const last = await latestReview(c.id);
        if (last && clock().getTime() - new Date(last.listed_at).getTime() < DAY_MS - 60_000) continue;
        await list(c.id, c.clip_retention_months);
        listed++;
      }
      return listed;
    },
  };
}
