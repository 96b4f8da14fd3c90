/**
 * Annotations and measures through the API. The end-to-end check loads the synthetic runner's
 * ground truth (a test fixture with known joint-angle curves — not a published source) as if a
 * coach had marked every frame, and compares the server's measures with the generator's truth.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeTestApp, OTHER, signedIn, type Client, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { makeClip, tempDir } from './media/fixtures';
import { generateRunnerClip, type GroundTruth } from '../../scripts/demo-clip/clip';
import { MIN_SCALE_LINE_PX, type ClipAnnotations, type FrameLandmarks, type GaitEventMark } from '../../src/contracts/annotations';
import type { ClipMeasures, Measure } from '../../src/contracts/measures';

const [owner, coach, , athlete] = DEMO_SIGN_INS;
let t: TestApp;
let c: Client;
let dir: { dir: string; cleanup: () => Promise<void> };
let plainClipId: number;
let runnerClipId: number;
let truth: GroundTruth;
let assessmentId: number;

async function uploadFile(file: string): Promise<number> {
  const res = await c.agent
    .post(`/api/assessments/${assessmentId}/clips`)
    .set('X-XSRF-TOKEN', await c.xsrf())
    .attach('file', file);
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.id;
}

beforeAll(async () => {
  dir = await tempDir('annotations');
  t = await makeTestApp();
  c = await signedIn(t.app, coach.email, coach.password);
  const ada = await t.db('athletes').where({ email: athlete.email }).first();
  assessmentId = (await t.db('assessments').where({ athlete_id: ada.id, kind: 'baseline' }).first()).id;
  plainClipId = await uploadFile(await makeClip(path.join(dir.dir, 'plain.mp4'), { fps: 30, width: 320, height: 180, seconds: 1 }));
  const runnerFile = path.join(dir.dir, 'runner.mp4');
  truth = await generateRunnerClip({
    fps: 120,
    width: 640,
    height: 360,
    seconds: 3,
    hipExtensionDeg: 6,
    facing: 'right',
    beltSpeedMps: 3,
    outFile: runnerFile,
    preset: 'ultrafast',
  });
  runnerClipId = await uploadFile(runnerFile);
  await t.worker!.idle();
}, 180_000);
afterAll(async () => {
  await t?.close();
  await dir?.cleanup();
});

const put = (clipId: number, body: unknown) => c.put(`/api/clips/${clipId}/annotations`, body);
const empty = { landmarks: [], events: [], scale: null };

describe('saving annotations', () => {
  it('round-trips landmarks, events and the scale bar, bumping the revision', async () => {
    const before = (await c.get(`/api/clips/${plainClipId}/annotations`)).body as ClipAnnotations;
    expect(before).toMatchObject({ revision: 0, landmarks: [], events: [], scale: null });
    const body = {
      baseRevision: 0,
      landmarks: [{ frame: 3, side: 'right', points: { hip: { x: 0.5, y: 0.4 }, knee: { x: 0.55, y: 0.6 } } }],
      events: [
        { frame: 3, side: 'right', kind: 'initial_contact' },
        { frame: 12, side: 'right', kind: 'toe_off' },
      ],
      scale: { frame: 0, a: { x: 0.1, y: 0.9 }, b: { x: 0.6, y: 0.9 }, lengthM: 1 },
    };
    const res = await put(plainClipId, body);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body).toMatchObject({ revision: 1, updatedByName: 'Tobin Achterberg', events: body.events, scale: body.scale });
    // Points sent without an origin were placed by a person.
    expect(res.body.landmarks).toEqual([
      { frame: 3, side: 'right', points: { hip: { x: 0.5, y: 0.4, origin: 'placed' }, knee: { x: 0.55, y: 0.6, origin: 'placed' } } },
    ]);
  });

  it('answers a stale revision with 409 and the current annotations; nothing is lost', async () => {
    const res = await put(plainClipId, { baseRevision: 0, ...empty });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('stale_revision');
    expect(res.body.error.details.current.revision).toBe(1);
    expect((await c.get(`/api/clips/${plainClipId}/annotations`)).body.landmarks).toHaveLength(1);
  });

  it('refuses bad marks with a field path, and keeps the saved ones', async () => {
    const cases: [unknown, RegExp][] = [
      [{ landmarks: [{ frame: 1, side: 'right', points: { hip: { x: 1.2, y: 0.5 } } }] }, /inside the frame/],
      [{ landmarks: [{ frame: 1, side: 'right', points: { elbow: { x: 0.2, y: 0.5 } } }] }, /.+/],
      [{ landmarks: [{ frame: 999, side: 'right', points: { hip: { x: 0.2, y: 0.5 } } }] }, /beyond the clip/],
      [{ landmarks: [{ frame: 1, side: 'middle', points: {} }] }, /left or right/],
      [
        {
          events: [
            { frame: 2, side: 'left', kind: 'initial_contact' },
            { frame: 8, side: 'left', kind: 'initial_contact' },
          ],
        },
        /.+/,
      ],
      [{ events: [{ frame: 2, side: 'left', kind: 'heel_whip' }] }, /Unknown gait event/],
      [{ scale: { frame: 0, a: { x: 0.2, y: 0.2 }, b: { x: 0.2, y: 0.2 }, lengthM: 1 } }, /zero length/],
      [{ scale: { frame: 0, a: { x: 0.2, y: 0.2 }, b: { x: 0.4, y: 0.2 }, lengthM: 0 } }, /length/],
    ];
    for (const [over, message] of cases) {
      const res = await put(plainClipId, { baseRevision: 1, ...empty, ...(over as object) });
      expect(res.status, JSON.stringify(over)).toBe(422);
      expect(res.body.error.message).toMatch(message);
      expect(res.body.error.details.length).toBeGreaterThan(0);
    }
    // JSON has no NaN, but 1e999 parses to Infinity.
    const raw = await c.agent
      .put(`/api/clips/${plainClipId}/annotations`)
      .set('X-XSRF-TOKEN', await c.xsrf())
      .set('Content-Type', 'application/json')
      .send('{"baseRevision":1,"landmarks":[{"frame":1,"side":"right","points":{"hip":{"x":1e999,"y":0.5}}}],"events":[],"scale":null}');
    expect(raw.status).toBe(422);
    const after = (await c.get(`/api/clips/${plainClipId}/annotations`)).body;
    expect(after.revision).toBe(1);
    expect(after.landmarks).toHaveLength(1);
  });

  it('refuses a scale bar shorter than the scale tool allows (422 naming the minimum), keeps one saved before the rule, and accepts one at the minimum', async () => {
    // The plain clip's working frame is 320 × 180 (ffprobe of makeClip's output). A bar from
    // x = 0.2 to x = 0.2 + 19.5/320 is 19.5 px long [calc]; 20 px along y is 20/180 of the height.
    const { revision } = (await c.get(`/api/clips/${plainClipId}/annotations`)).body;
    const short = { frame: 0, a: { x: 0.2, y: 0.5 }, b: { x: 0.2 + 19.5 / 320, y: 0.5 }, lengthM: 1 };
    const refused = await put(plainClipId, { baseRevision: revision, ...empty, scale: short });
    expect(refused.status).toBe(422);
    expect(refused.body.error.message).toContain(`at least ${MIN_SCALE_LINE_PX} px`);
    expect(refused.body.error.message).toContain('19.5 px');
    expect((await c.get(`/api/clips/${plainClipId}/annotations`)).body.revision).toBe(revision);

    const atMin = { frame: 0, a: { x: 0.5, y: 0.3 }, b: { x: 0.5, y: 0.3 + 20 / 180 }, lengthM: 0.5 };
    const ok = await put(plainClipId, { baseRevision: revision, ...empty, scale: atMin });
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);

    // A bar stored before the minimum existed: sent back unchanged with other marks, the save goes through.
    await t.db('scale_bars').where({ clip_id: plainClipId }).update({ ax: short.a.x, ay: short.a.y, bx: short.b.x, by: short.b.y });
    await t.db('clips').where({ id: plainClipId }).increment('annotation_revision', 1);
    const stored = (await c.get(`/api/clips/${plainClipId}/annotations`)).body;
    const again = await put(plainClipId, {
      baseRevision: stored.revision,
      ...empty,
      landmarks: [{ frame: 1, side: 'right', points: { hip: { x: 0.4, y: 0.5 } } }],
      scale: stored.scale,
    });
    expect(again.status, JSON.stringify(again.body)).toBe(200);
  });

  it('is for staff of the clinic: athletes 403, another clinic 404; a clip not ready 409', async () => {
    const a = await signedIn(t.app, athlete.email, athlete.password);
    expect((await a.get(`/api/clips/${plainClipId}/annotations`)).status).toBe(403);
    const other = await signedIn(t.app, OTHER.coach.email, OTHER.coach.password);
    expect((await other.get(`/api/clips/${plainClipId}/annotations`)).status).toBe(404);
    await t.db('clips').where({ id: plainClipId }).update({ status: 'queued' });
    expect((await put(plainClipId, { baseRevision: 1, ...empty })).status).toBe(409);
    await t.db('clips').where({ id: plainClipId }).update({ status: 'ready' });
  });
});

describe('measures from the synthetic runner (ground truth of the generator)', () => {
  let measures: ClipMeasures;
  const find = (key: string, side?: string): Measure =>
    measures.measures.find((m) => m.key === key && (side === undefined || m.side === side))!;

  beforeAll(async () => {
    const nearSide = truth.nearSide;
    const farSide: 'left' | 'right' = nearSide === 'right' ? 'left' : 'right';
    const landmarks: FrameLandmarks[] = truth.frames.flatMap((f) => [
      { frame: f.index, side: nearSide, points: f.landmarksNormalised.near },
      { frame: f.index, side: farSide, points: f.landmarksNormalised.far },
    ]);
    const events: GaitEventMark[] = [
      ...truth.events.near.initialContact.map((frame) => ({ frame, side: nearSide, kind: 'initial_contact' as const })),
      ...truth.events.near.toeOff.map((frame) => ({ frame, side: nearSide, kind: 'toe_off' as const })),
      ...truth.events.far.initialContact.map((frame) => ({ frame, side: farSide, kind: 'initial_contact' as const })),
      ...truth.events.far.toeOff.map((frame) => ({ frame, side: farSide, kind: 'toe_off' as const })),
    ];
    // A 1 m scale bar drawn along the belt, from the generator's pixels per metre.
    const y = 0.95;
    const scale = { frame: 0, a: { x: 0.1, y }, b: { x: 0.1 + truth.pxPerMetre / truth.width, y }, lengthM: 1 };
    await t.db('assessments').where({ id: assessmentId }).update({ surface: 'treadmill', speed_mps: truth.beltSpeedMps });
    await c.patch(`/api/clips/${runnerClipId}`, { nearSide, direction: truth.facing === 'right' ? 'left_to_right' : 'right_to_left' });
    const res = await put(runnerClipId, { baseRevision: 0, landmarks, events, scale });
    expect(res.status, JSON.stringify(res.body).slice(0, 500)).toBe(200);
    measures = (await c.get(`/api/clips/${runnerClipId}/measures`)).body;
  });

  it('hip extension at toe-off matches the true thigh angle within 0.5°', () => {
    const m = find('hip_extension_toe_off', truth.nearSide);
    const trueMean = truth.hipExtensionAtToeOffDeg.near.reduce((a, b) => a + b, 0) / truth.hipExtensionAtToeOffDeg.near.length;
    expect(m.status).toBe('ok');
    expect(Math.abs(m.mean! - trueMean)).toBeLessThan(0.5);
    expect(m.n).toBe(truth.hipExtensionAtToeOffDeg.near.length);
  });

  it('knee flexion at initial contact matches the true angles within 0.5°', () => {
    const m = find('knee_flexion_initial_contact', truth.nearSide);
    const trueValues = truth.events.near.initialContact.map((f) => truth.angles[f]!.near.kneeFlexionDeg);
    const trueMean = trueValues.reduce((a, b) => a + b, 0) / trueValues.length;
    expect(Math.abs(m.mean! - trueMean)).toBeLessThan(0.5);
  });

  it('cadence and stride length match the generator within 0.5 %', () => {
    const cadence = find('cadence');
    expect(Math.abs(cadence.mean! - truth.cadenceStepsPerMin) / truth.cadenceStepsPerMin).toBeLessThan(0.005);
    const stride = find('stride_length', truth.nearSide) ?? find('stride_length');
    const trueStride = truth.beltSpeedMps * truth.stridePeriodS;
    expect(Math.abs(stride.mean! - trueStride) / trueStride).toBeLessThan(0.005);
  });

  it('contact time and duty factor match the generator within one frame', () => {
    const contact = find('contact_time', truth.nearSide);
    const unitToS = contact.unit === 'ms' ? 0.001 : 1;
    expect(Math.abs(contact.mean! * unitToS - truth.contactTimeS)).toBeLessThanOrEqual(1 / truth.fps + 1e-9);
  });

  it('assessment measures list the clip, and the snapshot is stored with the kinematics version', async () => {
    const res = await c.get(`/api/assessments/${assessmentId}/measures`);
    expect(res.body.clips.map((m: ClipMeasures) => m.clipId)).toContain(runnerClipId);
    const snap = await t.db('measure_snapshots').where({ clip_id: runnerClipId }).first();
    expect(snap.kinematics_version).toBe(measures.kinematicsVersion);
  });
});

describe('reference bands', () => {
  it('lists cited defaults; the owner edits and resets one; coaches cannot edit', async () => {
    const list = (await c.get('/api/reference-bands')).body.bands as { key: string; source: string }[];
    const knee = list.find((b) => b.key === 'knee_flexion_initial_contact')!;
    expect(knee.source).toMatch(/Heiderscheit et al\. 2011/);
    const o = await signedIn(t.app, owner.email, owner.password);
    const body = {
      low: 12,
      high: 22,
      unit: '°',
      context: 'Our clinic: treadmill, preferred rate',
      source: 'Clinic audit of 40 runners (internal)',
      evidence: 'trade',
    };
    expect((await c.put('/api/reference-bands/knee_flexion_initial_contact', body)).status).toBe(403);
    const saved = await o.put('/api/reference-bands/knee_flexion_initial_contact', body);
    expect(saved.status).toBe(200);
    expect(
      (await o.get('/api/reference-bands')).body.bands.find((b: { key: string }) => b.key === 'knee_flexion_initial_contact'),
    ).toMatchObject({ low: 12, high: 22 });
    expect((await o.put('/api/reference-bands/knee_flexion_initial_contact', { ...body, low: 30 })).status).toBe(422);
    expect((await o.put('/api/reference-bands/not_a_measure', body)).status).toBe(422);
    // A band in another unit than the measure's would never apply (bands match by unit): refused, the saved one kept.
    const wrongUnit = await o.put('/api/reference-bands/knee_flexion_initial_contact', { ...body, low: 5, unit: 'deg' });
    expect(wrongUnit.status).toBe(422);
    expect(wrongUnit.body.error.details).toEqual([expect.objectContaining({ path: ['unit'], message: expect.stringContaining('°') })]);
    expect((await o.put('/api/reference-bands/cadence', { ...body, low: 160, high: 190, unit: '°' })).status).toBe(422);
    expect(
      (await o.get('/api/reference-bands')).body.bands.find((b: { key: string }) => b.key === 'knee_flexion_initial_contact'),
    ).toMatchObject({ low: 12, high: 22, unit: '°' });
    expect((await o.delete('/api/reference-bands/knee_flexion_initial_contact')).status).toBe(204);
    expect(
      (await o.get('/api/reference-bands')).body.bands.find((b: { key: string }) => b.key === 'knee_flexion_initial_contact').source,
    ).toMatch(/Heiderscheit/);
  });

  it("places the clip's measures against the band in force after the owner edits or resets it (not the stored snapshot's)", async () => {
    const kneeOf = async () =>
      ((await c.get(`/api/clips/${runnerClipId}/measures`)).body as ClipMeasures).measures.find(
        (m) => m.key === 'knee_flexion_initial_contact' && m.side === truth.nearSide,
      )!;
    // The generator's true knee flexion at initial contact (test fixture ground truth, not a published source);
    // the measure is within 0.5° of it (test above), so a band starting 5° above it must flag "below".
    const trueValues = truth.events.near.initialContact.map((f) => truth.angles[f]!.near.kneeFlexionDeg);
    const trueMean = trueValues.reduce((a, b) => a + b, 0) / trueValues.length;
    expect((await kneeOf()).band?.band.source).toMatch(/Heiderscheit/); // snapshot stored with the default band
    const o = await signedIn(t.app, owner.email, owner.password);
    const low = Math.round(trueMean) + 5;
    const body = { low, high: low + 10, unit: '°', context: 'Worked example', source: 'Worked example band', evidence: 'calc' };
    expect((await o.put('/api/reference-bands/knee_flexion_initial_contact', body)).status).toBe(200);
    expect((await kneeOf()).band).toMatchObject({ position: 'below', band: { low, source: 'Worked example band' } });
    expect((await o.delete('/api/reference-bands/knee_flexion_initial_contact')).status).toBe(204);
    expect((await kneeOf()).band?.band.source).toMatch(/Heiderscheit/);
  });
});

describe('landmark origin', () => {
  it("keeps where each point came from and its confidence; earlier clients' tracked rows count as followed", async () => {
    const current = (await c.get(`/api/clips/${plainClipId}/annotations`)).body as ClipAnnotations;
    const res = await put(plainClipId, {
      baseRevision: current.revision,
      landmarks: [
        {
          frame: 4,
          side: 'right',
          points: {
            hip: { x: 0.5, y: 0.4 },
            knee: { x: 0.55, y: 0.6, origin: 'followed', confidence: 0.93 },
            ankle: { x: 0.56, y: 0.8, origin: 'proposed', confidence: 0.4 },
            toe: { x: 0.6, y: 0.9, origin: 'accepted' },
          },
        },
        { frame: 5, side: 'right', points: { hip: { x: 0.5, y: 0.41 } }, source: 'tracked' },
      ],
      events: [],
      scale: null,
    });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.landmarks).toEqual([
      {
        frame: 4,
        side: 'right',
        points: {
          hip: { x: 0.5, y: 0.4, origin: 'placed' },
          knee: { x: 0.55, y: 0.6, origin: 'followed', confidence: 0.93 },
          ankle: { x: 0.56, y: 0.8, origin: 'proposed', confidence: 0.4 },
          toe: { x: 0.6, y: 0.9, origin: 'accepted' },
        },
      },
      { frame: 5, side: 'right', points: { hip: { x: 0.5, y: 0.41, origin: 'followed' } } },
    ]);
    for (const [point, message] of [
      [{ x: 0.5, y: 0.4, origin: 'guessed' }, /placed, followed, proposed or accepted/],
      [{ x: 0.5, y: 0.4, origin: 'followed', confidence: 1.5 }, /Confidence is 0–1/],
    ] as const) {
      const bad = await put(plainClipId, {
        baseRevision: res.body.revision,
        landmarks: [{ frame: 1, side: 'right', points: { hip: point } }],
        events: [],
        scale: null,
      });
      expect(bad.status).toBe(422);
      expect(JSON.stringify(bad.body.error.details)).toMatch(message);
    }
    expect((await c.get(`/api/clips/${plainClipId}/annotations`)).body.revision).toBe(res.body.revision);
  });
});
