import path from 'node:path';
import type { Page } from 'playwright-core';
import { Client } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import type { Harness } from './harness';
import { generateRunnerClip } from '../../scripts/demo-clip/clip';
import { marksFromTruth } from '../../scripts/demo-clip/demo-marks';

/** Uploads `file` to the assessment through the API and waits until its frames are ready. Returns the clip id. */
export async function uploadReadyClip(api: Client, assessmentId: number, file: string): Promise<number> {
  const up = await api.agent
    .post(`/api/assessments/${assessmentId}/clips`)
    .set('X-XSRF-TOKEN', await api.xsrf())
    .attach('file', file);
  const clipId = up.body.id as number;
  for (let i = 0; ; i++) {
    const clip = (await api.get(`/api/clips/${clipId}`)).body;
    if (clip.status === 'ready') return clipId;
    if (clip.status === 'failed' || i > 300) throw new Error(`clip ${clip.status}: ${clip.error}`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

/**
 * Renders a synthetic runner clip (scripts/demo-clip; known hip extension at toe-off; 6 s by
 * default: 8 toe-offs a side, past the 7 steps a published measurement error assumes), uploads it
 * to the assessment through the API, waits until its frames are ready, and marks every frame from
 * the generator's ground truth as a coach would. Returns the clip id.
 */
export async function uploadMarkedClip(
  api: Client,
  assessmentId: number,
  file: string,
  hipExtensionDeg: number,
  seconds = 6,
): Promise<number> {
  const truth = await generateRunnerClip({
    fps: 60,
    width: 640,
    height: 360,
    seconds,
    hipExtensionDeg,
    facing: 'right',
    beltSpeedMps: 3,
    outFile: file,
    preset: 'ultrafast',
  });
  const clipId = await uploadReadyClip(api, assessmentId, file);
  await api.patch(`/api/clips/${clipId}`, { nearSide: truth.nearSide, direction: 'left_to_right' });
  const res = await api.put(`/api/clips/${clipId}/annotations`, marksFromTruth(truth, 'all'));
  if (res.status !== 200) throw new Error(`annotations: ${res.status} ${JSON.stringify(res.body).slice(0, 300)}`);
  return clipId;
}

/**
 * Gives the demo athlete's Baseline and Re-test each a marked synthetic runner clip (about 4° and
 * 11° of hip extension at toe-off), uploaded by the demo coach. Clip files are written to `dir`.
 */
export async function markDemoVisits(
  h: Harness,
  dir: string,
): Promise<{ athleteId: number; baseline: { assessmentId: number; clipId: number }; retest: { assessmentId: number; clipId: number } }> {
  const [, coach, , athlete] = DEMO_SIGN_INS;
  const api = new Client(h.baseUrl);
  await api.signIn(coach.email, coach.password);
  const ada = await h.server.db('athletes').where({ email: athlete.email }).first();
  const visits: { id: number; kind: string }[] = await h.server.db('assessments').where({ athlete_id: ada.id });
  const mark = async (kind: string, deg: number) => {
    const assessmentId = visits.find((v) => v.kind === kind)!.id;
    return { assessmentId, clipId: await uploadMarkedClip(api, assessmentId, path.join(dir, `${kind}.mp4`), deg) };
  };
  return { athleteId: ada.id, baseline: await mark('baseline', 4), retest: await mark('retest', 11) };
}

/** Signs `who` in on the sign-in page and waits for the athletes list. */
export async function signInOnPage(page: Page, baseUrl: string, who: { email: string; password: string }): Promise<void> {
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel('E-mail').fill(who.email);
  await page.getByLabel('Password', { exact: true }).fill(who.password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL(/\/athletes$/);
}

/** Whether the canvas has anything drawn beyond one flat colour. */
export function canvasDrawn(page: Page, selector: string): Promise<boolean> {
  return page.locator(selector).evaluate((c: HTMLCanvasElement) => {
    const ctx = c.getContext('2d');
    if (!ctx || !c.width) return false;
    const d = ctx.getImageData(0, 0, c.width, c.height).data;
    for (let i = 0; i < d.length; i += 4 * 97) if (d[i] !== d[0]) return true;
    return false;
  });
}
