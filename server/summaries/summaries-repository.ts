import type { Knex } from 'knex';
import type { RenderStatus, VisitSummary } from '../../src/contracts/sharing';
import { joinLatestItem } from '../processing/processed-items-repository';
import { renderProgress } from '../sharing/shared-items';

export interface SummaryRow {
  id: number;
  clinic_id: number;
  athlete_id: number;
  assessment_id: number;
  baseline_assessment_id: number | null;
  title: string;
  findings: string;
  plan_text: string;
  still_ids: string;
  status: RenderStatus;
  error: string | null;
  page_count: number | null;
  published_at: string | null;
  published_by: number | null;
  created_by: number | null;
  created_at: string;
  updated_at: string;
}

/** A row joined with the names the API shows and its newest processed item's progress. */
type SummaryView = SummaryRow & {
  created_by_name: string | null;
  published_by_name: string | null;
  item_done: number | null;
  item_total: number | null;
};

export const summariesRepository = {
  async insert(trx: Knex, row: Omit<SummaryRow, 'id'>): Promise<number> {
    const [r] = await trx('visit_summaries').insert(row).returning('id');
    return (r as { id: number }).id;
  },

  find(db: Knex, clinicId: number, id: number): Promise<SummaryRow | undefined> {
    return db<SummaryRow>('visit_summaries').where({ id, clinic_id: clinicId }).first();
  },

  findById(db: Knex, id: number): Promise<SummaryRow | undefined> {
    return db<SummaryRow>('visit_summaries').where({ id }).first();
  },

  async update(db: Knex, id: number, patch: Partial<SummaryRow>): Promise<void> {
    await db('visit_summaries').where({ id }).update(patch);
  },

  async view(db: Knex, where: Record<string, unknown>, opts: { publishedOnly: boolean }): Promise<VisitSummary[]> {
    const q = joinLatestItem(db('visit_summaries as v'), db, 'summary', 'v')
      .leftJoin('users as cu', 'cu.id', 'v.created_by')
      .leftJoin('users as pu', 'pu.id', 'v.published_by')
      .where(Object.fromEntries(Object.entries(where).map(([k, v]) => [`v.${k}`, v])))
      .orderBy('v.created_at', 'desc')
      .orderBy('v.id', 'desc')
      .select<SummaryView[]>(
        'v.*',
        'cu.name as created_by_name',
        'pu.name as published_by_name',
        'pi.progress_done as item_done',
        'pi.progress_total as item_total',
      );
    if (opts.publishedOnly) q.whereNotNull('v.published_at').where('v.status', 'ready');
    return (await q).map(toApi);
  },
};

function toApi(r: SummaryView): VisitSummary {
  return {
    id: r.id,
    athleteId: r.athlete_id,
    assessmentId: r.assessment_id,
    baselineAssessmentId: r.baseline_assessment_id,
    title: r.title,
    findings: r.findings,
    planText: r.plan_text,
    stillIds: JSON.parse(r.still_ids) as number[],
    status: r.status,
    progress: renderProgress(r),
    error: r.error,
    pageCount: r.page_count,
    publishedAt: r.published_at,
    publishedBy: r.published_by_name,
    createdAt: r.created_at,
    createdBy: r.created_by_name ?? 'Former staff member',
    pdfUrl: `/api/summaries/${r.id}/pdf`,
  };
}
