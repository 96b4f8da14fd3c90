/**
 * The effort of reading hip extension at toe-off over a whole clip, in Debian chromium. The clip
 * is a synthetic fixture (scripts/demo-clip: an invented runner rendered with its ground truth,
 * not a real person or a data set): 1280×720 at 120 fps, 6.2 s (nine strides, ≥ 8 steps a side),
 * every realism option on (textured wall, motion blur, compression noise, flicker, far markers
 * passing behind the near leg, camera shake).
 *
 * A coach opens the review, clicks the six near-side tape markers on frame 0, follows them through
 * the clip, asks for proposed events, accepts them all, and reads hip extension at toe-off in the
 * Measures tab. Every click and key press the test makes on the review page is counted (signing in
 * and opening the page by its address are not): at most 20, and the figure is printed.
 *
 * The reference is recomputed here from the generator's truth joints with the REFERENCES.md
 * convention [calc]: thigh = atan2(knee.x − hip.x, hip.y − knee.y) with +x the running direction
 * and y up; hip extension = −thigh on each true toe-off frame.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Locator } from 'playwright-core';
import { SCREENSHOTS, startHarness, type Harness } from './harness';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { Client } from '../support/test-app';
import { tempDir } from '../server/media/fixtures';
import { ALL_REALISM, generateRunnerClip } from '../../scripts/demo-clip/clip';
import type { GroundTruth } from '../../scripts/demo-clip/ground-truth';
import { fitTransform, fractionToScreen } from '../../src/app/features/review/view-transform';
import { signInOnPage, uploadReadyClip } from './marked-clip';
import type { ClipAnnotations } from '../../src/contracts/annotations';

const [, coach, , athlete] = DEMO_SIGN_INS;
const MARKERS = ['shoulder', 'hip', 'knee', 'ankle', 'heel', 'toe'] as const;
const MOST_ACTIONS = 20;
let h: Harness;
let dir: { dir: string; cleanup: () => Promise<void> };
let truth: GroundTruth;
let athleteId: number;
let assessmentId: number;
let clipId: number;

beforeAll(async () => {
  h = await startHarness();
  dir = await tempDir('e2e-effort');
  const api = new Client(h.baseUrl);
  await api.signIn(coach.email, coach.password);
  const ada = await h.server.db('athletes').where({ email: athlete.email }).first();
  athleteId = ada.id;
  assessmentId = (await h.server.db('assessments').where({ athlete_id: ada.id, kind: 'baseline' }).first()).id;
  const file = path.join(dir.dir, 'runner.mp4');
  truth = await generateRunnerClip({
    fps: 120,
    width: 1280,
    height: 720,
    seconds: 6.2,
    hipExtensionDeg: 8,
    facing: 'right',
    outFile: file,
    preset: 'ultrafast',
    realism: ALL_REALISM,
  });
  clipId = await uploadReadyClip(api, assessmentId, file);
}, 900_000);
afterAll(async () => {
  await h?.close();
  await dir?.cleanup();
});

/** Hip extension (°) of the near side on a frame, from the generator's truth pixels ([calc], REFERENCES.md convention). */
function truthHipExtension(frame: number): number {
  const { hip, knee } = truth.frames[frame]!.landmarks.near;
  const forward = truth.facing === 'right' ? 1 : -1;
  // Pixels have y down: hip.y − knee.y in y-up terms is knee.y − hip.y here.
  const thigh = (Math.atan2(forward * (knee.x - hip.x), knee.y - hip.y) * 180) / Math.PI;
  return -thigh;
}

/** Reads "8.1° ± 0.2°" or "−3.0°" as numbers. */
const degrees = (text: string): number[] => [...text.replace(/\u2212/g, '-').matchAll(/-?\d+(?:\.\d+)?(?=°)/g)].map((m) => Number(m[0]));

describe('effort: six points on one frame to hip extension at toe-off over the whole clip', () => {
  it('1440×900: place six markers, follow, accept proposed events, read hip extension at toe-off over ≥ 8 steps (each within 0.3° of the truth joints on its frame, the mean within 1° of the truth toe-off frames, to the display’s 0.1°) in ≤ 20 clicks and keys', async () => {
    const { page, context, problems } = await h.newPage();
    await page.setViewportSize({ width: 1440, height: 900 });
    await signInOnPage(page, h.baseUrl, coach);
    await page.goto(`${h.baseUrl}/athletes/${athleteId}/assessments/${assessmentId}/clips/${clipId}/review`);
    const canvas = page.locator('app-frame-viewer canvas');
    await canvas.waitFor();

    let actions = 0;
    const click = async (target: Locator) => {
      actions++;
      await target.click();
    };
    const press = async (key: string) => {
      actions++;
      await page.keyboard.press(key);
    };
    /** Clicks where the marker is drawn (the coach aims at the tape dot she sees). */
    const clickMarker = async (p: { x: number; y: number }) => {
      const box = (await canvas.boundingBox())!;
      const t = fitTransform({ width: truth.width, height: truth.height }, { width: box.width, height: box.height });
      const s = fractionToScreen(t, { width: truth.width, height: truth.height }, p);
      actions++;
      await page.mouse.click(box.x + s.x, box.y + s.y);
    };

    // Six points on frame 0: the tool moves on to the next landmark after each.
    for (const [i, k] of MARKERS.entries()) {
      await clickMarker(truth.frames[0]!.landmarksNormalised.near[k]);
      await expect.poll(() => page.locator('app-landmarks-panel .counts').textContent()).toContain(`${i + 1} of 6 placed here`);
    }
    // Follow (T) once the points are saved.
    const follow = page.getByRole('button', { name: /Follow markers/ }).first();
    await expect.poll(() => follow.isEnabled(), { timeout: 20_000 }).toBe(true);
    await press('t');
    await expect.poll(() => page.getByText(/^Markers followed/).count(), { timeout: 240_000 }).toBe(1);
    await page.screenshot({ path: path.join(SCREENSHOTS, 'effort-followed-1440x900.png') });

    // Events: propose from the followed landmarks, accept them all.
    await click(page.getByRole('tab', { name: /Events/ }));
    await click(page.getByRole('button', { name: 'Propose from landmarks' }));
    const acceptAll = page.getByRole('button', { name: /^Accept all \d+$/ });
    await expect.poll(() => acceptAll.count(), { timeout: 30_000 }).toBe(1);
    await click(acceptAll);
    // Six points on the near side: that side's contacts and toe-offs (8 or more of each in 6.2 s).
    await expect.poll(() => page.locator('.events li.origin-accepted').count()).toBeGreaterThanOrEqual(16);
    await expect.poll(() => page.getByText('Saved', { exact: true }).count(), { timeout: 15_000 }).toBeGreaterThan(0);

    // Measures: hip extension at toe-off, with each step.
    await click(page.getByRole('tab', { name: 'Measures' }));
    const side = truth.nearSide === 'right' ? 'Right' : 'Left';
    const hipRow = page
      .locator('app-measures-panel .measures li')
      .filter({ hasText: 'Hip extension at toe-off (thigh' })
      .filter({ hasText: `${side} · Toe-off` });
    await click(hipRow.locator('summary'));
    await hipRow.scrollIntoViewIfNeeded();
    await page.screenshot({ path: path.join(SCREENSHOTS, 'effort-measures-1440x900.png') });

    const steps = Number(/n = (\d+) steps/.exec((await hipRow.locator('.steps').textContent())!)?.[1]);
    // "9.0 ± 0.1°": the mean is the first number.
    const mean = Number(/-?\d+(?:\.\d+)?/.exec((await hipRow.locator('.value').textContent())!.replace(/\u2212/g, '-'))![0]);
    const eachText = (await hipRow.locator('.detail p').filter({ hasText: 'Each step.' }).textContent())!;
    const each = degrees(eachText.replace('Each step.', ''));

    // The reference: the generator's truth joints on its own toe-off frames (last frame on the belt) [calc].
    const toeOffs = truth.events.near.toeOff;
    const truthMean = toeOffs.map(truthHipExtension).reduce((a, b) => a + b, 0) / toeOffs.length;
    // The toe-offs the coach accepted (proposed by the running refinement, Fellin et al. 2010 [pub]).
    const api = new Client(h.baseUrl);
    await api.signIn(coach.email, coach.password);
    const marks = (await api.get(`/api/clips/${clipId}/annotations`)).body as ClipAnnotations;
    const accepted = marks.events.filter((e) => e.kind === 'toe_off' && e.side === truth.nearSide).map((e) => e.frame);
    const offsets = accepted.map((f) => f - toeOffs.reduce((best, t) => (Math.abs(t - f) < Math.abs(best - f) ? t : best)));
    const truthAtAccepted = accepted.map(truthHipExtension);
    const followingError = Math.max(...each.map((v, i) => Math.abs(v - truthAtAccepted[i]!)));
    console.log(
      `effort: ${actions} clicks and key presses (≤ ${MOST_ACTIONS}); hip extension at toe-off ${mean.toFixed(1)}° over ${steps} steps; ` +
        `truth ${truthMean.toFixed(2)}° over ${toeOffs.length} true toe-offs (${(mean - truthMean).toFixed(2)}° apart); accepted toe-offs ` +
        `${offsets.join(', ')} frames from the true ones; each step within ${followingError.toFixed(2)}° of the truth joints on its own frame`,
    );
    // ≥ 8 toe-offs on the near side: past the 7 steps published reliability figures assume (Dingenen et al. 2018 [pub]).
    expect(toeOffs.length).toBeGreaterThanOrEqual(8);
    expect(steps).toBeGreaterThanOrEqual(8);
    expect(each).toHaveLength(steps);
    expect(accepted).toHaveLength(steps);
    // Following: on the frames the coach measures, the followed hip and knee give the truth's thigh angle (display rounds to 0.1°).
    expect(followingError).toBeLessThanOrEqual(0.3);
    // Events: every accepted toe-off within one frame of the truth.
    for (const o of offsets) expect(Math.abs(o)).toBeLessThanOrEqual(1);
    // Against the truth's own toe-off frames. The running refinement puts toe-off one frame after the
    // generator's last frame on the belt, where the thigh still extends ~1° a frame at 120 fps, so
    // the reading lands ~1.0° above the truth: the 1° goal, plus half the display's 0.1° step.
    expect(Math.abs(mean - truthMean)).toBeLessThanOrEqual(1.05);
    expect(actions).toBeLessThanOrEqual(MOST_ACTIONS);
    expect(problems).toEqual([]);
    await context.close();
  });
});
