import type { Logger } from 'pino';
import type { SessionUser } from '../../src/contracts/api';
import { ASSESSMENT_KIND_LABELS } from '../../src/contracts/assessment';
import type { VisitSummary, VisitSummaryCreate } from '../../src/contracts/sharing';
import type { Db } from '../db/knex';
import { AppError, ConflictError, NotFoundError } from '../errors';
import { audit } from '../audit/audit-log';
import type { Action } from '../policy/access-table';
import { accessibleAthlete } from '../policy/athlete-resources';
import { listGrant, throughSelfGrant } from '../policy/enforce';
import type { Mailer } from '../mail/mailer';
import type { Processing } from '../processing/processing';
import { renderOnce } from '../processing/render-once';
import { accessibleShared, deleteShared, setPublication } from '../sharing/shared-items';
import { summaryKey } from '../storage/media-keys';
import type { MediaStore } from '../storage/media-store';
import { assessmentsRepository, type AssessmentRow } from '../assessments/assessments-repository';
import type { ClipsService } from '../clips/clips-service';
import type { MeasuresService } from '../measures/measures-service';
import type { StillsService } from '../stills/stills-service';
import type { ClinicBrands } from '../clinic/clinic-brand';
import { summariesRepository as repo, type SummaryRow } from './summaries-repository';
import { summaryFileName, type SummaryFileName } from './summary-file-name';
import { RENDER_SUMMARY, renderSummaryKind, visitLabel } from './render-summary-kind';

export interface SummariesDeps {
  db: Db;
  store: MediaStore;
  processing: Processing;
  clips: ClipsService;
  stills: StillsService;
  measures: MeasuresService;
  mailer: Mailer;
  logger: Logger;
  publicUrl: string;
  clock: () => Date;
  /** The clinic's logo and legal details for the PDF's letterhead (none: the clinic's name only). */
  brands?: ClinicBrands;
}

/** A ready summary's stored PDF and its download name. */
export interface SummaryPdf {
  key: string;
  row: SummaryRow;
  fileName: SummaryFileName;
}

/**
 * Visit summaries: a PDF of a visit or of a Re-test against its baseline, made as the
 * `render_summary` processed item; publish, download.
 */
export interface SummariesService {
  create(user: SessionUser, assessmentId: number, body: VisitSummaryCreate): Promise<VisitSummary>;
  list(user: SessionUser, athleteId: number): Promise<VisitSummary[]>;
  get(user: SessionUser, id: number): Promise<VisitSummary>;
  setPublished(user: SessionUser, id: number, publish: boolean): Promise<VisitSummary>;
  remove(user: SessionUser, id: number): Promise<void>;
  /** The PDF of a ready summary and its download name (athlete, visit, date); logs an athlete's view. */
  pdf(user: SessionUser, id: number): Promise<SummaryPdf>;
}

export function summariesService(d: SummariesDeps): SummariesService {
  const { db, processing } = d;
  const now = () => d.clock().toISOString();
  processing.register(renderSummaryKind(d));

  const accessibleSummary = (user: SessionUser, id: number, action: Action = 'summary:read') =>
    accessibleShared<SummaryRow>(db, 'summary', user, id, action);

  async function view(id: number): Promise<VisitSummary> {
    const [s] = await repo.view(db, { id }, { publishedOnly: false });
    if (!s) throw new NotFoundError('Visit summary');
    return s;
  }

  return {
    async create(user: SessionUser, assessmentId: number, body: VisitSummaryCreate): Promise<VisitSummary> {
      const assessment = await d.clips.accessibleAssessment(user, assessmentId, 'summary:create');
      let baseline: AssessmentRow | null = null;
      if (body.baselineAssessmentId) {
        baseline = (await assessmentsRepository.find(db, user.clinicId, body.baselineAssessmentId)) ?? null;
        if (!baseline) throw new NotFoundError('Baseline assessment');
        if (baseline.athlete_id !== assessment.athlete_id)
          throw new AppError(422, 'other_athlete', 'Both assessments of a comparison summary must belong to the same athlete.');
        if (baseline.id === assessment.id)
          throw new AppError(422, 'same_assessment', 'Choose an earlier assessment to compare with, not this one.');
      }
      for (const stillId of body.stillIds) {
        const still = await db('stills')
          .where({ id: stillId, clinic_id: user.clinicId })
          .first<{ athlete_id: number; status: string; clip_id: number | null } | undefined>('athlete_id', 'status', 'clip_id');
        if (!still || still.athlete_id !== assessment.athlete_id)
          throw new AppError(422, 'still_not_found', `Still ${stillId} is not one of this athlete’s stills.`, [
            { path: ['stillIds'], message: `Still ${stillId} was not found for this athlete.` },
          ]);
        if (still.clip_id === null)
          throw new AppError(422, 'clip_deleted', `Still ${stillId} lost its image when its clip was deleted; leave it out.`, [
            { path: ['stillIds'], message: `Still ${stillId} has no image.` },
          ]);
        if (still.status !== 'ready')
          throw new AppError(422, 'still_not_ready', `Still ${stillId} is not rendered yet; wait a moment and try again.`, [
            { path: ['stillIds'], message: `Still ${stillId} is still rendering.` },
          ]);
      }
      const title = baseline
        ? `Re-test comparison: ${visitLabel(baseline)} and ${visitLabel(assessment)}`
        : `Visit summary: ${visitLabel(assessment)}`;
      const at = now();
      const content = {
        clinic_id: user.clinicId,
        assessment_id: assessment.id,
        baseline_assessment_id: baseline?.id ?? null,
        findings: body.findings.trim(),
        plan_text: body.planText.trim(),
        still_ids: JSON.stringify(body.stillIds),
      };
      // The same summary asked for again while it renders (a double click, a retry) is that one, not a second PDF.
      const { id, made } = await renderOnce(db, processing, {
        table: 'visit_summaries',
        lock: (trx) => trx('assessments').where({ id: assessment.id }).select('id'),
        same: content,
        kind: RENDER_SUMMARY,
        scope: { clinicId: user.clinicId, athleteId: assessment.athlete_id },
        insert: (trx) =>
          repo.insert(trx, {
            athlete_id: assessment.athlete_id,
            title,
            ...content,
            status: 'rendering',
            error: null,
            page_count: null,
            published_at: null,
            published_by: null,
            created_by: user.id,
            created_at: at,
            updated_at: at,
          }),
      });
      if (made)
        await audit(db, {
          clinicId: user.clinicId,
          actorId: user.id,
          athleteId: assessment.athlete_id,
          action: 'summary.created',
          detail: { summaryId: id, assessmentId },
        });
      return view(id);
    },

    async list(user: SessionUser, athleteId: number): Promise<VisitSummary[]> {
      await accessibleAthlete(db, user, athleteId, 'summary:list');
      const publishedOnly = listGrant(user, 'summary:list').when.includes('published');
      return repo.view(db, { athlete_id: athleteId, clinic_id: user.clinicId }, { publishedOnly });
    },

    async get(user: SessionUser, id: number): Promise<VisitSummary> {
      await accessibleSummary(user, id);
      return view(id);
    },

    async setPublished(user: SessionUser, id: number, publish: boolean): Promise<VisitSummary> {
      const row = await accessibleSummary(user, id, 'summary:publish');
      if (publish && row.status !== 'ready')
        throw new ConflictError(
          row.status === 'failed'
            ? 'This summary could not be made; delete it and create it again.'
            : 'This summary is still being made: publish it when it is ready.',
          'summary_not_ready',
        );
      await setPublication(d, 'summary', user, row, publish);
      return view(id);
    },

    async remove(user: SessionUser, id: number): Promise<void> {
      const row = await accessibleSummary(user, id, 'summary:delete');
      await deleteShared(d, 'summary', user, row, () => d.store.remove(summaryKey(row.assessment_id, id)));
    },

    async pdf(user, id) {
      const row = await accessibleSummary(user, id);
      if (row.status !== 'ready') throw new NotFoundError('Visit summary PDF');
      const key = summaryKey(row.assessment_id, id);
      if (!(await d.store.stat(key))) throw new NotFoundError('Visit summary PDF');
      if (throughSelfGrant(user, 'summary:read'))
        await audit(db, {
          clinicId: user.clinicId,
          actorId: user.id,
          athleteId: row.athlete_id,
          action: 'summary.viewed',
          detail: { summaryId: id },
        });
      const athlete = await db('athletes')
        .where({ id: row.athlete_id })
        .first<{ first_name: string; last_name: string }>('first_name', 'last_name');
      const visit = await db<AssessmentRow>('assessments').where({ id: row.assessment_id }).first();
      const fileName = summaryFileName({
        athleteName: `${athlete.first_name} ${athlete.last_name}`,
        what: row.baseline_assessment_id ? 'Re-test comparison' : `${visit ? ASSESSMENT_KIND_LABELS[visit.kind] : 'Visit'} visit summary`,
        date: visit?.date ?? '',
      });
      return { key, row, fileName };
    },
  };
}
