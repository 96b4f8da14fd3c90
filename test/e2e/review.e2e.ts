/**
 * Review workspace in Debian chromium: a coach opens a synthetic runner clip (a test fixture with
 * known joint angles — not a published source), steps with the keyboard (also right after clicking
 * a speed toggle and a side tab), places landmarks by clicking at the generator's true marker
 * positions, marks gait events (the frame names them, and Save still starts with those words),
 * draws a scale bar and an Angle gauge, and the saved measures show hip extension at toe-off close
 * to the generator's truth. The layout is checked at 1440×900 and on a 390×844 phone, with
 * screenshots, and axe-core (npm) finds no critical or serious problems in the workspace or the
 * key-help dialog.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { axeProblems } from './axe';
import { SCREENSHOTS, startHarness, type Harness } from './harness';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { Client } from '../support/test-app';
import { tempDir } from '../server/media/fixtures';
import { generateRunnerClip, type GroundTruth } from '../../scripts/demo-clip/clip';
import { fitTransform, fractionToScreen } from '../../src/app/features/review/view-transform';
import type { ClipMeasures } from '../../src/contracts/measures';

const [, coach, , athlete] = DEMO_SIGN_INS;
let h: Harness;
let dir: { dir: string; cleanup: () => Promise<void> };
let truth: GroundTruth;
let clipId = 0;
let athleteId = 0;
let assessmentId = 0;

beforeAll(async () => {
  h = await startHarness();
  dir = await tempDir('e2e-review');
  const file = path.join(dir.dir, 'runner.mp4');
  truth = await generateRunnerClip({
    fps: 120,
    width: 960,
    height: 540,
    seconds: 2,
    hipExtensionDeg: 5,
    facing: 'right',
    outFile: file,
    preset: 'ultrafast',
  });
  const api = new Client(h.baseUrl);
  await api.signIn(coach.email, coach.password);
  const ada = await h.server.db('athletes').where({ email: athlete.email }).first();
  athleteId = ada.id;
  assessmentId = (await h.server.db('assessments').where({ athlete_id: ada.id, kind: 'baseline' }).first()).id;
  const up = await api.agent
    .post(`/api/assessments/${assessmentId}/clips`)
    .set('X-XSRF-TOKEN', await api.xsrf())
    .attach('file', file);
  clipId = up.body.id;
  await api.patch(`/api/clips/${clipId}`, { nearSide: truth.nearSide, direction: 'left_to_right' });
  for (let i = 0; ; i++) {
    const clip = (await api.get(`/api/clips/${clipId}`)).body;
    if (clip.status === 'ready') break;
    if (clip.status === 'failed' || i > 300) throw new Error(`clip ${clip.status}: ${clip.error}`);
    await new Promise((r) => setTimeout(r, 200));
  }
}, 180_000);
afterAll(async () => {
  await h?.close();
  await dir?.cleanup();
});

const reviewUrl = () => `${h.baseUrl}/athletes/${athleteId}/assessments/${assessmentId}/clips/${clipId}/review`;

async function frameNumber(page: Page): Promise<number> {
  return Number(await page.locator('.frame-no strong').textContent());
}

/** Steps with the keyboard to `target` (Shift+→ for tens, → for ones). */
async function goTo(page: Page, target: number): Promise<void> {
  await page.keyboard.press('Home');
  for (let i = 0; i < Math.floor(target / 10); i++) await page.keyboard.press('Shift+ArrowRight');
  for (let i = 0; i < target % 10; i++) await page.keyboard.press('ArrowRight');
  await expect.poll(() => frameNumber(page)).toBe(target);
}

/** Where a stored point (fractions of the frame) is drawn on the canvas, in page pixels. */
async function screenAt(page: Page, p: { x: number; y: number }): Promise<{ x: number; y: number }> {
  const box = (await page.locator('app-frame-viewer canvas').boundingBox())!;
  const t = fitTransform({ width: truth.width, height: truth.height }, { width: box.width, height: box.height });
  const s = fractionToScreen(t, { width: truth.width, height: truth.height }, p);
  return { x: box.x + s.x, y: box.y + s.y };
}

/** Clicks on the canvas where a stored point (fractions of the frame) is drawn. */
async function clickAt(page: Page, p: { x: number; y: number }): Promise<void> {
  const s = await screenAt(page, p);
  await page.mouse.click(s.x, s.y);
}

async function signIn(page: Page): Promise<void> {
  await page.goto(`${h.baseUrl}/sign-in`);
  await page.getByLabel('E-mail').fill(coach.email);
  await page.getByLabel('Password', { exact: true }).fill(coach.password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL(/\/athletes$/);
}

/** Whether the element lies wholly inside the window (no scrolling needed to see it). */
async function inWindow(page: Page, selector: string): Promise<boolean> {
  const box = await page.locator(selector).first().boundingBox();
  const vp = page.viewportSize()!;
  return !!box && box.y >= 0 && box.x >= 0 && box.y + box.height <= vp.height + 0.5 && box.x + box.width <= vp.width + 0.5;
}

describe('review workspace', () => {
  it('coach steps (also after clicking toggles and tabs), marks, places an Angle gauge, saves a still, and reads hip extension at toe-off', async () => {
    const { page, context, problems } = await h.newPage();
    await page.setViewportSize({ width: 1440, height: 900 });
    await signIn(page);
    await page.goto(reviewUrl());
    await page.locator('app-frame-viewer canvas').waitFor();
    await page
      .locator('app-frame-viewer canvas')
      .click({ position: { x: 5, y: 5 } })
      .catch(() => undefined);
    await page.keyboard.press('Escape');

    // 1440×900: frame, frame buttons and number, and the angle chart in view together, no scrolling.
    for (const sel of [
      'app-frame-viewer canvas',
      '.toolbar [aria-label="One frame forward"]',
      '.frame-no',
      'app-angle-chart canvas',
      'app-angle-chart .legend',
    ])
      expect(await inWindow(page, sel), `${sel} in the window`).toBe(true);
    const scroller = page.locator('mat-sidenav-content');
    expect(await scroller.evaluate((el) => el.scrollHeight - el.clientHeight)).toBeLessThanOrEqual(1);
    expect((await page.locator('app-angle-chart .chart-box').boundingBox())!.height).toBeGreaterThanOrEqual(160);

    // Keyboard stepping.
    await page.keyboard.press('Home');
    await page.keyboard.press('ArrowRight');
    await page.keyboard.press('ArrowRight');
    await expect.poll(() => frameNumber(page)).toBe(2);
    await page.keyboard.press('Shift+ArrowRight');
    await expect.poll(() => frameNumber(page)).toBe(12);

    // A click on a speed toggle, then on a side tab: the arrows still step frames, and neither the
    // speed nor the tab changes.
    const half = page.getByRole('radio', { name: '1/2×' });
    await half.click();
    await page.keyboard.press('ArrowRight');
    await expect.poll(() => frameNumber(page)).toBe(13);
    await page.keyboard.press('ArrowLeft');
    await page.keyboard.press('ArrowLeft');
    await expect.poll(() => frameNumber(page)).toBe(11);
    expect(await half.getAttribute('aria-checked')).toBe('true');
    const eventsTab = page.getByRole('tab', { name: /^Events/ });
    await eventsTab.click();
    await page.keyboard.press('ArrowLeft');
    await expect.poll(() => frameNumber(page)).toBe(10);
    await page.keyboard.press('ArrowRight');
    await page.keyboard.press('Shift+ArrowRight');
    await expect.poll(() => frameNumber(page)).toBe(21);
    expect(await eventsTab.getAttribute('aria-selected')).toBe('true');
    await page.keyboard.press('End');
    await page.keyboard.press('Home');
    await expect.poll(() => frameNumber(page)).toBe(0);
    expect(await eventsTab.getAttribute('aria-selected')).toBe('true');

    const near = truth.nearSide;
    const side = near === 'left' ? 'Left' : 'Right';
    const ic = truth.events.near.initialContact[0]!;
    const to = truth.events.near.toeOff.find((f) => f > ic)!;

    // Initial contact, then toe-off with every near-side landmark placed by clicking.
    await goTo(page, ic);
    await page.keyboard.press('i');
    await goTo(page, to);
    await page.keyboard.press('1');
    const points = truth.frames[to]!.landmarksNormalised.near;
    for (const name of ['shoulder', 'hip', 'knee', 'ankle', 'heel', 'toe'] as const) await clickAt(page, points[name]);
    await page.keyboard.press('o');
    // The frame names its event; one step earlier names nothing.
    await expect.poll(() => page.locator('.frame-events').textContent()).toContain(`${side} toe-off · step 1`);

    // Scale bar: 1 m along the belt, drawn with the scale tool.
    await page.keyboard.press('b');
    const y = 0.95;
    const sa = await screenAt(page, { x: 0.1, y });
    const sb = await screenAt(page, { x: 0.1 + truth.pxPerMetre / truth.width, y });
    await page.mouse.move(sa.x, sa.y);
    await page.mouse.down();
    await page.mouse.move(sb.x, sb.y, { steps: 8 });
    await page.mouse.up();
    await page.getByRole('tab', { name: 'Scale' }).click();
    await page.getByLabel('Length of the object').first().fill('1');
    await page.getByRole('button', { name: 'Use this scale' }).click();

    // Angle gauge (G): three clicks — arm end, vertex, arm end — then drag the vertex.
    await page.keyboard.press('g');
    await expect.poll(() => page.locator('.gauge-hint').textContent()).toContain('first arm');
    await clickAt(page, { x: 0.3, y: 0.3 });
    await clickAt(page, { x: 0.45, y: 0.5 });
    await clickAt(page, { x: 0.62, y: 0.42 });
    const gaugeRow = page.locator('app-landmarks-panel .gauge-list li');
    await expect.poll(() => gaugeRow.count()).toBe(1);
    const v0 = await screenAt(page, { x: 0.45, y: 0.5 });
    const v1 = await screenAt(page, { x: 0.45, y: 0.62 });
    await page.mouse.move(v0.x, v0.y);
    await page.mouse.down();
    await page.mouse.move(v1.x, v1.y, { steps: 6 });
    await page.mouse.up();

    // Autosave, then the server's snapshot.
    await expect
      .poll(async () => (await h.server.db('clips').where({ id: clipId }).first()).annotation_revision, { timeout: 20_000 })
      .toBeGreaterThan(0);
    await expect.poll(async () => (await h.server.db('scale_bars').where({ clip_id: clipId })).length, { timeout: 20_000 }).toBe(1);
    await expect.poll(async () => (await h.server.db('gait_events').where({ clip_id: clipId })).length, { timeout: 20_000 }).toBe(2);
    await expect
      .poll(async () => (await h.server.db('clip_landmarks').where({ clip_id: clipId, frame: to, side: near })).length, { timeout: 20_000 })
      .toBe(6);
    await expect
      .poll(async () => (await h.server.db('angle_gauges').where({ clip_id: clipId, frame: to }).first())?.vy, { timeout: 20_000 })
      .toBeGreaterThan(0.58);
    await expect.poll(() => page.locator('.save').textContent(), { timeout: 20_000 }).toContain('Saved');
    // The panel's value is the saved gauge's angle: acos of its arms' dot product in frame pixels ([calc]).
    const g = await h.server.db('angle_gauges').where({ clip_id: clipId }).first();
    const u = { x: (g.ax - g.vx) * truth.width, y: (g.ay - g.vy) * truth.height };
    const w = { x: (g.bx - g.vx) * truth.width, y: (g.by - g.vy) * truth.height };
    const byHand = (Math.acos((u.x * w.x + u.y * w.y) / (Math.hypot(u.x, u.y) * Math.hypot(w.x, w.y))) * 180) / Math.PI;
    expect(await gaugeRow.textContent()).toContain(`${byHand.toFixed(1)}°`);
    await page.screenshot({ path: path.join(SCREENSHOTS, 'review-1440x900-gauge.png') });

    const api = new Client(h.baseUrl);
    await api.signIn(coach.email, coach.password);
    const measures = (await api.get(`/api/clips/${clipId}/measures`)).body as ClipMeasures;
    const hip = measures.measures.find((m) => m.key === 'hip_extension_toe_off' && m.side === near)!;
    expect(hip.status).toBe('ok');
    expect(Math.abs(hip.mean! - truth.hipExtensionAtToeOffDeg.near[0]!)).toBeLessThan(1);
    const bar = (await h.server.db('scale_bars').where({ clip_id: clipId }).first()).length_m;
    expect(bar).toBe(1);

    // Save still (K): the caption starts with the frame's event in the same words; the still keeps the gauge.
    await page.keyboard.press('k');
    const caption = page.locator('mat-dialog-container textarea');
    await expect.poll(() => caption.inputValue()).toBe(`${side} toe-off · step 1.`);
    await page.locator('mat-dialog-container').getByRole('button', { name: 'Save still' }).click();
    await expect
      .poll(async () => (await h.server.db('stills').where({ clip_id: clipId }).first())?.caption, { timeout: 20_000 })
      .toBe(`${side} toe-off · step 1.`);
    const still = await h.server.db('stills').where({ clip_id: clipId }).first();
    expect(JSON.parse(still.panels)[0].gauges).toHaveLength(1);

    // Measures: each value with its band (unit included) and the band's source together.
    await page.getByRole('tab', { name: 'Measures' }).click();
    const hipRow = page
      .locator('app-measures-panel .measures li')
      .filter({ hasText: 'Hip extension at toe-off (thigh' })
      .filter({ hasText: `${side} · Toe-off` });
    // The generator's runner extends about 5°: below the ≥ 10° band (REFERENCES.md, common practice).
    await expect.poll(() => hipRow.textContent()).toMatch(/Below the reference band ≥ 10°/);
    expect(await hipRow.locator('.band-source').textContent()).toContain('Souza 2016');
    await page.screenshot({ path: path.join(SCREENSHOTS, 'review-workspace.png') });
    await page.screenshot({ path: path.join(SCREENSHOTS, 'review-1440x900-measures.png') });

    // The wheel scrolls (and says how to zoom); Ctrl + wheel zooms.
    const zoom = () => page.locator('.zoom').textContent();
    const before = await zoom();
    const mid = await screenAt(page, { x: 0.5, y: 0.5 });
    await page.mouse.move(mid.x, mid.y);
    await page.mouse.wheel(0, 240);
    await expect.poll(() => page.locator('.wheel-hint').count()).toBe(1);
    expect(await zoom()).toBe(before);
    await page.keyboard.down('Control');
    await page.mouse.wheel(0, -240);
    await page.keyboard.up('Control');
    await expect.poll(zoom).not.toBe(before);
    await page.keyboard.press('f');

    // Accessibility: no critical or serious axe-core findings in the workspace or the key help.
    expect(await axeProblems(page)).toEqual([]);
    await page.keyboard.press('?');
    await page.locator('app-key-help-dialog').waitFor();
    expect(await page.locator('app-key-help-dialog').textContent()).toContain('Angle gauge');
    expect(await axeProblems(page, '.cdk-overlay-container')).toEqual([]);
    await page.screenshot({ path: path.join(SCREENSHOTS, 'review-key-help.png') });
    await page.keyboard.press('Escape');

    expect(problems).toEqual([]);
    await context.close();
  });

  it('fits a 390×844 phone: nothing off-screen or overlapping, toolbar in view while scrolling', async () => {
    const { page, context, problems } = await h.newPage();
    await page.setViewportSize({ width: 390, height: 844 });
    await signIn(page);
    await page.goto(reviewUrl());
    await page.locator('app-frame-viewer canvas').waitFor();
    await expect.poll(() => page.locator('.frame-no').textContent()).toContain('Frame');
    await page.screenshot({ path: path.join(SCREENSHOTS, 'review-390x844-top.png') });

    const scroller = page.locator('mat-sidenav-content');
    const wide = await scroller.evaluate((el) =>
      [...el.querySelectorAll('*')]
        .filter((e) => e.getBoundingClientRect().right > el.clientWidth + 1)
        .slice(0, 5)
        .map((e) => `${e.tagName.toLowerCase()}.${[...e.classList].join('.')} ${Math.round(e.getBoundingClientRect().right)}`),
    );
    expect(await scroller.evaluate((el) => el.scrollWidth - el.clientWidth), wide.join(', ')).toBeLessThanOrEqual(1);
    // Every toolbar control lies inside the window, and none overlaps another.
    const boxes = await page.locator('.toolbar button, .toolbar .frame-no, .toolbar .zoom').evaluateAll((els) =>
      els
        .map((e) => e.getBoundingClientRect())
        .filter((r) => r.width > 0)
        .map((r) => ({ x: r.x, y: r.y, w: r.width, h: r.height })),
    );
    expect(boxes.length).toBeGreaterThan(10);
    for (const b of boxes) expect(b.x >= 0 && b.x + b.w <= 390.5, JSON.stringify(b)).toBe(true);
    for (let i = 0; i < boxes.length; i++)
      for (let j = i + 1; j < boxes.length; j++) {
        const a = boxes[i]!;
        const b = boxes[j]!;
        const overlap = Math.min(a.x + a.w, b.x + b.w) - Math.max(a.x, b.x) > 1 && Math.min(a.y + a.h, b.y + b.h) - Math.max(a.y, b.y) > 1;
        expect(overlap, `${JSON.stringify(a)} overlaps ${JSON.stringify(b)}`).toBe(false);
      }
    for (const sel of ['app-frame-viewer canvas', '.frame-no']) expect(await inWindow(page, sel), sel).toBe(true);

    // Scrolled down to the chart: the toolbar stays at the top.
    await page.locator('app-angle-chart').scrollIntoViewIfNeeded();
    expect(await inWindow(page, 'app-angle-chart .chart-box')).toBe(true);
    expect(await inWindow(page, '.toolbar')).toBe(true);
    await page.screenshot({ path: path.join(SCREENSHOTS, 'review-390x844-chart.png') });
    // The angle toggles wrap to two rows there: each is a chip with its own full outline, not one pill broken in two.
    const toggles = await page.locator('app-angle-chart .series mat-button-toggle').evaluateAll((els) =>
      els.map((e) => {
        const cs = getComputedStyle(e);
        return { left: parseFloat(cs.borderLeftWidth), top: parseFloat(cs.borderTopWidth), radius: parseFloat(cs.borderTopLeftRadius) };
      }),
    );
    expect(toggles.length).toBe(5);
    for (const t of toggles) expect(t.left >= 1 && t.top >= 1 && t.radius >= 10, JSON.stringify(t)).toBe(true);
    await page.getByRole('tab', { name: 'Measures' }).scrollIntoViewIfNeeded();
    await page.getByRole('tab', { name: 'Measures' }).click();
    await page.locator('app-measures-panel').scrollIntoViewIfNeeded();
    await page.screenshot({ path: path.join(SCREENSHOTS, 'review-390x844-measures.png') });
    expect(await axeProblems(page)).toEqual([]);
    expect(problems).toEqual([]);
    await context.close();
  });

  it('offers key badges and the keyboard-shortcuts button on a desktop, none on a touch phone', async () => {
    const visibleKeys = (page: Page) =>
      page.locator('kbd').evaluateAll((els) => els.filter((e) => e.getBoundingClientRect().width > 0).map((e) => e.textContent!.trim()));
    const desktop = await h.newPage();
    await desktop.page.setViewportSize({ width: 1440, height: 900 });
    await signIn(desktop.page);
    await desktop.page.goto(reviewUrl());
    await desktop.page.locator('app-frame-viewer canvas').waitFor();
    expect(await desktop.page.getByRole('button', { name: 'Keyboard shortcuts' }).isVisible()).toBe(true);
    expect(await visibleKeys(desktop.page)).toEqual(expect.arrayContaining(['S', '1']));
    await desktop.page.screenshot({ path: path.join(SCREENSHOTS, 'review-keys-1440x900.png') });
    expect(desktop.problems).toEqual([]);
    await desktop.context.close();

    // A phone: touch, no hovering pointer (hover: none, pointer: coarse).
    const context = await h.browser.newContext({
      viewport: { width: 390, height: 844 },
      isMobile: true,
      hasTouch: true,
      deviceScaleFactor: 3,
    });
    const page = await context.newPage();
    const problems: string[] = [];
    page.on('pageerror', (e) => problems.push(e.message));
    await signIn(page);
    await page.goto(reviewUrl());
    await page.locator('app-frame-viewer canvas').waitFor();
    await expect.poll(() => page.locator('.frame-no').textContent()).toContain('Frame');
    expect(await page.getByRole('button', { name: 'Keyboard shortcuts' }).isVisible()).toBe(false);
    expect(await visibleKeys(page)).toEqual([]);
    expect(await page.locator('.key-hint').evaluateAll((els) => els.filter((e) => e.getBoundingClientRect().width > 0).length)).toBe(0);
    // The sentences the badges sat in still read whole.
    expect(await page.locator('app-landmarks-panel').textContent()).not.toContain('()');
    await page.screenshot({ path: path.join(SCREENSHOTS, 'review-keys-390x844-touch.png') });
    expect(problems).toEqual([]);
    await context.close();
  });
});
