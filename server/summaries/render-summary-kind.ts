import {
  ASSESSMENT_KIND_LABELS,
  FILM_SURFACE_LABELS,
  SPEED_UNIT_LABELS,
  formatPace,
  fromMetresPerSecond,
} from '../../src/contracts/assessment';
import { compareMeasures } from '../../src/kinematics';
import type { Db } from '../db/knex';
import type { AssessmentRow } from '../assessments/assessments-repository';
import type { MeasuresService } from '../measures/measures-service';
import { clinicBands } from '../measures/reference-bands';
import { NotReadyError, PermanentError, type ProcessingKind } from '../processing/processed-item';
import { SUMMARY_CAUTION, renderSummaryPdf, type SummaryVisit } from '../render/summary-pdf';
import { summaryKey } from '../storage/media-keys';
import type { MediaStore } from '../storage/media-store';
import type { StillsService } from '../stills/stills-service';
import { displayDate } from '../stills/stills-service';
import { summariesRepository as repo } from './summaries-repository';
import type { ClinicBrands } from '../clinic/clinic-brand';
import { legalFooter } from '../mail/branded-mail';

/** The kind that makes a visit summary's PDF. */
export const RENDER_SUMMARY = 'render_summary';

/** "3.06 m/s (11.0 km/h)", in the unit the coach typed it in. */
export function speedText(a: Pick<AssessmentRow, 'speed_mps' | 'speed_unit'>): string {
  if (a.speed_mps === null) return 'Not recorded';
  const typed = fromMetresPerSecond(a.speed_mps, a.speed_unit);
  const shown = a.speed_unit === 's_per_km' || a.speed_unit === 's_per_mile' ? formatPace(typed) : typed.toFixed(1);
  return `${a.speed_mps.toFixed(2)} m/s (${shown} ${SPEED_UNIT_LABELS[a.speed_unit]})`;
}

/** "Baseline · 6 Oct 2026". */
export const visitLabel = (a: AssessmentRow) => `${ASSESSMENT_KIND_LABELS[a.kind]} · ${displayDate(a.date)}`;

export interface RenderSummaryDeps {
  db: Db;
  store: MediaStore;
  stills: StillsService;
  measures: MeasuresService;
  clock: () => Date;
  /** The clinic's logo and legal details for the PDF's letterhead (none: the clinic's name only). */
  brands?: ClinicBrands;
}

/**
 * Visit-summary rendering as a processed item about a summary: gathers the visit facts, measures
 * (and the comparison with the baseline) and the ready stills, renders the PDF with progress and
 * stores it; the summary is ready with its page count in the same transaction as its item.
 */
export function renderSummaryKind(d: RenderSummaryDeps): ProcessingKind<{ pageCount: number } | null> {
  const { db, store } = d;
  return {
    name: RENDER_SUMMARY,
    subject: 'summary',
    athleteSees: false,

    async run(item, ctx) {
      const id = item.subjectId;
      const row = await repo.findById(db, id);
      if (!row) return null;
      const progress = (f: number) => ctx.progress(Math.round(Math.min(0.95, f) * 100), 100);
      const assessment = await db<AssessmentRow>('assessments').where({ id: row.assessment_id }).first();
      if (!assessment) throw new PermanentError('The assessment of this summary was deleted.');
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

      // A summary queued while its visits' clips are still extracted, or its stills still drawn (the demo
      // queues them together), waits for them without using an attempt: rendered now it would say "no
      // steps were marked" for clips whose marks are simply not measurable yet, and drop the stills.
      const visitIds = baseline ? [assessment.id, baseline.id] : [assessment.id];
      const clipStatuses: string[] = await db('clips').whereIn('assessment_id', visitIds).pluck('status');
      if (clipStatuses.some((st) => st !== 'ready' && st !== 'failed'))
        throw new NotReadyError('The frames of a clip of this visit are not extracted yet.');
      const stillIds = JSON.parse(row.still_ids) as number[];
      const stillStatuses: string[] = stillIds.length ? await db('stills').whereIn('id', stillIds).pluck('status') : [];
      if (stillStatuses.includes('rendering')) throw new NotReadyError('A still of this summary is not drawn yet.');

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
      progress(0.1);

      const stills = [];
      for (const stillId of stillIds) {
        const still = await d.stills.pngOf(stillId);
        // A still deleted (or whose clip was deleted) after the summary was requested drops out.
        if (still)
          stills.push({ image: still.png, width: still.row.width ?? 1, height: still.row.height ?? 1, caption: still.row.caption });
      }
      const brand = await d.brands?.forDocuments(row.clinic_id);
      const { pdf, pageCount } = await renderSummaryPdf(
        {
          clinicName: clinic?.name ?? 'Your clinic',
          clinicLogo: brand?.logo ?? null,
          clinicLegalLines: brand ? legalFooter(brand) : [],
          athleteName: `${athlete.first_name} ${athlete.last_name}`,
          title: baseline ? 'Re-test comparison' : 'Visit summary',
          issuedOn: displayDate(d.clock().toISOString().slice(0, 10)),
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
      const key = summaryKey(row.assessment_id, id);
      await store.put(key, pdf);
      if (!(await repo.findById(db, id))) {
        await store.remove(key);
        return null;
      }
      return { pageCount };
    },

    async onReady(trx, item, made) {
      if (!made) return;
      await repo.update(trx, item.subjectId, {
        status: 'ready',
        error: null,
        page_count: made.pageCount,
        updated_at: d.clock().toISOString(),
      });
    },

    async onChange(trx, item, change) {
      if (change.state !== 'failed') return;
      // The summary is failed with the reason (unless it got ready).
      await trx('visit_summaries')
        .where({ id: item.subjectId })
        .whereNot({ status: 'ready' })
        .update({ status: 'failed', error: `The summary could not be made: ${change.reason}`, updated_at: d.clock().toISOString() });
    },
  };
}
