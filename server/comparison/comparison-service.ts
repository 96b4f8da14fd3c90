import type { SessionUser } from '../../src/contracts/api';
import { ASSESSMENT_KIND_LABELS, type AssessmentKind, type Direction, type Side } from '../../src/contracts/assessment';
import type { AssessmentComparison, ComparisonClip, MeasureKey, MeasureTrends } from '../../src/contracts/measures';
import { compareMeasures, visitMeans } from '../../src/kinematics';
import type { Db } from '../db/knex';
import { AppError, NotFoundError } from '../errors';
import { accessibleAthlete } from '../policy/athlete-resources';
import { assessmentsRepository as repo, type AssessmentRow } from '../assessments/assessments-repository';
import type { MeasuresService } from '../measures/measures-service';

/** Baseline against re-test, and measure trends across an athlete's visits (staff). */
export function comparisonService({ db, measures }: { db: Db; measures: MeasuresService }) {
  async function readyClips(assessmentId: number): Promise<ComparisonClip[]> {
    const rows = await db('clips')
      .where({ assessment_id: assessmentId, status: 'ready' })
      .orderBy('id')
      .select<{ id: number; near_side: Side; direction: Direction; frame_count: number | null }[]>(
        'id',
        'near_side',
        'direction',
        'frame_count',
      );
    return rows.map((r) => ({ id: r.id, nearSide: r.near_side, direction: r.direction, frameCount: r.frame_count }));
  }

  async function pick(
    user: SessionUser,
    athleteId: number,
    id: number | undefined,
    kind: AssessmentKind,
    rows: AssessmentRow[],
  ): Promise<AssessmentRow> {
    if (id === undefined) {
      // rows are newest first
      const latest = rows.find((r) => r.kind === kind);
      if (!latest) {
        const label = ASSESSMENT_KIND_LABELS[kind];
        throw new AppError(
          422,
          `no_${kind}`,
          `This athlete has no ${label} assessment yet. Add one, or choose the two assessments to compare.`,
        );
      }
      return latest;
    }
    const row = await repo.find(db, user.clinicId, id);
    if (!row) throw new NotFoundError('Assessment');
    if (row.athlete_id !== athleteId) throw new AppError(422, 'other_athlete', 'Both assessments must belong to this athlete.');
    return row;
  }

  return {
    async compare(user: SessionUser, athleteId: number, q: { baseline?: number; retest?: number }): Promise<AssessmentComparison> {
      await accessibleAthlete(db, user, athleteId, 'comparison:read');
      const rows = await repo.listForAthlete(db, athleteId);
      const baseline = await pick(user, athleteId, q.baseline, 'baseline', rows);
      const retest = await pick(user, athleteId, q.retest, 'retest', rows);
      if (baseline.id === retest.id) throw new AppError(422, 'same_assessment', 'Choose two different assessments to compare.');
      const [baseMeasures, reMeasures] = [await measures.forAssessment(user, baseline.id), await measures.forAssessment(user, retest.id)];
      const [baselineClips, retestClips] = [await readyClips(baseline.id), await readyClips(retest.id)];
      return {
        baseline: repo.toApi(baseline, await repo.clipCount(db, baseline.id), true),
        retest: repo.toApi(retest, await repo.clipCount(db, retest.id), true),
        rows: compareMeasures(baseMeasures, reMeasures),
        baselineClips,
        retestClips,
      };
    },

    async trends(user: SessionUser, athleteId: number, keys: MeasureKey[]): Promise<MeasureTrends> {
      await accessibleAthlete(db, user, athleteId, 'comparison:read');
      const rows = [...(await repo.listForAthlete(db, athleteId))].reverse();
      const wanted = new Set<MeasureKey>(keys);
      const points: MeasureTrends['points'] = [];
      for (const row of rows) {
        const means = visitMeans(await measures.forAssessment(user, row.id));
        points.push({ assessmentId: row.id, date: row.date, kind: row.kind, values: means.filter((m) => wanted.has(m.key)) });
      }
      return { keys, points };
    },
  };
}

export type ComparisonService = ReturnType<typeof comparisonService>;
