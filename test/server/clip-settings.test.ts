/**
 * Who may change a clip's settings (near side, running direction, capture frame rate) and when:
 * staff always; the athlete only while the clip has no landmarks and no gait events (a new capture
 * rate rescales every time measure of a marked clip). Every change is audited with from → to.
 * Clip rows are inserted directly (no media is needed to change a setting).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeTestApp, signedIn, type Client, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { baselineVisit } from '../support/bodies';

const [, coach, , athlete] = DEMO_SIGN_INS;
let t: TestApp;
let staff: Client;
let ada: Client;
let adaId: number;
let assessmentId: number;

async function clipRow(): Promise<number> {
  const at = new Date().toISOString();
  const a = await t.db('assessments').where({ id: assessmentId }).first();
  const [row] = await t
    .db('clips')
    .insert({
      clinic_id: a.clinic_id,
      athlete_id: adaId,
      assessment_id: assessmentId,
      uploaded_by: null,
      original_name: 'side.mp4',
      stored_name: 'original.mp4',
      size_bytes: 1000,
      container: 'mp4',
      status: 'ready',
      progress_done: 60,
      progress_total: 60,
      error: null,
      near_side: 'right',
      direction: 'left_to_right',
      capture_fps: null,
      fps: 30,
      width: 320,
      height: 180,
      frame_count: 60,
      duration_s: 2,
      rotation: 0,
      codec: 'h264',
      thumb_count: 0,
      thumb_every: null,
      created_at: at,
      updated_at: at,
    })
    .returning('id');
  return (row as { id: number }).id;
}

beforeAll(async () => {
  t = await makeTestApp();
  staff = await signedIn(t.app, coach.email, coach.password);
  ada = await signedIn(t.app, athlete.email, athlete.password);
  adaId = (await t.db('athletes').where({ email: athlete.email }).first()).id;
  const res = await staff.post(`/api/athletes/${adaId}/assessments`, baselineVisit());
  assessmentId = res.body.id;
});
afterAll(async () => {
  await t?.close();
});

describe('clip settings: who may change them and when', () => {
  it('the athlete may change an unmarked clip of their own, and the clip says it is not marked', async () => {
    const id = await clipRow();
    const res = await ada.patch(`/api/clips/${id}`, { nearSide: 'left', captureFps: 240 });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body).toMatchObject({ nearSide: 'left', captureFps: 240, effectiveFps: 240, marked: false });
  });

  it('once landmarks exist the athlete gets 409 clip_marked and nothing changes; staff may still change them', async () => {
    const id = await clipRow();
    await t.db('clip_landmarks').insert({ clip_id: id, frame: 3, side: 'right', landmark: 'hip', x: 0.5, y: 0.4, origin: 'placed' });
    expect((await staff.get(`/api/clips/${id}`)).body.marked).toBe(true);
    for (const change of [{ nearSide: 'left' }, { direction: 'right_to_left' }, { captureFps: 240 }]) {
      const res = await ada.patch(`/api/clips/${id}`, change);
      expect(res.status, JSON.stringify(res.body)).toBe(409);
      expect(res.body.error.code).toBe('clip_marked');
      expect(res.body.error.message).toMatch(/clinician/i);
    }
    expect(await t.db('clips').where({ id }).first()).toMatchObject({ near_side: 'right', direction: 'left_to_right', capture_fps: null });
    const byStaff = await staff.patch(`/api/clips/${id}`, { captureFps: 240 });
    expect(byStaff.status).toBe(200);
    expect(byStaff.body).toMatchObject({ captureFps: 240, effectiveFps: 240, marked: true });
  });

  it('gait events alone also lock the settings for the athlete', async () => {
    const id = await clipRow();
    await t.db('gait_events').insert({ clip_id: id, frame: 5, side: 'left', kind: 'initial_contact' });
    expect((await ada.patch(`/api/clips/${id}`, { direction: 'right_to_left' })).status).toBe(409);
  });

  it('a request that changes nothing is answered without a conflict or an audit entry', async () => {
    const id = await clipRow();
    await t.db('clip_landmarks').insert({ clip_id: id, frame: 3, side: 'right', landmark: 'hip', x: 0.5, y: 0.4, origin: 'placed' });
    const before = await t.db('audit_log').where({ action: 'clip.settings_changed' }).count<{ n: number }[]>({ n: '*' });
    const res = await ada.patch(`/api/clips/${id}`, { nearSide: 'right' });
    expect(res.status).toBe(200);
    const after = await t.db('audit_log').where({ action: 'clip.settings_changed' }).count<{ n: number }[]>({ n: '*' });
    expect(Number(after[0]!.n)).toBe(Number(before[0]!.n));
  });

  it('every change goes to the audit log: who, which clip, each setting from → to', async () => {
    const id = await clipRow();
    await staff.patch(`/api/clips/${id}`, { direction: 'right_to_left', captureFps: 120 });
    const rows = await t.db('audit_log').where({ action: 'clip.settings_changed' }).orderBy('id');
    const entry = rows.find((r: { detail: string }) => JSON.parse(r.detail).clipId === id);
    expect(entry).toBeTruthy();
    const coachRow = await t.db('users').where({ email: coach.email }).first();
    expect(entry.actor_id).toBe(coachRow.id);
    expect(entry.athlete_id).toBe(adaId);
    expect(JSON.parse(entry.detail)).toEqual({
      clipId: id,
      changes: { direction: { from: 'left_to_right', to: 'right_to_left' }, captureFps: { from: null, to: 120 } },
    });
  });

  it('a staff change of a marked clip’s settings drops the stale measures snapshot (recomputed on the next read)', async () => {
    const id = await clipRow();
    await t.db('clip_landmarks').insert({ clip_id: id, frame: 3, side: 'right', landmark: 'hip', x: 0.5, y: 0.4, origin: 'placed' });
    await t.db('measure_snapshots').insert({
      clip_id: id,
      assessment_id: assessmentId,
      annotation_revision: 0,
      kinematics_version: 'x',
      measures: '{}',
      computed_at: new Date().toISOString(),
    });
    await staff.patch(`/api/clips/${id}`, { captureFps: 240 });
    expect(await t.db('measure_snapshots').where({ clip_id: id })).toHaveLength(0);
  });
});
