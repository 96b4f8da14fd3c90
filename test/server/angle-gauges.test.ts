/**
 * Angle gauges saved with a clip's annotations: round trip with the revision, refusals that write
 * nothing, and the gauge drawn on a still by the server's renderer. Outside checks: the clip is
 * made by Debian ffmpeg (a black 640×360 frame, so the drawn gauge stands out), and the gauge's
 * angle is recomputed here from the dot product of its arms ([calc]).
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createCanvas, loadImage } from '@napi-rs/canvas';
import { makeTestApp, OTHER, signedIn, type Client, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { makeClip, tempDir } from './media/fixtures';
import type { AngleGauge, ClipAnnotations } from '../../src/contracts/annotations';
import type { Still } from '../../src/contracts/sharing';
import { GAUGE_COLOURS, gaugeAngleDeg } from '../../src/kinematics';

const [, coach, , athlete] = DEMO_SIGN_INS;
const W = 640;
const H = 360;
let t: TestApp;
let c: Client;
let dir: { dir: string; cleanup: () => Promise<void> };
let clipId: number;

beforeAll(async () => {
  dir = await tempDir('angle-gauges');
  t = await makeTestApp();
  c = await signedIn(t.app, coach.email, coach.password);
  const ada = await t.db('athletes').where({ email: athlete.email }).first();
  const assessmentId = (await t.db('assessments').where({ athlete_id: ada.id, kind: 'baseline' }).first()).id;
  const file = await makeClip(path.join(dir.dir, 'black.mp4'), { fps: 30, width: W, height: H, seconds: 1, source: 'corner-marker' });
  const res = await c.agent
    .post(`/api/assessments/${assessmentId}/clips`)
    .set('X-XSRF-TOKEN', await c.xsrf())
    .attach('file', file);
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  clipId = res.body.id;
  await t.worker!.idle();
}, 120_000);
afterAll(async () => {
  await t?.close();
  await dir?.cleanup();
});

const put = (body: unknown) => c.put(`/api/clips/${clipId}/annotations`, body);
const empty = { landmarks: [], events: [], scale: null };
/** Pelvis-like gauge on frame 5: arms to the right and up-right, vertex in the middle of the frame. */
const pelvis: AngleGauge = { id: 'g-pelvis', frame: 5, a: { x: 0.75, y: 0.5 }, vertex: { x: 0.5, y: 0.5 }, b: { x: 0.7, y: 0.2 } };
const arm: AngleGauge = { id: 'g-arm', frame: 5, a: { x: 0.2, y: 0.2 }, vertex: { x: 0.25, y: 0.45 }, b: { x: 0.35, y: 0.6 } };
const later: AngleGauge = { id: 'g-later', frame: 20, a: { x: 0.1, y: 0.9 }, vertex: { x: 0.3, y: 0.9 }, b: { x: 0.3, y: 0.7 } };

describe('saving angle gauges', () => {
  it('round-trips several gauges per frame with the annotations, bumping the revision', async () => {
    const res = await put({ baseRevision: 0, ...empty, gauges: [pelvis, arm, later] });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.revision).toBe(1);
    const got = (await c.get(`/api/clips/${clipId}/annotations`)).body as ClipAnnotations;
    expect(got.revision).toBe(1);
    expect(got.gauges).toEqual([arm, pelvis, later]); // frame, then id order
  });

  it('answers a stale revision with 409 carrying the current gauges; nothing is written', async () => {
    const res = await put({ baseRevision: 0, ...empty, gauges: [] });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('stale_revision');
    expect(res.body.error.details.current.gauges).toHaveLength(3);
    expect(await t.db('angle_gauges').where({ clip_id: clipId }).count({ n: '*' }).first()).toEqual({ n: 3 });
  });

  it('refuses fewer than three points, points outside the frame, a frame past the end, repeated ids and arms without length (422), writing nothing', async () => {
    const { b: _b, ...twoPoints } = pelvis;
    const cases: [unknown, RegExp, (string | number)[]][] = [
      [[twoPoints], /three points/, ['gauges', 0, 'b']],
      [[{ ...pelvis, vertex: undefined }], /three points/, ['gauges', 0, 'vertex']],
      [[{ ...pelvis, a: { x: 1.2, y: 0.5 } }], /inside the frame/, ['gauges', 0, 'a', 'x']],
      [[{ ...pelvis, b: { x: 0.5, y: -0.1 } }], /inside the frame/, ['gauges', 0, 'b', 'y']],
      [[{ ...pelvis, frame: 30 }], /beyond the clip's last frame \(29\)/, ['gauges', 0, 'frame']],
      [[pelvis, { ...arm, id: pelvis.id }], /listed twice/, ['gauges', 1, 'id']],
      [[{ ...pelvis, vertex: pelvis.a }], /need length/, ['gauges', 0, 'vertex']],
      [[{ ...pelvis, id: 'has space' }], /gauge id/, ['gauges', 0, 'id']],
    ];
    for (const [gauges, message, where] of cases) {
      const res = await put({ baseRevision: 1, ...empty, gauges });
      expect(res.status, JSON.stringify(gauges)).toBe(422);
      expect(res.body.error.message).toMatch(message);
      expect(res.body.error.details.map((d: { path: (string | number)[] }) => d.path)).toContainEqual(where);
    }
    const after = (await c.get(`/api/clips/${clipId}/annotations`)).body as ClipAnnotations;
    expect(after.revision).toBe(1);
    expect(after.gauges).toEqual([arm, pelvis, later]);
  });

  it('keeps gauges from a coach of another clinic (404)', async () => {
    const other = await signedIn(t.app, OTHER.coach.email, OTHER.coach.password);
    expect((await other.put(`/api/clips/${clipId}/annotations`, { baseRevision: 1, ...empty, gauges: [] })).status).toBe(404);
    expect((await t.db('angle_gauges').where({ clip_id: clipId })).length).toBe(3);
  });
});

describe('a still of a frame with gauges', () => {
  let still: Still;

  beforeAll(async () => {
    const res = await c.post(`/api/clips/${clipId}/stills`, { frameIndex: 5, caption: 'Pelvis and arm', showAngles: true });
    expect(res.status, JSON.stringify(res.body)).toBe(202);
    await t.worker!.idle();
    still = (await c.get(`/api/stills/${res.body.id}`)).body as Still;
    expect(still.status).toBe('ready');
  });

  it('freezes only that frame’s gauges with the still', async () => {
    const row = await t.db('stills').where({ id: still.id }).first();
    expect(JSON.parse(row.panels)[0].gauges).toEqual([arm, pelvis]);
  });

  it('draws each gauge’s arms in the gauge colour on the black frame', async () => {
    const png = (await c.agent.get(still.imageUrl).buffer(true)).body as Buffer;
    const img = await loadImage(png);
    const ctx = createCanvas(img.width, img.height).getContext('2d');
    ctx.drawImage(img, 0, 0);
    const rect = still.layout![0]!;
    const [wr, wg, wb] = [1, 3, 5].map((i) => parseInt(GAUGE_COLOURS.line.slice(i, i + 2), 16)) as [number, number, number];
    for (const g of [pelvis, arm]) {
      for (const end of [g.a, g.b]) {
        // Two thirds of the way out along the arm: past the arc, short of the handle. A thin
        // diagonal line is anti-aliased, so look for the gauge's hue (green well above red, blue
        // in between, as in the colour) at about the colour's brightness in a 3×3 neighbourhood.
        const x = rect.x + (g.vertex.x + (end.x - g.vertex.x) * 0.66) * W;
        const y = rect.y + (g.vertex.y + (end.y - g.vertex.y) * 0.66) * H;
        let found = false;
        for (let dx = -1; dx <= 1; dx++)
          for (let dy = -1; dy <= 1; dy++) {
            const [r, gr, b] = ctx.getImageData(Math.round(x) + dx, Math.round(y) + dy, 1, 1).data as unknown as [number, number, number];
            const k = gr / wg;
            if (k > 0.6 && Math.abs(r - wr * k) < 30 && Math.abs(b - wb * k) < 30) found = true;
          }
        expect(found, `${g.id} arm near (${x.toFixed(0)}, ${y.toFixed(0)})`).toBe(true);
      }
    }
  });

  it('the pelvis gauge reads the angle of its arms: acos of the dot product ([calc])', () => {
    const u = { x: (pelvis.a.x - pelvis.vertex.x) * W, y: (pelvis.a.y - pelvis.vertex.y) * H };
    const v = { x: (pelvis.b.x - pelvis.vertex.x) * W, y: (pelvis.b.y - pelvis.vertex.y) * H };
    const byHand = (Math.acos((u.x * v.x + u.y * v.y) / (Math.hypot(u.x, u.y) * Math.hypot(v.x, v.y))) * 180) / Math.PI;
    // Arms (160, 0) px and (128, −108) px: atan(108 / 128) = 40.16°.
    expect(byHand).toBeCloseTo(40.156, 2);
    expect(gaugeAngleDeg(pelvis, { width: W, height: H })).toBeCloseTo(byHand, 9);
  });
});
