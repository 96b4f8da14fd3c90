/**
 * Re-test comparison and measure trends through the API. Measures are stored as snapshots on
 * ready clips inserted directly (no video needed); the figures are test values, not sources.
 * Thresholds: [calc] half the Damsted et al. 2015 upper prediction-interval widths (hip 5.5°, knee at
 * foot strike 7.0°).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeTestApp, OTHER, signedIn, type Client, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import type { ClipMeasures, Measure, MeasureKey, AssessmentComparison, MeasureTrends } from '../../src/contracts/measures';
import type { Side } from '../../src/contracts/assessment';
import { KINEMATICS_VERSION } from '../../src/kinematics';

const [, coach, , athlete] = DEMO_SIGN_INS;
let t: TestApp;
let c: Client;
let adaId: number;
let baselineId: number;
let retestId: number;
let teodorId: number;
let teodorBaselineId: number;

const measure = (key: MeasureKey, side: Side | null, mean: number | null, unit = '°'): Measure => ({
  key,
  label: key,
  unit,
  side,
  event: null,
  status: mean === null ? 'not_enough_data' : 'ok',
  mean,
  sd: null,
  n: mean === null ? 0 : 8,
  values: [],
  derivation: '',
});

/** A ready clip on the assessment with a current measure snapshot. */
async function clipWith(assessmentId: number, athleteId: number, measures: Measure[], nearSide: Side = 'right'): Promise<number> {
  const at = new Date().toISOString();
  const coachRow = await t.db('users').where({ email: coach.email }).first();
  const [row] = await t
    .db('clips')
    .insert({
      clinic_id: 1,
      athlete_id: athleteId,
      assessment_id: assessmentId,
      uploaded_by: coachRow.id,
      original_name: 'side.mp4',
      stored_name: 'original.mp4',
      size_bytes: 1,
      container: 'mp4',
      status: 'ready',
      near_side: nearSide,
      direction: 'left_to_right',
      fps: 120,
      width: 640,
      height: 360,
      frame_count: 720,
      created_at: at,
      updated_at: at,
    })
    .returning('id');
  const clipId = (row as { id: number }).id;
  const body: ClipMeasures = { kinematicsVersion: KINEMATICS_VERSION, clipId, hasScale: false, measures, angles: [], notes: [] };
  await t.db('measure_snapshots').insert({
    clip_id: clipId,
    assessment_id: assessmentId,
    annotation_revision: 0,
    kinematics_version: KINEMATICS_VERSION,
    measures: JSON.stringify(body),
    computed_at: at,
  });
  return clipId;
}

beforeAll(async () => {
  t = await makeTestApp();
  c = await signedIn(t.app, coach.email, coach.password);
  const ada = await t.db('athletes').where({ email: athlete.email }).first();
  adaId = ada.id;
  baselineId = (await t.db('assessments').where({ athlete_id: adaId, kind: 'baseline' }).first()).id;
  retestId = (await t.db('assessments').where({ athlete_id: adaId, kind: 'retest' }).first()).id;
  const teodor = await t.db('athletes').where({ email: 'teodor.brannick@runner.test' }).first();
  teodorId = teodor.id;
  teodorBaselineId = (await t.db('assessments').where({ athlete_id: teodorId, kind: 'baseline' }).first()).id;
  await clipWith(baselineId, adaId, [
    measure('hip_extension_toe_off', 'right', 4),
    measure('knee_flexion_initial_contact', 'right', 2),
    measure('cadence', null, 166, 'steps/min'),
  ]);
  await clipWith(retestId, adaId, [
    measure('hip_extension_toe_off', 'right', 10),
    measure('knee_flexion_initial_contact', 'right', 4),
    measure('cadence', null, 172, 'steps/min'),
  ]);
  // A second re-test clip of the same side: the visit mean is the mean of the clip means.
  await clipWith(retestId, adaId, [measure('hip_extension_toe_off', 'right', 12), measure('knee_flexion_initial_contact', 'right', 4)]);
});
afterAll(async () => {
  await t?.close();
});

const row = (body: AssessmentComparison, key: MeasureKey, side: Side | null) => body.rows.find((r) => r.key === key && r.side === side);

describe('GET /api/athletes/:id/comparison', () => {
  it('defaults to the latest Re-test against the latest Baseline, with verdicts and clip summaries', async () => {
    const res = await c.get(`/api/athletes/${adaId}/comparison`);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const body = res.body as AssessmentComparison;
    expect(body.baseline).toMatchObject({ id: baselineId, kind: 'baseline' });
    expect(body.retest).toMatchObject({ id: retestId, kind: 'retest' });
    // [calc] 4° → 11° (step-weighted mean of two 8-step clips at 10 and 12): 7° > 5.5° (half of Damsted
    // et al. 2015's 11° hip width); more extension toward the textbook ~10° is better [trade].
    expect(row(body, 'hip_extension_toe_off', 'right')).toMatchObject({
      baseline: 4,
      retest: 11,
      change: 7,
      unit: '°',
      verdict: 'beyond_measurement_error',
      baselineSteps: 8,
      retestSteps: 16,
      direction: 'better',
    });
    expect(row(body, 'hip_extension_toe_off', 'right')!.threshold).toMatchObject({ value: 5.5, evidence: 'calc' });
    // [calc] 2° → 4°: 2° < 7.0° (half of Damsted et al. 2015's 14° knee-at-foot-strike width).
    expect(row(body, 'knee_flexion_initial_contact', 'right')).toMatchObject({
      change: 2,
      verdict: 'within_measurement_error',
      direction: 'larger',
    });
    expect(row(body, 'knee_flexion_initial_contact', 'right')!.threshold).toMatchObject({ value: 7, evidence: 'calc' });
    expect(row(body, 'cadence', null)).toMatchObject({ change: 6, threshold: null, verdict: 'no_threshold' });
    expect(body.baselineClips).toEqual([expect.objectContaining({ nearSide: 'right', direction: 'left_to_right', frameCount: 720 })]);
    expect(body.retestClips).toHaveLength(2);
  });

  it('takes the two assessments from the query, in either kind', async () => {
    const res = await c.get(`/api/athletes/${adaId}/comparison?baseline=${retestId}&retest=${baselineId}`);
    expect(res.status).toBe(200);
    expect(row(res.body, 'hip_extension_toe_off', 'right')).toMatchObject({
      baseline: 11,
      retest: 4,
      change: -7,
      verdict: 'beyond_measurement_error',
    });
  });

  it('answers 422 with a clear message when the athlete has no Re-test', async () => {
    const res = await c.get(`/api/athletes/${teodorId}/comparison`);
    expect(res.status).toBe(422);
    expect(res.body.error).toMatchObject({ code: 'no_retest', message: expect.stringContaining('no Re-test assessment') });
  });

  it('refuses assessments of two different athletes, the same assessment twice, and malformed ids (422)', async () => {
    const other = await c.get(`/api/athletes/${adaId}/comparison?baseline=${teodorBaselineId}&retest=${retestId}`);
    expect(other.status).toBe(422);
    expect(other.body.error.message).toMatch(/same athlete|this athlete/);
    const same = await c.get(`/api/athletes/${adaId}/comparison?baseline=${retestId}&retest=${retestId}`);
    expect(same.status).toBe(422);
    expect(same.body.error.code).toBe('same_assessment');
    const bad = await c.get(`/api/athletes/${adaId}/comparison?baseline=abc`);
    expect(bad.status).toBe(422);
  });

  it('is 404 for another clinic, 403 for athletes', async () => {
    const outsider = await signedIn(t.app, OTHER.coach.email, OTHER.coach.password);
    expect((await outsider.get(`/api/athletes/${adaId}/comparison`)).status).toBe(404);
    const otherAthlete = await t.db('athletes').where({ email: OTHER.athlete.email }).first();
    const [a] = await t
      .db('assessments')
      .insert({
        clinic_id: otherAthlete.clinic_id,
        athlete_id: otherAthlete.id,
        date: '2026-11-01',
        kind: 'baseline',
        surface: 'treadmill',
        speed_unit: 'kmh',
        created_at: 'x',
        updated_at: 'x',
      })
      .returning('id');
    const foreignId = (a as { id: number }).id;
    expect((await c.get(`/api/athletes/${adaId}/comparison?baseline=${foreignId}&retest=${retestId}`)).status).toBe(404);
    const self = await signedIn(t.app, athlete.email, athlete.password);
    expect((await self.get(`/api/athletes/${adaId}/comparison`)).status).toBe(403);
  });
});

describe('GET /api/athletes/:id/measure-trends', () => {
  it('gives each assessment, oldest first, the visit mean per chosen key and side', async () => {
    const res = await c.get(`/api/athletes/${adaId}/measure-trends?keys=hip_extension_toe_off,cadence`);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const body = res.body as MeasureTrends;
    expect(body.keys).toEqual(['hip_extension_toe_off', 'cadence']);
    expect(body.points.map((p) => [p.assessmentId, p.kind])).toEqual([
      [baselineId, 'baseline'],
      [retestId, 'retest'],
    ]);
    expect(body.points[0]!.date < body.points[1]!.date).toBe(true);
    expect(body.points[1]!.values).toEqual(
      expect.arrayContaining([
        { key: 'hip_extension_toe_off', side: 'right', mean: 11 },
        { key: 'cadence', side: null, mean: 172 },
      ]),
    );
    expect(body.points[1]!.values.some((v) => v.key === 'knee_flexion_initial_contact')).toBe(false);
  });

  it('takes every measure when keys are omitted, and refuses unknown keys (422)', async () => {
    const all = await c.get(`/api/athletes/${adaId}/measure-trends`);
    expect(all.status).toBe(200);
    expect(all.body.keys.length).toBeGreaterThan(10);
    const bad = await c.get(`/api/athletes/${adaId}/measure-trends?keys=hip_extension_toe_off,elbow_swing`);
    expect(bad.status).toBe(422);
    expect(bad.body.error.message).toContain('Unknown measure key');
  });
});
