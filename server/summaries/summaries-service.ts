import fs from 'node:fs';
import path from 'node:path';
import type { Logger } from 'pino';
import type { SessionUser } from '../../src/contracts/api';
import {
  ASSESSMENT_KIND_LABELS,
  FILM_SURFACE_LABELS,
  SPEED_UNIT_LABELS,
  formatPace,
  fromMetresPerSecond,
} from '../../src/contracts/assessment';
import type { VisitSummary, VisitSummaryCreate } from '../../src/contracts/sharing';
import { compareMeasures } from '../../src/kinematics';
import type { Db } from '../db/knex';
import { AppError, ConflictError, NotFoundError } from '../errors';
import { audit } from '../audit/audit-log';
import type { Action } from '../policy/access-table';
import { accessibleAthlete } from '../policy/athlete-resources';
import { listGrant, throughSelfGrant } from '../policy/enforce';
import type { Job, JobQueue, SubjectFailure } from '../jobs/job-queue';
import { PermanentJobError, type JobHandler } from '../jobs/worker';
import type { Mailer } from '../mail/mailer';
import { accessibleShared, setPublication } from '../sharing/shared-items';
import type { MediaStore } from '../storage/media-store';
import { assessmentsRepository, type AssessmentRow } from '../assessments/assessments-repository';
import type { ClipsService } from '../clips/clips-service';
import type { MeasuresService } from '../measures/measures-service';
import type { StillsService } from '../stills/stills-service';
import { displayDate } from '../stills/stills-service';
import { SUMMARY_CAUTION, renderSummaryPdf, type SummaryVisit } from '../render/summary-pdf';
import type { ClinicBrands } from '../clinic/clinic-brand';
import { legalFooter } from '../mail/branded-mail';
import { summariesRepository as repo, summaryFile, type SummaryRow } from './summaries-repository';
import { summaryFileName, type SummaryFileName } from './summary-file-name';
import { clinicBands } from '../measures/reference-bands';

export const RENDER_SUMMARY_JOB = 'render_summary';
export const SUMMARIES_DIR = 'summaries';
const subjectOf = (id: number) => `summary:${id}`;

export interface SummariesDeps {
  db: Db;
  store: MediaStore;
  queue: JobQueue;
  clips: ClipsService;
  stills: StillsService;
  measures: MeasuresService;
  mailer: Mailer;
  logger: Logger;
  publicUrl: string;
  clock: () => Date;
  wakeWorker: () => void;
  /** The clinic's logo and legal details for the PDF's letterhead (none: the clinic's name only). */
  brands?: ClinicBrands;
}

/** "3.06 m/s (11.0 km/h)", in the unit the coach typed it in. */
export function speedText(a: Pick<AssessmentRow, 'speed_mps' | 'speed_unit'>): string {
  if (a.speed_mps === null) return 'Not recorded';
  const typed = fromMetresPerSecond(a.speed_mps, a.speed_unit);
  const shown = a.speed_unit === 's_per_km' || a.speed_unit === 's_per_mile' ? formatPace(typed) : typed.toFixed(1);
  return `${a.speed_mps.toFixed(2)} m/s (${shown} ${SPEED_UNIT_LABELS[a.speed_unit]})`;
}

const visitLabel = (a: AssessmentRow) => `${ASSESSMENT_KIND_LABELS[a.kind]} · ${displayDate(a.date)}`;

/** Visit summaries: a PDF of a visit or of a Re-test against its baseline, rendered as a job. */
export function summariesService(d: SummariesDeps) {
  const { db } = d;
  const now = () => d.clock().toISOString();

  function folder(assessmentId: number): string {
    return path.join(d.store.assessmentDir(assessmentId), SUMMARIES_DIR);
  }

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
      let id = 0;
      await db.transaction(async (trx) => {
        id = await repo.insert(trx, {
          clinic_id: user.clinicId,
          athlete_id: assessment.athlete_id,
          assessment_id: assessment.id,
          baseline_assessment_id: baseline?.id ?? null,
          title,
          findings: body.findings.trim(),
          plan_text: body.planText.trim(),
          still_ids: JSON.stringify(body.stillIds),
          status: 'rendering',
          progress: 0,
          error: null,
          page_count: null,
          published_at: null,
          published_by: null,
          created_by: user.id,
          created_at: at,
          updated_at: at,
        });
        await d.queue.enqueue(trx, RENDER_SUMMARY_JOB, subjectOf(id), { summaryId: id });
      });
      d.wakeWorker();
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
      await d.queue.cancelSubject(subjectOf(id));
      await db('visit_summaries').where({ id }).delete();
      await fs.promises.rm(path.join(folder(row.assessment_id), summaryFile(id)), { force: true });
      await audit(db, {
        clinicId: user.clinicId,
        actorId: user.id,
        athleteId: row.athlete_id,
        action: 'summary.deleted',
        detail: { summaryId: id },
      });
    },

    /** The PDF of a ready summary and its download name (athlete, visit, date); logs an athlete's view. */
    async pdfPath(user: SessionUser, id: number): Promise<{ file: string; row: SummaryRow; fileName: SummaryFileName }> {
      const row = await accessibleSummary(user, id);
      if (row.status !== 'ready') throw new NotFoundError('Visit summary PDF');
      const file = path.join(folder(row.assessment_id), summaryFile(id));
      if (!fs.existsSync(file)) throw new NotFoundError('Visit summary PDF');
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
      return { file, row, fileName };
    },

    /** The render job: gather visit facts, measures and stills → PDF, with progress. */
    renderJob: (async (job: Job) => {
      const id = Number(job.payload['summaryId']);
      const row = await repo.findById(db, id);
      if (!row) return;
      const progress = (f: number) => repo.update(db, id, { progress: Math.min(0.95, f) });
      const assessment = await db<AssessmentRow>('assessments').where({ id: row.assessment_id }).first();
      if (!assessment) throw new PermanentJobError('The assessment of this summary was deleted.');
      const baseline = row.baseline_assessment_id
        ? ((await db<AssessmentRow>('assessments').where({ id: row.baseline_assessment_id }).first()) ?? null)
        : null;
      const athlete = await db('athletes')
        .where({ id: row.athlete_id })
        .first<{ first_name: string; last_name: string }>('first_name', 'last_name');
      const clinic = await db('clinics').where({ id: row.clinic_id }).first<{ name: string }>('name');
      const coach = row.created_by
        ? await db('users').where({ id: row.created_by }).first<{ name: string } | undefined>('name')
        : undefined;

      const visitOf = (a: AssessmentRow): SummaryVisit => ({
        label: visitLabel(a),
        surface: FILM_SURFACE_LABELS[a.surface],
        speed: speedText(a),
        incline: a.incline_percent === null ? null : `${a.incline_percent} %`,
        shoes: a.shoes,
      });
      const current = await d.measures.ofAssessment(assessment.id);
      let comparison = null;
      if (baseline) comparison = compareMeasures(await d.measures.ofAssessment(baseline.id), current);
      const clipCount = current.length;
      const measures = current.map((m, i) => ({ heading: `Clip ${i + 1} of ${clipCount}`, measures: m.measures }));
      await progress(0.1);

      const stills = [];
      for (const stillId of JSON.parse(row.still_ids) as number[]) {
        const png = await d.stills.pngOf(stillId);
        // A still deleted (or whose clip was deleted) after the summary was requested drops out.
        if (png) stills.push({ image: png.file, width: png.row.width ?? 1, height: png.row.height ?? 1, caption: png.row.caption });
      }
      const brand = await d.brands?.forDocuments(row.clinic_id);
      const { pdf, pageCount } = await renderSummaryPdf(
        {
          clinicName: clinic?.name ?? 'Your clinic',
          clinicLogo: brand?.logo ?? null,
          clinicLegalLines: brand ? legalFooter(brand) : [],
          athleteName: `${athlete.first_name} ${athlete.last_name}`,
          title: baseline ? 'Re-test comparison' : 'Visit summary',
          issuedOn: displayDate(now().slice(0, 10)),
          coachName: coach?.name ?? 'your clinic',
          visits: baseline ? [visitOf(baseline), visitOf(assessment)] : [visitOf(assessment)],
          measures,
          comparison,
          bands: await clinicBands(db, row.clinic_id),
          stills,
          findings: row.findings,
          planText: row.plan_text,
          caution: SUMMARY_CAUTION,
        },
        (f) => progress(0.1 + f * 0.85),
      );
      const dir = folder(row.assessment_id);
      await fs.promises.mkdir(dir, { recursive: true });
      const tmp = path.join(dir, `.${summaryFile(id)}.tmp`);
      await fs.promises.writeFile(tmp, pdf);
      await fs.promises.rename(tmp, path.join(dir, summaryFile(id)));
      if (!(await repo.findById(db, id))) {
        await fs.promises.rm(path.join(dir, summaryFile(id)), { force: true });
        return;
      }
      await repo.update(db, id, { status: 'ready', progress: 1, error: null, page_count: pageCount, updated_at: now() });
    }) satisfies JobHandler,

    /** When the render job is over for good: the summary is `failed` with the reason (unless it got ready). */
    renderFailure: {
      async fail(trx, job, reason) {
        await trx('visit_summaries')
          .where({ id: Number(job.payload['summaryId']) })
          .whereNot({ status: 'ready' })
          .update({ status: 'failed', error: `The summary could not be made: ${reason}`, updated_at: now() });
      },
    } satisfies SubjectFailure,
  };
}

export type SummariesService = ReturnType<typeof summariesService>;
