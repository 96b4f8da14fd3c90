import type { Assessment, AssessmentDetail, SessionUser } from '../../src/contracts/api';
import { toMetresPerSecond } from '../../src/contracts/assessment';
import type { Db } from '../db/knex';
import { createOnce } from '../db/create-once';
import { audit } from '../audit/audit-log';
import { accessibleAthlete } from '../policy/athlete-resources';
import { assertRole, assertScope, may } from '../policy/enforce';
import { NotFoundError } from '../errors';
import { preparedRead } from '../db/prepared-read';
import type { ClipsService } from '../clips/clips-service';
import type { MediaStore } from '../storage/media-store';
import { assessmentPrefix } from '../storage/media-keys';
import { clipsRepository } from '../clips/clips-repository';
import { assessmentsRepository as repo, type AssessmentRow } from './assessments-repository';
import type { AssessmentInput, AssessmentPatch } from './assessments-schemas';

/** The assessment page's row: the assessment, its athlete's account and the latest video-recording consent, in one read. */
const PAGE_SQL = `SELECT s.*, a.user_id AS athlete_user_id,
    (SELECT k.granted FROM consents k WHERE k.athlete_id = s.athlete_id AND k.kind = 'video_recording' ORDER BY k.id DESC LIMIT 1) AS video_consent
  FROM assessments s JOIN athletes a ON a.id = s.athlete_id AND a.clinic_id = s.clinic_id
  WHERE s.id = ? AND s.clinic_id = ?`;

type PageRow = AssessmentRow & { athlete_user_id: number | null; video_consent: number | null };

/** Dated gait visits of an athlete. Staff write; the athlete reads their own. */
export interface AssessmentsService {
  list(user: SessionUser, athleteId: number): Promise<Assessment[]>;
  /** A new visit; with `key` (the client's `Idempotency-Key`), the same visit sent again answers the one it made. */
  create(user: SessionUser, athleteId: number, input: AssessmentInput, key?: string): Promise<Assessment>;
  /** One assessment with its clips and whether the athlete's video consent is in force. */
  get(user: SessionUser, id: number): Promise<AssessmentDetail>;
  update(user: SessionUser, id: number, patch: AssessmentPatch): Promise<Assessment>;
  /** Deletes the assessment with its clips, their processing and every stored file. */
  remove(user: SessionUser, id: number): Promise<void>;
}

export function assessmentsService({ db, clips, store }: { db: Db; clips: ClipsService; store: MediaStore }): AssessmentsService {
  const now = () => new Date().toISOString();
  const readPage = preparedRead<PageRow>(db, PAGE_SQL);
  const readClips = clipsRepository.listForAssessmentReader(db);

  async function toApi(user: SessionUser, row: AssessmentRow): Promise<Assessment> {
    return repo.toApi(row, await repo.clipCount(db, row.id), may(user, 'assessment:read-notes'));
  }

  function speedColumns(speed: AssessmentInput['speed'] | undefined): Partial<AssessmentRow> {
    if (speed === undefined) return {};
    if (speed === null) return { speed_mps: null };
    return { speed_mps: toMetresPerSecond(speed.value, speed.unit), speed_unit: speed.unit };
  }

  return {
    async list(user: SessionUser, athleteId: number): Promise<Assessment[]> {
      await accessibleAthlete(db, user, athleteId, 'assessment:list');
      const rows = await repo.listForAthlete(db, athleteId);
      return rows.map((r) => repo.toApi(r, Number(r.clip_count), may(user, 'assessment:read-notes')));
    },

    async create(user: SessionUser, athleteId: number, input: AssessmentInput, key?: string): Promise<Assessment> {
      await accessibleAthlete(db, user, athleteId, 'assessment:create');
      const at = now();
      const request = { athleteId, ...input };
      const id = await createOnce(db, {
        clinicId: user.clinicId,
        kind: 'assessment',
        key,
        request,
        at,
        create: async (trx) => {
          const newId = await repo.insert(trx, {
            clinic_id: user.clinicId,
            athlete_id: athleteId,
            date: input.date,
            kind: input.kind,
            surface: input.surface,
            speed_mps: null,
            speed_unit: 'kmh',
            ...speedColumns(input.speed),
            incline_percent: input.inclinePercent,
            shoes: input.shoes,
            camera_notes: input.cameraNotes,
            notes: input.notes,
            created_by: user.id,
            created_at: at,
            updated_at: at,
          });
          await audit(
            trx,
            { clinicId: user.clinicId, actorId: user.id, athleteId, action: 'assessment.created', detail: { assessmentId: newId } },
            at,
          );
          return newId;
        },
      });
      return toApi(user, (await repo.find(db, user.clinicId, id))!);
    },

    async get(user: SessionUser, id: number): Promise<AssessmentDetail> {
      // The page is read often: two prepared reads, checked against the same policy as accessibleAssessment.
      assertRole(user, 'assessment:read');
      const [page] = await readPage([id, user.clinicId]);
      if (!page) throw new NotFoundError('Assessment');
      assertScope(user, 'assessment:read', { clinicId: user.clinicId, athleteUserId: page.athlete_user_id }, 'Assessment');
      const { athlete_user_id: _user, video_consent: consent, ...row } = page;
      const clipList = await readClips(id);
      // The clip count is the length of the list just read (one query fewer on a page read often).
      return { ...repo.toApi(row, clipList.length, may(user, 'assessment:read-notes')), clips: clipList, videoConsent: Boolean(consent) };
    },

    async update(user: SessionUser, id: number, patch: AssessmentPatch): Promise<Assessment> {
      const row = await clips.accessibleAssessment(user, id, 'assessment:update');
      const changes: Partial<AssessmentRow> = { updated_at: now(), ...speedColumns(patch.speed) };
      if (patch.date !== undefined) changes.date = patch.date;
      if (patch.kind !== undefined) changes.kind = patch.kind;
      if (patch.surface !== undefined) changes.surface = patch.surface;
      if (patch.inclinePercent !== undefined) changes.incline_percent = patch.inclinePercent;
      if (patch.shoes !== undefined) changes.shoes = patch.shoes;
      if (patch.cameraNotes !== undefined) changes.camera_notes = patch.cameraNotes;
      if (patch.notes !== undefined) changes.notes = patch.notes;
      await db.transaction(async (trx) => {
        await repo.update(trx, id, changes);
        await audit(trx, {
          clinicId: user.clinicId,
          actorId: user.id,
          athleteId: row.athlete_id,
          action: 'assessment.updated',
          detail: { assessmentId: id, fields: Object.keys(patch) },
        });
      });
      return toApi(user, (await repo.find(db, user.clinicId, id))!);
    },

    async remove(user: SessionUser, id: number): Promise<void> {
      const row = await clips.accessibleAssessment(user, id, 'assessment:delete');
      const clipIds = await clipsRepository.idsForAssessment(db, id);
      await clips.removeClips(clipIds.map((clipId) => ({ id: clipId, assessment_id: id })));
      // Visit summaries' PDFs are kept under the assessment's prefix: removed before the row, so a
      // server stop halfway leaves the assessment to delete again; once more after, for a render
      // that finished meanwhile.
      await store.removePrefix(assessmentPrefix(id));
      await db('assessments').where({ id }).delete();
      await store.removePrefix(assessmentPrefix(id));
      await audit(db, {
        clinicId: user.clinicId,
        actorId: user.id,
        athleteId: row.athlete_id,
        action: 'assessment.deleted',
        detail: { assessmentId: id, clips: clipIds.length },
      });
    },
  };
}
