/**
 * Touch targets on touch screens: every control a finger meets on the athlete's screens on a phone
 * (390×844, touch) and on the coach's screens on a tablet (1024×768, touch) offers at least 44×44 CSS
 * px (WCAG 2.2 success criterion 2.5.5, Target Size (Enhanced)). A control's box counts Material's own
 * touch-target layer (buttons, checkboxes, radios) and, for a text field, the field it sits in. Links
 * inside running text are exempt, as WCAG 2.5.8 exempts them ("Inline: the target is in a sentence or
 * its size is otherwise constrained by the line-height of non-target text"). The coach on the tablet
 * also places landmarks with taps and steps frames with the transport buttons and the frame slider.
 */
import fs from 'node:fs';
import path from 'node:path';
import { spawnSync } from 'node:child_process';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { SCREENSHOTS, startHarness, type Harness } from './harness';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { seedDemoHamstringPlan } from '../../seeds/demo-plans';
import { Client } from '../support/test-app';
import { makeClip, tempDir } from '../server/media/fixtures';
import { uploadReadyClip } from './marked-clip';

const [, coach, , athlete] = DEMO_SIGN_INS;
const PHONE = { width: 390, height: 844 };
const TABLET = { width: 1024, height: 768 };
const MIN_PX = 44;

let h: Harness;
let dir: { dir: string; cleanup: () => Promise<void> };
let adaId = 0;
let retestId = 0;
let clipId = 0;

beforeAll(async () => {
  h = await startHarness();
  dir = await tempDir('e2e-touch-targets');
  const ada = await h.server.db('athletes').where({ email: athlete.email }).first();
  adaId = ada.id;
  retestId = (await h.server.db('assessments').where({ athlete_id: ada.id, kind: 'retest' }).first()).id;
  await seedDemoHamstringPlan(h.server.db, ada.clinic_id, ada, retestId);
  const file = await makeClip(path.join(dir.dir, 'side.mp4'), { fps: 30, width: 640, height: 360, seconds: 1 });
  const api = new Client(h.baseUrl);
  await api.signIn(coach.email, coach.password);
  clipId = await uploadReadyClip(api, retestId, file);
}, 240_000);
afterAll(async () => {
  await h?.close();
  await dir?.cleanup();
});

/** A touch screen of the given size (coarse pointer, no hover), signed in as `who`. */
async function touchPage(browser: Browser, size: { width: number; height: number }, who: { email: string; password: string }) {
  const context = await browser.newContext({ viewport: size, isMobile: true, hasTouch: true });
  const page = await context.newPage();
  const problems: string[] = [];
  page.on('pageerror', (e) => problems.push(e.message));
  await h.signIn(page, who.email, who.password);
  return { context, page, problems };
}

/**
 * The interactive elements of the page smaller than `min` px either way, as "name w×h" lines.
 * Skipped: elements not rendered, hidden from everyone (aria-hidden, visibility), and inline
 * links in running text (WCAG 2.5.8 inline exception).
 */
function smallTargets(page: Page, min = MIN_PX): Promise<string[]> {
  return page.evaluate(`(() => {
    const min = ${min};
    const selector = 'a[href], button, input:not([type=hidden]), select, textarea, summary, mat-select, [role=button], [role=link], [role=tab], [role=radio], [role=checkbox], [role=switch], [role=slider], [role=option], [role=menuitem]';
    const found = [];
    for (const el of document.querySelectorAll(selector)) {
      const r = el.getBoundingClientRect();
      if (r.width === 0 || r.height === 0) continue;
      if (el.closest('[aria-hidden="true"]') || getComputedStyle(el).visibility === 'hidden') continue;
      const box = { l: r.left, t: r.top, r: r.right, b: r.bottom };
      const grow = (x) => {
        const q = x.getBoundingClientRect();
        if (!q.width || !q.height) return;
        box.l = Math.min(box.l, q.left); box.t = Math.min(box.t, q.top);
        box.r = Math.max(box.r, q.right); box.b = Math.max(box.b, q.bottom);
      };
      // Material's invisible touch-target layer belongs to the control it sits in or beside.
      el.querySelectorAll('[class*="touch-target"]').forEach(grow);
      el.parentElement?.querySelectorAll(':scope > [class*="touch-target"]').forEach(grow);
      el.closest('.mdc-checkbox, .mdc-radio')?.parentElement?.querySelectorAll(':scope > [class*="touch-target"]').forEach(grow);
      // A text field or select is focused by a tap anywhere on its field.
      const field = el.closest('.mat-mdc-text-field-wrapper');
      if (field) grow(field);
      const w = box.r - box.l, h = box.b - box.t;
      if (w >= min && h >= min) continue;
      // Inline exception: an inline link whose own block holds running text of its own beside it.
      const besideText = [...(el.parentElement?.childNodes ?? [])].some((n) => n.nodeType === 3 && n.textContent.trim().length > 0);
      if (el.tagName === 'A' && getComputedStyle(el).display === 'inline' && besideText) continue;
      const name = (el.getAttribute('aria-label') || el.textContent || el.tagName).trim().replace(/\\s+/g, ' ').slice(0, 40);
      found.push(name + ' ' + Math.round(w) + '×' + Math.round(h));
    }
    return found;
  })()`);
}

/** Scrolls the page's content pane to the top and waits for loads to finish. */
async function settle(page: Page): Promise<void> {
  await expect.poll(() => page.locator('mat-progress-bar[mode="indeterminate"]').count(), { timeout: 15_000 }).toBe(0);
  await page.waitForTimeout(300);
}

describe('touch targets: the athlete on a 390×844 phone', () => {
  it('the sign-in and forgot-password pages', async () => {
    const context = await h.browser.newContext({ viewport: PHONE, isMobile: true, hasTouch: true });
    const page = await context.newPage();
    await page.goto(`${h.baseUrl}/sign-in`);
    await page.getByLabel('E-mail').waitFor();
    expect(await smallTargets(page)).toEqual([]);
    await page.goto(`${h.baseUrl}/forgot-password`);
    await page.getByLabel('E-mail').waitFor();
    expect(await smallTargets(page)).toEqual([]);
    await context.close();
  });

  it('home, assessment, plan, profile, invoices, an invoice and the account menu', async () => {
    const { context, page, problems } = await touchPage(h.browser, PHONE, athlete);
    const invoice = await h.server.db('invoices').where({ athlete_id: adaId }).whereNot({ status: 'draft' }).first();
    const screens: [string, string][] = [
      ['home', '/portal'],
      ['assessment', `/portal/assessments/${retestId}`],
      ['plan', '/portal/plan'],
      ['profile', '/portal/profile'],
      ['invoices', '/portal/invoices'],
      ['invoice', `/portal/invoices/${invoice.id}`],
    ];
    const failures: Record<string, string[]> = {};
    for (const [name, url] of screens) {
      await page.goto(`${h.baseUrl}${url}`);
      await page.locator('main h1').first().waitFor();
      await settle(page);
      const small = await smallTargets(page);
      if (small.length) failures[name] = small;
      // Asked to run and film it, the athlete reads a short caution deferring to their clinician.
      if (name === 'assessment') expect(await page.getByText('Film only running your clinician has cleared you for').count()).toBe(1);
      // "Visit summaries" keeps its space below the stills (the shared clips sit between the two sections).
      if (name === 'home')
        expect(await page.locator('section:has(#portal-summaries-title)').evaluate((s) => getComputedStyle(s).marginBlockStart)).toBe(
          '20px',
        );
    }
    await page.getByRole('button', { name: /^Account menu/ }).tap();
    await page.getByRole('menuitem', { name: 'Sign out' }).waitFor();
    // Measured once the menu has finished growing in.
    await expect
      .poll(() => page.locator('.mat-mdc-menu-panel').evaluate((p) => getComputedStyle(p).transform))
      .toMatch(/^(none|matrix\(1, 0, 0, 1, 0, 0\))$/);
    const menu = await smallTargets(page);
    if (menu.length) failures['account menu'] = menu;
    await page.screenshot({ path: path.join(SCREENSHOTS, 'touch-targets-account-menu-phone.png') });
    expect(failures).toEqual({});
    expect(problems).toEqual([]);
    await context.close();
  });

  it('the demo payment page an invoice opens (its buttons were 42 px tall)', async () => {
    const { context, page, problems } = await touchPage(h.browser, PHONE, athlete);
    const invoice = await h.server.db('invoices').where({ athlete_id: adaId, status: 'issued' }).first();
    await page.goto(`${h.baseUrl}/portal/invoices/${invoice.id}`);
    await page.getByRole('button', { name: /^Pay .* by card/ }).tap();
    await page.waitForURL(/\/pay\/cs_/);
    await page.getByRole('button', { name: 'Pay', exact: true }).waitFor();
    await page.screenshot({ path: path.join(SCREENSHOTS, 'touch-targets-payment-page-phone.png') });
    expect(await smallTargets(page)).toEqual([]);
    expect(problems).toEqual([]);
    await context.close();
  });
});

describe('the coach on a 1024×768 touch tablet', () => {
  it('roster, athlete, assessment, review and comparison offer 44 px targets', async () => {
    const { context, page, problems } = await touchPage(h.browser, TABLET, coach);
    const screens: [string, string, string][] = [
      ['roster', '/athletes', 'main h1'],
      ['athlete', `/athletes/${adaId}`, 'main h1'],
      ['assessment', `/athletes/${adaId}/assessments/${retestId}`, 'main h1'],
      ['review', `/athletes/${adaId}/assessments/${retestId}/clips/${clipId}/review`, 'app-frame-viewer canvas'],
      ['compare', `/athletes/${adaId}/compare`, 'main h1'],
    ];
    const failures: Record<string, string[]> = {};
    for (const [name, url, ready] of screens) {
      await page.goto(`${h.baseUrl}${url}`);
      await page.locator(ready).first().waitFor();
      await settle(page);
      const small = await smallTargets(page);
      if (small.length) failures[name] = small;
      await page.screenshot({ path: path.join(SCREENSHOTS, `touch-targets-${name}-tablet.png`) });
      // A touch screen is offered no list of keyboard keys.
      if (name === 'compare') expect(await page.locator('.key-hint').isVisible()).toBe(false);
    }
    expect(failures).toEqual({});
    expect(problems).toEqual([]);
    await context.close();
  });

  it('places landmarks with taps and steps frames with the transport buttons and the slider, in portrait too', async () => {
    for (const [i, size] of [TABLET, { width: 768, height: 1024 }].entries()) {
      const { context, page, problems } = await touchPage(h.browser, size, coach);
      await page.goto(`${h.baseUrl}/athletes/${adaId}/assessments/${retestId}/clips/${clipId}/review`);
      const canvas = page.locator('app-frame-viewer canvas');
      await canvas.waitFor();
      const frameNo = () => page.locator('.readout .frame-no strong').innerText();
      await page.getByRole('button', { name: 'Last frame' }).tap();
      await expect.poll(frameNo).toBe('29');
      await page.getByRole('button', { name: 'First frame' }).tap();
      await expect.poll(frameNo).toBe('0');
      const box = (await canvas.boundingBox())!;
      const placed = page.locator('app-landmarks-panel').getByText('placed', { exact: true });
      const before = await placed.count();
      // Each size taps its own spots, away from the marks the other placed.
      const x = box.x + box.width * (0.35 + 0.3 * i);
      await page.touchscreen.tap(x, box.y + box.height * 0.3);
      await page.touchscreen.tap(x, box.y + box.height * 0.5);
      await expect.poll(() => placed.count()).toBe(before + 2);
      await page.getByRole('button', { name: 'One frame forward' }).tap();
      await expect.poll(frameNo).toBe('1');
      const slider = (await page.getByRole('slider', { name: 'Frame' }).boundingBox())!;
      await page.touchscreen.tap(slider.x + slider.width / 2, slider.y + slider.height / 2);
      await expect.poll(async () => Number(await frameNo())).toBeGreaterThan(5);
      await page.screenshot({ path: path.join(SCREENSHOTS, `touch-review-${size.width}x${size.height}.png`) });
      expect(problems).toEqual([]);
      await context.close();
    }
  });
});

// The clip's frame count comes from ffprobe, not from the app, so the last frame index above is checked independently.
it('the test clip has 30 frames by ffprobe (last frame index 29)', () => {
  const file = path.join(dir.dir, 'side.mp4');
  expect(fs.existsSync(file)).toBe(true);
  const r = spawnSync('ffprobe', [
    '-v',
    'error',
    '-count_frames',
    '-select_streams',
    'v:0',
    '-show_entries',
    'stream=nb_read_frames',
    '-of',
    'csv=p=0',
    file,
  ]);
  expect(r.stdout.toString().trim()).toBe('30');
});
