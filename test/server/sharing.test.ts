/**
 * Stills and visit summaries through the API: rendering on the server, publishing with an e-mail
 * notice, and who may fetch what. References outside the project:
 * - the synthetic runner's ground truth (joint pixels and angles the generator drew; a test
 *   fixture with known geometry, not a published source) for marker positions and labels;
 * - DESIGN.md's limb colours (right amber #E08A1E, left violet #7B4FD6) at those pixels;
 * - the PDF's own text, extracted with pdf-parse (npm), for athlete, measures with units and
 *   the cited sources of the clinic's reference bands (REFERENCES.md).
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { loadImage, createCanvas } from '@napi-rs/canvas';
import { PDFParse } from 'pdf-parse';
import { makeTestApp, OTHER, signedIn, type Client, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { makeClip, tempDir } from './media/fixtures';
import { generateRunnerClip, type GroundTruth } from '../../scripts/demo-clip/clip';
import { marksFromTruth } from '../../scripts/demo-clip/demo-marks';
import type { ClipMeasures } from '../../src/contracts/measures';
import { CAPTION_MAX, type PortalShared, type Still, type VisitSummary } from '../../src/contracts/sharing';
import { OVERLAY_COLOURS } from '../../src/kinematics';
import { baselineVisit } from '../support/bodies';

const [, coach, , athlete] = DEMO_SIGN_INS;
let t: TestApp;
let c: Client;
let ada: Client;
let dir: { dir: string; cleanup: () => Promise<void> };
let adaId: number;
let baselineId: number;
let retestId: number;
let runnerClipId: number;
let retestClipId: number;
let plainClipId: number;
let truth: GroundTruth;
let measures: ClipMeasures;

async function upload(assessmentId: number, file: string): Promise<number> {
  const res = await c.agent
    .post(`/api/assessments/${assessmentId}/clips`)
    .set('X-XSRF-TOKEN', await c.xsrf())
    .attach('file', file);
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.id;
}

/** Marks every frame of a runner clip with the generator's truth, as a coach would by hand. */
async function markFromTruth(clipId: number, assessmentId: number): Promise<void> {
  await t.db('assessments').where({ id: assessmentId }).update({ surface: 'treadmill', speed_mps: truth.beltSpeedMps });
  await c.patch(`/api/clips/${clipId}`, {
    nearSide: truth.nearSide,
    direction: truth.facing === 'right' ? 'left_to_right' : 'right_to_left',
  });
  const res = await c.put(`/api/clips/${clipId}/annotations`, marksFromTruth(truth, 'all'));
  expect(res.status, JSON.stringify(res.body).slice(0, 300)).toBe(200);
}

async function settled<T extends { status: string }>(url: string): Promise<T> {
  await t.worker!.idle();
  const res = await c.get(url);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body as T;
}

beforeAll(async () => {
  dir = await tempDir('sharing');
  t = await makeTestApp();
  c = await signedIn(t.app, coach.email, coach.password);
  ada = await signedIn(t.app, athlete.email, athlete.password);
  adaId = (await t.db('athletes').where({ email: athlete.email }).first()).id;
  baselineId = (await t.db('assessments').where({ athlete_id: adaId, kind: 'baseline' }).first()).id;
  retestId = (await t.db('assessments').where({ athlete_id: adaId, kind: 'retest' }).first()).id;
  const file = path.join(dir.dir, 'runner.mp4');
  truth = await generateRunnerClip({
    fps: 60,
    width: 640,
    height: 360,
    seconds: 2,
    hipExtensionDeg: 8,
    facing: 'right',
    beltSpeedMps: 3,
    outFile: file,
    preset: 'ultrafast',
  });
  runnerClipId = await upload(baselineId, file);
  retestClipId = await upload(retestId, file);
  plainClipId = await upload(retestId, await makeClip(path.join(dir.dir, 'plain.mp4'), { fps: 30, width: 320, height: 180, seconds: 1 }));
  await t.worker!.idle();
  await markFromTruth(runnerClipId, baselineId);
  await markFromTruth(retestClipId, retestId);
  measures = (await c.get(`/api/clips/${runnerClipId}/measures`)).body;
}, 240_000);
afterAll(async () => {
  await t?.close();
  await dir?.cleanup();
});

const hexRgb = (hex: string) => [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16));

describe('an annotated still', () => {
  let still: Still;
  const toeOff = () => truth.events.near.toeOff[1]!;

  beforeAll(async () => {
    const res = await c.post(`/api/clips/${runnerClipId}/stills`, {
      frameIndex: toeOff(),
      caption: 'Right toe-off: hip extension before retraining.',
      showAngles: true,
    });
    expect(res.status, JSON.stringify(res.body)).toBe(202);
    expect(res.body).toMatchObject({ status: 'rendering', kind: 'frame' });
    still = await settled<Still>(`/api/stills/${res.body.id}`);
  });

  it('is rendered as a PNG and a smaller phone JPEG, with the frame at its working size', async () => {
    expect(still).toMatchObject({ status: 'ready', progress: 1, error: null, publishedAt: null });
    expect(still.layout![0]).toMatchObject({ x: 0, width: truth.width, height: truth.height });
    const png = await c.agent.get(still.imageUrl).buffer(true);
    expect(png.status).toBe(200);
    expect(png.headers['content-type']).toBe('image/png');
    expect(png.headers['cache-control']).toContain('private');
    const jpg = await c.agent.get(still.phoneImageUrl).buffer(true);
    expect(jpg.headers['content-type']).toBe('image/jpeg');
    expect((jpg.body as Buffer).length).toBeLessThan((png.body as Buffer).length);
  });

  it('has the near-side marker colour at the true landmark pixels (ground truth of the generator)', async () => {
    const png = (await c.agent.get(still.imageUrl).buffer(true)).body as Buffer;
    const img = await loadImage(png);
    const canvas = createCanvas(img.width, img.height);
    const ctx = canvas.getContext('2d');
    ctx.drawImage(img, 0, 0);
    const rect = still.layout![0]!;
    const want = hexRgb(OVERLAY_COLOURS[truth.nearSide]);
    const frame = truth.frames[toeOff()]!;
    const frameJpeg = (await c.agent.get(`/api/clips/${runnerClipId}/frames/${toeOff()}`).buffer(true)).body as Buffer;
    const bareImg = await loadImage(frameJpeg);
    const bare = createCanvas(bareImg.width, bareImg.height).getContext('2d');
    bare.drawImage(bareImg, 0, 0);
    const checked: string[] = [];
    for (const name of ['hip', 'knee', 'ankle', 'heel', 'toe'] as const) {
      const p = frame.landmarks.near[name]!;
      const px = ctx.getImageData(Math.round(rect.x + p.x), Math.round(rect.y + p.y), 1, 1).data;
      const diff = Math.max(...want.map((v, i) => Math.abs(v - px[i]!)));
      expect(diff, `${name} at (${p.x}, ${p.y}) is rgb(${px[0]}, ${px[1]}, ${px[2]})`).toBeLessThanOrEqual(24);
      // The marker's white outline ring: in at least two of four directions, a pixel about one
      // marker radius out is clearly whiter than the same pixel of the bare frame.
      const lift = (ux: number, uy: number) =>
        Math.max(
          ...[2, 2.5, 3, 3.5].map((r) => {
            const x = Math.floor(p.x + ux * r);
            const y = Math.floor(p.y + uy * r);
            const q = ctx.getImageData(rect.x + x, rect.y + y, 1, 1).data;
            const b = bare.getImageData(x, y, 1, 1).data;
            return Math.min(q[0]! - b[0]!, q[1]! - b[1]!, q[2]! - b[2]!);
          }),
        );
      const ring = [
        [1, 0],
        [-1, 0],
        [0, 1],
        [0, -1],
      ].map(([ux, uy]) => lift(ux!, uy!));
      expect(ring.filter((w) => w >= 15).length, `${name} outline ${ring.join(',')}`).toBeGreaterThanOrEqual(2);
      checked.push(name);
    }
    expect(checked).toHaveLength(5);
  });

  it('draws degree labels whose numbers match the measures at that step', async () => {
    const hip = measures.measures.find((m) => m.key === 'hip_extension_toe_off' && m.side === truth.nearSide)!;
    const step = truth.events.near.toeOff.indexOf(toeOff());
    const label = still.labels.find((l) => l.side === truth.nearSide && l.joint === 'hip')!;
    expect(label.text).toMatch(/° ext$/);
    expect(Number.parseFloat(label.text)).toBeCloseTo(hip.values[step]!, 1);
    // And within 0.5° of the generator's own angle at that frame.
    expect(Math.abs(Number.parseFloat(label.text) - truth.hipExtensionAtToeOffDeg.near[step]!)).toBeLessThan(0.5);
  });

  it('re-renders under a new URL when the caption changes', async () => {
    const res = await c.patch(`/api/stills/${still.id}`, { caption: 'Edited caption' });
    expect(res.status).toBe(200);
    const after = await settled<Still>(`/api/stills/${still.id}`);
    expect(after.caption).toBe('Edited caption');
    expect(after.imageUrl).not.toBe(still.imageUrl);
    expect((await c.agent.get(after.imageUrl)).status).toBe(200);
  });
});

describe('bad input for stills', () => {
  const count = async () => (await t.db('stills').count<{ n: number }[]>('id as n'))[0]!.n;

  it('refuses a caption over the limit, a frame outside the clip and a pair across athletes, writing nothing', async () => {
    const before = await count();
    const long = await c.post(`/api/clips/${runnerClipId}/stills`, {
      frameIndex: 0,
      caption: 'x'.repeat(CAPTION_MAX + 1),
      showAngles: true,
    });
    expect(long.status).toBe(422);
    expect(long.body.error.message).toContain(`${CAPTION_MAX} characters`);
    const frame = await c.post(`/api/clips/${runnerClipId}/stills`, { frameIndex: 10_000, caption: '', showAngles: true });
    expect(frame.status).toBe(422);
    const self = await c.post(`/api/clips/${runnerClipId}/stills`, {
      frameIndex: 0,
      caption: '',
      showAngles: true,
      pairWith: { clipId: runnerClipId, frameIndex: 0 },
    });
    expect(self.status).toBe(422);
    const teodor = await t.db('athletes').where({ email: 'teodor.brannick@runner.test' }).first();
    const teodorAssessment = (await c.post(`/api/athletes/${teodor.id}/assessments`, baselineVisit())).body.id;
    const teodorClip = await upload(
      teodorAssessment,
      await makeClip(path.join(dir.dir, 'teodor.mp4'), { fps: 30, width: 320, height: 180, seconds: 1 }),
    );
    await t.worker!.idle();
    const cross = await c.post(`/api/clips/${runnerClipId}/stills`, {
      frameIndex: 0,
      caption: '',
      showAngles: true,
      pairWith: { clipId: teodorClip, frameIndex: 0 },
    });
    expect(cross.status).toBe(422);
    expect(cross.body.error.code).toBe('other_athlete');
    expect(await count()).toBe(before);
  });
});

describe('a side-by-side still of Baseline and Re-test', () => {
  it('puts the baseline frame on the left and the re-test on the right, both with overlays', async () => {
    const frame = truth.events.near.toeOff[1]!;
    const res = await c.post(`/api/clips/${retestClipId}/stills`, {
      frameIndex: frame,
      caption: 'Baseline and Re-test at right toe-off',
      showAngles: true,
      pairWith: { clipId: runnerClipId, frameIndex: frame },
    });
    expect(res.status, JSON.stringify(res.body)).toBe(202);
    const pair = await settled<Still>(`/api/stills/${res.body.id}`);
    expect(pair.kind).toBe('pair');
    expect(pair.panels.map((p) => p.assessmentId)).toEqual([baselineId, retestId]);
    expect(pair.panels[0]!.label).toMatch(/^Baseline · /);
    expect(pair.layout).toHaveLength(2);
    expect(pair.layout![1]!.x).toBeGreaterThan(pair.layout![0]!.x + pair.layout![0]!.width);
    expect(new Set(pair.labels.map((l) => l.panel))).toEqual(new Set([0, 1]));
  });
});

describe('publishing and access', () => {
  let still: Still;

  beforeAll(async () => {
    const res = await c.post(`/api/clips/${runnerClipId}/stills`, {
      frameIndex: truth.events.near.toeOff[0]!,
      caption: 'Published still caption SECRET-CAPTION',
      showAngles: true,
    });
    still = await settled<Still>(`/api/stills/${res.body.id}`);
  });

  it('hides an unpublished still from the athlete (404), by id and by image URL', async () => {
    expect((await ada.get(`/api/stills/${still.id}`)).status).toBe(404);
    expect((await ada.agent.get(still.imageUrl)).status).toBe(404);
    expect((await ada.agent.get(still.phoneImageUrl)).status).toBe(404);
    const listed = (await ada.get(`/api/athletes/${adaId}/stills`)).body as Still[];
    expect(listed.map((s) => s.id)).not.toContain(still.id);
  });

  it('publishes: the athlete sees it, the e-mail notice links to the portal and carries no caption or measures', async () => {
    const sentBefore = t.mailer.sent.length;
    const res = await c.post(`/api/stills/${still.id}/publish`, {});
    expect(res.status).toBe(200);
    expect(res.body.publishedAt).not.toBeNull();
    const mail = t.mailer.sent.slice(sentBefore);
    expect(mail).toHaveLength(1);
    expect(mail[0]!.to).toBe(athlete.email);
    expect(mail[0]!.text).toContain('/portal');
    expect(mail[0]!.text).not.toContain('SECRET-CAPTION');
    expect(mail[0]!.text).not.toMatch(/°|hip|knee/i);
    // Publishing again sends nothing more.
    await c.post(`/api/stills/${still.id}/publish`, {});
    expect(t.mailer.sent.length).toBe(sentBefore + 1);

    expect((await ada.get(`/api/stills/${still.id}`)).status).toBe(200);
    const img = await ada.agent.get(still.phoneImageUrl);
    expect(img.status).toBe(200);
    const shared = (await ada.get('/api/portal/shared')).body as PortalShared;
    expect(shared.stills.map((s) => s.id)).toContain(still.id);
    expect(shared.stills.every((s) => s.publishedAt !== null)).toBe(true);
    const viewed = await t.db('audit_log').where({ action: 'still.viewed' }).orderBy('id', 'desc').first();
    expect(JSON.parse(viewed.detail)).toMatchObject({ stillId: still.id });
  });

  it('keeps it from a coach of another clinic and from guessed file paths (404)', async () => {
    const other = await signedIn(t.app, OTHER.coach.email, OTHER.coach.password);
    expect((await other.get(`/api/stills/${still.id}`)).status).toBe(404);
    expect((await other.agent.get(still.imageUrl)).status).toBe(404);
    expect((await ada.agent.get(`/api/stills/${still.id}/image.webp`)).status).toBe(404);
    expect((await ada.agent.get(`/api/stills/${still.id}/..%2F..%2Fmanifest.json`)).status).toBe(404);
    expect((await ada.agent.get(`/uploads/clips/${runnerClipId}/stills/${still.id}-v1.png`)).status).toBe(404);
  });

  it('unpublishes: gone from the athlete again', async () => {
    expect((await c.post(`/api/stills/${still.id}/unpublish`, {})).status).toBe(200);
    expect((await ada.agent.get(still.imageUrl)).status).toBe(404);
  });

  it('a server stop while its images are removed leaves the still, so deleting it again removes the rest', async () => {
    const images = async () => (await t.store.list(`clips/${runnerClipId}/stills/`)).filter((k) => k.includes(`/${still.id}-`));
    expect((await images()).length).toBeGreaterThan(0);
    // What a SIGKILL halfway through the removal leaves: the request unanswered, some files maybe gone.
    const remove = vi.spyOn(t.store, 'remove').mockRejectedValueOnce(new Error('the server stopped'));
    try {
      expect((await c.delete(`/api/stills/${still.id}`)).status).not.toBe(204);
    } finally {
      remove.mockRestore();
    }
    expect((await c.get(`/api/stills/${still.id}`)).status).toBe(200);
    expect((await c.delete(`/api/stills/${still.id}`)).status).toBe(204);
    expect((await c.get(`/api/stills/${still.id}`)).status).toBe(404);
    expect(await images()).toEqual([]);
  });
});

describe('visit summaries', () => {
  const pdfText = async (client: Client, url: string) => {
    const res = await client.agent
      .get(url)
      .buffer(true)
      .parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on('data', (ch: Buffer) => chunks.push(ch));
        r.on('end', () => cb(null, Buffer.concat(chunks)));
      });
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    const buf = res.body as Buffer;
    expect(buf.subarray(0, 5).toString()).toBe('%PDF-');
    return (await new PDFParse({ data: new Uint8Array(buf) }).getText()).text;
  };

  it('renders a summary with the athlete, visit facts, measures with units, stills and cited sources', async () => {
    const stills = (await c.get(`/api/athletes/${adaId}/stills`)).body as Still[];
    const ready = stills
      .filter((s) => s.status === 'ready' && s.assessmentId === baselineId)
      .slice(0, 2)
      .map((s) => s.id);
    const res = await c.post(`/api/assessments/${baselineId}/summaries`, {
      findings: 'Hip extension at toe-off is short of the usual range.',
      planText: 'Isometric hip extension holds, then slow lunges.',
      stillIds: ready,
    });
    expect(res.status, JSON.stringify(res.body)).toBe(202);
    const summary = await settled<VisitSummary>(`/api/summaries/${res.body.id}`);
    expect(summary).toMatchObject({ status: 'ready', progress: 1 });
    expect(summary.pageCount).toBeGreaterThanOrEqual(1);
    const text = await pdfText(c, summary.pdfUrl);
    expect(text).toContain('Ada Kestrel');
    expect(text).toContain('Hip extension at toe-off');
    expect(text).toMatch(/\d+\.\d°/);
    expect(text).toMatch(/\d+ steps\/min/);
    expect(text).toContain('3.00 m/s');
    // The clinic's reference bands carry their citations (REFERENCES.md), printed as sources.
    const hip = measures.measures.find((m) => m.key === 'hip_extension_toe_off' && m.band);
    expect(hip?.band?.band.source).toBeTruthy();
    expect(text.replace(/\s+/g, ' ')).toContain(hip!.band!.band.source.replace(/\s+/g, ' ').slice(0, 25));
    expect(text).toContain('licensed clinician');
  });

  it('compares Re-test with Baseline, and says "Not measured" for a visit without marked steps', async () => {
    const cmp = await c.post(`/api/assessments/${retestId}/summaries`, {
      baselineAssessmentId: baselineId,
      findings: '',
      planText: '',
      stillIds: [],
    });
    expect(cmp.status).toBe(202);
    const summary = await settled<VisitSummary>(`/api/summaries/${cmp.body.id}`);
    const text = await pdfText(c, summary.pdfUrl);
    expect(text).toContain('Re-test comparison');
    // One 2 s clip per visit marks fewer than 7 steps (Dingenen et al. 2018 [pub]): no verdict, it says why.
    expect(text).toMatch(/Too few steps to judge/);

    const empty = (
      await c.post(`/api/athletes/${adaId}/assessments`, {
        date: '2026-12-01',
        kind: 'retest',
        surface: 'road',
        speed: null,
        inclinePercent: null,
        shoes: null,
        cameraNotes: null,
        notes: null,
      })
    ).body.id;
    const none = await c.post(`/api/assessments/${empty}/summaries`, { findings: '', planText: '', stillIds: [] });
    expect(none.status).toBe(202);
    const s2 = await settled<VisitSummary>(`/api/summaries/${none.body.id}`);
    expect(s2.status).toBe('ready');
    expect(await pdfText(c, s2.pdfUrl)).toContain('Not measured');
  });

  it('waits for a clip of its visits still being extracted, then prints its marked steps (not "Not measured")', async () => {
    // A summary queued together with its clips' extraction (as the demo seed does) must not be drawn before the frames exist.
    await t.db('clips').where({ id: retestClipId }).update({ status: 'extracting' });
    const res = await c.post(`/api/assessments/${retestId}/summaries`, { findings: '', planText: '', stillIds: [] });
    expect(res.status).toBe(202);
    await t.worker!.idle();
    expect((await c.get(`/api/summaries/${res.body.id}`)).body.status).toBe('rendering');
    await t.db('clips').where({ id: retestClipId }).update({ status: 'ready' });
    let summary: VisitSummary = (await c.get(`/api/summaries/${res.body.id}`)).body;
    for (let i = 0; i < 100 && summary.status === 'rendering'; i++) {
      await new Promise((r) => setTimeout(r, 100));
      await t.worker!.idle();
      summary = (await c.get(`/api/summaries/${res.body.id}`)).body;
    }
    expect(summary.status).toBe('ready');
    const text = (await pdfText(c, summary.pdfUrl)).replace(/\s+/g, ' ');
    // Both clips count (the marked one and the unmarked one), not only the one that was ready first.
    expect(text).toContain('Clip 1 of 2');
    // The hip extension printed for the near side is the generator's own (test fixture ground truth, not a
    // published source): its mean over the marked toe-offs, to the 0.1° the PDF shows, within 0.5°.
    const near = truth.hipExtensionAtToeOffDeg.near;
    const expected = near.reduce((s, v) => s + v, 0) / near.length;
    const row = new RegExp(`Hip extension at toe-off \\(thigh from vertical, ${truth.nearSide}\\) (\\d+\\.\\d) ±`).exec(text);
    expect(row, text.slice(0, 600)).not.toBeNull();
    expect(Math.abs(Number(row![1]) - expected)).toBeLessThan(0.5);
  });

  it('refuses bad input with clear errors and writes nothing', async () => {
    const before = (await t.db('visit_summaries').count<{ n: number }[]>('id as n'))[0]!.n;
    const teodor = await t.db('athletes').where({ email: 'teodor.brannick@runner.test' }).first();
    const teodorAssessment = await t.db('assessments').where({ athlete_id: teodor.id }).first();
    const cross = await c.post(`/api/assessments/${retestId}/summaries`, {
      baselineAssessmentId: teodorAssessment.id,
      findings: '',
      planText: '',
      stillIds: [],
    });
    expect(cross.status).toBe(422);
    expect(cross.body.error.code).toBe('other_athlete');
    const long = await c.post(`/api/assessments/${retestId}/summaries`, { findings: 'x'.repeat(4001), planText: '', stillIds: [] });
    expect(long.status).toBe(422);
    const missing = await c.post(`/api/assessments/${retestId}/summaries`, { findings: '', planText: '', stillIds: [999_999] });
    expect(missing.status).toBe(422);
    expect((await t.db('visit_summaries').count<{ n: number }[]>('id as n'))[0]!.n).toBe(before);
  });

  it('publishes to the athlete with a notice; unpublished ones stay hidden (404)', async () => {
    const list = (await c.get(`/api/athletes/${adaId}/summaries`)).body as VisitSummary[];
    const [first, second] = list;
    expect((await ada.agent.get(first!.pdfUrl)).status).toBe(404);
    const sentBefore = t.mailer.sent.length;
    expect((await c.post(`/api/summaries/${first!.id}/publish`, {})).status).toBe(200);
    expect(t.mailer.sent.length).toBe(sentBefore + 1);
    expect(t.mailer.sent.at(-1)!.text).not.toContain(first!.findings.slice(0, 20) || 'no-findings');
    expect(await pdfText(ada, first!.pdfUrl)).toContain('Ada Kestrel');
    const dl = await ada.agent.get(`${first!.pdfUrl}?download=1`);
    // Named from athlete, visit and date: an ASCII fallback and the exact name as UTF-8 (RFC 6266 / 8187).
    const athleteRow = await t.db('athletes').where({ id: adaId }).first<{ first_name: string; last_name: string }>();
    const visitRow = await t.db('assessments').where({ id: first!.assessmentId }).first<{ date: string }>();
    const disposition = String(dl.headers['content-disposition']);
    const m = /^attachment; filename="([a-z0-9-]+\.pdf)"; filename\*=UTF-8''(\S+)$/.exec(disposition);
    expect(m, disposition).not.toBeNull();
    expect(m![1]).toContain(`${athleteRow!.first_name}-${athleteRow!.last_name}`.toLowerCase());
    expect(m![1]).toContain(visitRow!.date);
    expect(decodeURIComponent(m![2]!)).toMatch(
      new RegExp(`^${athleteRow!.first_name} ${athleteRow!.last_name} – .+ – ${visitRow!.date}\\.pdf$`),
    );
    expect((await ada.agent.get(second!.pdfUrl)).status).toBe(404);
    const shared = (await ada.get('/api/portal/shared')).body as PortalShared;
    expect(shared.summaries.map((s) => s.id)).toEqual([first!.id]);
    expect((await c.get('/api/portal/shared')).status).toBe(403);
  });
});

describe('a still whose clip was deleted', () => {
  it('cannot be published, says why, and its files are gone with the clip', async () => {
    const res = await c.post(`/api/clips/${plainClipId}/stills`, { frameIndex: 0, caption: '', showAngles: false });
    const still = await settled<Still>(`/api/stills/${res.body.id}`);
    expect(still.status).toBe('ready');
    expect((await c.delete(`/api/clips/${plainClipId}`)).status).toBe(204);
    const after = (await c.get(`/api/stills/${still.id}`)).body as Still;
    expect(after.status).toBe('failed');
    expect(after.error).toContain('clip of this still was deleted');
    const pub = await c.post(`/api/stills/${still.id}/publish`, {});
    expect(pub.status).toBe(409);
    expect(pub.body.error.code).toBe('clip_deleted');
    expect(await t.store.list(`clips/${plainClipId}/`)).toEqual([]);
  });
});
