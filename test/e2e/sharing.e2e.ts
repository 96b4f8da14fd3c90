/**
 * Sharing in Debian chromium: two synthetic runner clips (a test fixture with known joint angles —
 * not a published source; ~4° and ~11° hip extension at toe-off) marked through the API on the
 * Baseline and the Re-test. The coach (1440×900) sees the hip change beyond measurement error on
 * the Re-test comparison ([calc] half of Damsted et al. 2015's 11° hip width = 5.5°), saves a still
 * of the pair there and one from the review workspace (K), watches them render on the athlete's
 * Shared tab, publishes both and a visit summary. The athlete, on a 390×844 phone, sees both stills
 * on the portal home, enlarges one and swipes to the next, and opens the PDF; the notice e-mail
 * arrived and carries no caption and no measures.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { SCREENSHOTS, startHarness, type Harness } from './harness';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { tempDir } from '../server/media/fixtures';
import { canvasDrawn, markDemoVisits } from './marked-clip';

const [, coach, , athlete] = DEMO_SIGN_INS;
const DESKTOP = { width: 1440, height: 900 };
const PHONE = { width: 390, height: 844 };
const PAIR_CAPTION = 'Your hip now extends further behind you as your foot leaves the ground.';
const FRAME_CAPTION = 'Re-test: knee and ankle as the foot leaves the ground.';
const shot = (name: string) => path.join(SCREENSHOTS, name);

let h: Harness;
let dir: { dir: string; cleanup: () => Promise<void> };
let athleteId = 0;
let retest = { assessmentId: 0, clipId: 0 };

beforeAll(async () => {
  h = await startHarness();
  dir = await tempDir('e2e-sharing');
  const marked = await markDemoVisits(h, dir.dir);
  athleteId = marked.athleteId;
  retest = marked.retest;
}, 240_000);
afterAll(async () => {
  await h?.close();
  await dir?.cleanup();
});

const signIn = (page: Page, email: string, password: string) => h.signIn(page, email, password);

const drawn = canvasDrawn;

/** Confirms the publish question (it must say the athlete gets an e-mail notice). */
async function confirmPublish(page: Page): Promise<void> {
  const dialog = page.getByRole('dialog');
  try {
    await expect.poll(() => dialog.textContent(), { timeout: 8000 }).toContain('e-mail notice');
  } catch (e) {
    await page.screenshot({ path: shot('sharing-publish-failed.png'), fullPage: true });
    throw e;
  }
  await dialog.getByRole('button', { name: 'Publish and notify' }).click();
  await expect.poll(() => page.getByRole('dialog').count()).toBe(0);
}

describe('sharing stills and a visit summary', () => {
  it('coach saves two stills, publishes them and a visit summary; the athlete sees them on a phone', async () => {
    // ── Coach, desktop ──
    const coachContext = await h.browser.newContext({ viewport: DESKTOP });
    const page = await coachContext.newPage();
    const problems: string[] = [];
    page.on('console', (m) => m.type() === 'error' && problems.push(m.text()));
    page.on('pageerror', (e) => problems.push(e.message));
    await signIn(page, coach.email, coach.password);

    await page.goto(`${h.baseUrl}/athletes/${athleteId}/compare`);
    const hipRow = page.locator('tr', { hasText: 'Hip extension at toe-off (thigh from vertical, right)' });
    await expect.poll(() => hipRow.textContent(), { timeout: 20_000 }).toContain('Beyond measurement error');
    await expect.poll(() => drawn(page, 'canvas[aria-label="Re-test frame with skeleton"]'), { timeout: 20_000 }).toBe(true);
    await expect.poll(() => drawn(page, 'canvas[aria-label="Baseline frame with skeleton"]'), { timeout: 20_000 }).toBe(true);
    await page.getByRole('button', { name: 'Save still of the pair' }).click();
    const saveDialog = page.getByRole('dialog', { name: 'Save still' });
    await saveDialog.getByLabel('Caption').fill('x'.repeat(285));
    await expect.poll(() => saveDialog.getByRole('alert').textContent()).toContain('5 characters over the limit of 280');
    expect(await saveDialog.getByRole('button', { name: 'Save still' }).isDisabled()).toBe(true);
    await saveDialog.getByLabel('Caption').fill(PAIR_CAPTION);
    await page.screenshot({ path: shot('sharing-save-pair-dialog.png') });
    await saveDialog.getByRole('button', { name: 'Save still' }).click();
    await expect.poll(() => page.getByText('Still saved — rendering…').count()).toBe(1);

    // From the review workspace: a few frames on, then K.
    await page.goto(`${h.baseUrl}/athletes/${athleteId}/assessments/${retest.assessmentId}/clips/${retest.clipId}/review`);
    await expect.poll(() => page.getByText(/^Frame \d+ \/ \d+/).count(), { timeout: 20_000 }).toBe(1);
    await page.locator('body').click({ position: { x: 5, y: 5 } });
    for (let i = 0; i < 5; i++) await page.keyboard.press('ArrowRight');
    await page.keyboard.press('k');
    const reviewDialog = page.getByRole('dialog', { name: 'Save still' });
    await expect.poll(() => reviewDialog.textContent()).toContain('Frame 5');
    await reviewDialog.getByLabel('Caption').fill(FRAME_CAPTION);
    await page.screenshot({ path: shot('sharing-review-save-still.png') });
    await reviewDialog.getByRole('button', { name: 'Save still' }).click();
    // The newest still is shown mid-render (the real render is quicker than a screenshot) in every
    // answer about it until the page is opened again for the real ones: the tab reloads its list when
    // its progress stream connects while a still shows rendering, and asks for a still again when
    // the stream says its render ended (either can come first on a loaded machine).
    let fakedId: number | null = null;
    const rendering = (s: { id: number }) => (s.id === fakedId ? { ...s, status: 'rendering', progress: 0.45 } : s);
    await page.route('**/api/athletes/*/stills', async (route) => {
      const res = await route.fetch();
      const list = (await res.json()) as { id: number }[];
      fakedId ??= list[0]?.id ?? null;
      await route.fulfill({ response: res, json: list.map(rendering) });
    });
    await page.route('**/api/stills/*', async (route) => {
      if (route.request().method() !== 'GET') return route.fallback();
      const res = await route.fetch();
      if (!res.ok()) return route.fulfill({ response: res });
      await route.fulfill({ response: res, json: rendering((await res.json()) as { id: number }) });
    });
    await page.getByRole('button', { name: 'View shared items' }).click();
    await page.waitForURL(/tab=shared/);
    await expect.poll(() => page.getByText('Rendering… 45 %').count()).toBe(1);
    await page.screenshot({ path: shot('sharing-shared-tab-rendering.png') });

    // Shared tab: both render, then publish them.
    // (The demo seed may have shared stills of its own: only ours are looked at.)
    await page.unroute('**/api/athletes/*/stills');
    await page.unroute('**/api/stills/*');
    await page.reload();
    await expect.poll(() => page.getByText('Rendering… 45 %').count(), { timeout: 10_000 }).toBe(0);
    const ours = page.locator('li.still-card').filter({ hasText: /hip now extends|knee and ankle as the foot/ });
    await expect.poll(() => ours.count(), { timeout: 20_000 }).toBe(2);
    await expect.poll(() => ours.locator('img').count(), { timeout: 30_000 }).toBe(2);
    await expect
      .poll(
        () =>
          ours
            .locator('img')
            .evaluateAll((imgs) => imgs.every((i) => (i as HTMLImageElement).complete && (i as HTMLImageElement).naturalWidth > 0)),
        { timeout: 20_000 },
      )
      .toBe(true);
    expect(await page.locator(`li.still-card img[alt="${PAIR_CAPTION}"]`).count()).toBe(1);
    expect(await ours.filter({ hasText: 'Side by side' }).count()).toBe(1);
    // The kind chip sits in the picture's top end corner, clear of the still's own line at its top start.
    const chipGap = await ours
      .first()
      .locator('.kind-chip')
      .evaluate((c) => c.parentElement!.getBoundingClientRect().right - c.getBoundingClientRect().right);
    expect(chipGap).toBeLessThanOrEqual(12);
    await page.screenshot({ path: shot('sharing-shared-tab-stills.png'), fullPage: true });
    for (let i = 0; i < 2; i++) {
      const card = ours.nth(i);
      await card.getByRole('button', { name: 'Publish still', exact: true }).click();
      await confirmPublish(page);
      await expect.poll(() => card.getByRole('button', { name: 'Unpublish still', exact: true }).count()).toBe(1);
    }

    // A visit summary of the Re-test against the Baseline with both stills.
    await page.getByRole('button', { name: 'New visit summary' }).click();
    const summaryDialog = page.getByRole('dialog', { name: 'New visit summary' });
    const ourBoxes = summaryDialog
      .locator('li')
      .filter({ hasText: /hip now extends|knee and ankle as the foot/ })
      .getByRole('checkbox');
    await expect.poll(() => ourBoxes.count(), { timeout: 10_000 }).toBe(2);
    for (const box of await ourBoxes.all()) await box.check();
    await summaryDialog.getByLabel('Findings').fill('Your hip extends about seven degrees more at toe-off than at the Baseline.');
    await summaryDialog
      .getByLabel('Plan, in plain words')
      .fill('Keep the hip-flexor stretch and the A-skips twice a week; we look again in six weeks.');
    await page.screenshot({ path: shot('sharing-summary-dialog.png') });
    await summaryDialog.getByRole('button', { name: 'Create visit summary' }).click();
    await expect.poll(() => page.getByRole('dialog').count()).toBe(0);
    const summaryRow = page.locator('li.summary-row').first();
    await expect.poll(() => summaryRow.textContent(), { timeout: 60_000 }).toMatch(/\d+ pages? · not published/);
    await summaryRow.getByRole('button', { name: 'Publish visit summary', exact: true }).click();
    await confirmPublish(page);
    await expect.poll(() => summaryRow.textContent()).toContain('· published');
    await page.screenshot({ path: shot('sharing-shared-tab.png'), fullPage: true });
    expect(problems).toEqual([]);
    await coachContext.close();

    // ── The notice e-mails: present, no caption, no measures ──
    const mails = await h.server.db('mailbox_messages').where('to_address', 'like', `%${athlete.email}%`).orderBy('id');
    const notices = mails.filter((m) => /shared something/.test(m.subject));
    expect(notices.length).toBeGreaterThanOrEqual(3);
    for (const m of notices) {
      const all = `${m.subject}\n${m.text}\n${m.html ?? ''}`;
      expect(all).not.toContain('hip now extends');
      expect(all).not.toContain('knee and ankle');
      expect(all).not.toMatch(/\d\s*°|degrees|Hip extension/i);
      expect(all).toContain('/portal');
    }

    // ── Athlete, phone ──
    const phone = await h.browser.newContext({ viewport: PHONE, isMobile: true, hasTouch: true, deviceScaleFactor: 2 });
    const p = await phone.newPage();
    const athleteProblems: string[] = [];
    p.on('console', (m) => m.type() === 'error' && athleteProblems.push(m.text()));
    p.on('pageerror', (e) => athleteProblems.push(e.message));
    await signIn(p, athlete.email, athlete.password);
    await p.goto(`${h.baseUrl}/portal`);
    const strip = p.getByRole('list', { name: 'Stills, newest first' });
    await expect.poll(() => strip.getByRole('listitem').count(), { timeout: 20_000 }).toBeGreaterThanOrEqual(2);
    await expect
      .poll(
        () =>
          strip
            .locator('img')
            .evaluateAll((imgs) => imgs.every((i) => (i as HTMLImageElement).complete && (i as HTMLImageElement).naturalWidth > 0)),
        { timeout: 20_000 },
      )
      .toBe(true);
    expect(await p.getByText('Your coach’s notes and figures support, and do not replace').count()).toBe(1);
    // The hint under the stills reads for a finger and for a mouse alike.
    expect(await p.getByText('Click or tap a still to enlarge it, then swipe or use the arrows to move between them.').count()).toBe(1);
    await p.getByRole('heading', { name: 'From your clinic' }).scrollIntoViewIfNeeded();
    await p.screenshot({ path: shot('sharing-portal-phone.png'), fullPage: true });

    // Newest first: the review's still, then the pair.
    await strip.getByRole('button').first().click();
    const viewer = p.getByRole('dialog');
    await expect.poll(() => viewer.textContent()).toMatch(/\b1 of \d+/);
    expect(await viewer.textContent()).toContain(FRAME_CAPTION);
    const frame = viewer.locator('.frame');
    const box = (await frame.boundingBox())!;
    const y = box.y + box.height / 2;
    await p.mouse.move(box.x + box.width * 0.8, y);
    await p.mouse.down();
    await p.mouse.move(box.x + box.width * 0.5, y, { steps: 4 });
    await p.mouse.move(box.x + box.width * 0.2, y, { steps: 4 });
    await p.mouse.up();
    await expect.poll(() => viewer.textContent()).toMatch(/\b2 of \d+/);
    expect(await viewer.textContent()).toContain(PAIR_CAPTION);
    await expect.poll(() => viewer.locator('img').evaluate((i: HTMLImageElement) => i.complete && i.naturalWidth > 0)).toBe(true);
    await p.screenshot({ path: shot('sharing-still-viewer-phone.png') });
    // The phone on its side: the still's area keeps most of the height (caption and caution go beside
    // it; stacked, they left it a third), and the still fills that area's height or its width.
    await p.setViewportSize({ width: PHONE.height, height: PHONE.width });
    await expect.poll(async () => (await frame.boundingBox())!.height / PHONE.width, { timeout: 5000 }).toBeGreaterThan(0.6);
    await expect.poll(() => viewer.locator('img').evaluate((i: HTMLImageElement) => i.complete && i.naturalWidth > 0)).toBe(true);
    const area = (await frame.boundingBox())!;
    const still = (await viewer.locator('img').boundingBox())!;
    expect(Math.max(still.height / area.height, still.width / (area.width - 16))).toBeGreaterThan(0.97);
    await p.screenshot({ path: shot('sharing-still-viewer-phone-landscape.png') });
    await p.setViewportSize(PHONE);
    await p.keyboard.press('ArrowLeft');
    await expect.poll(() => viewer.textContent()).toMatch(/\b1 of \d+/);
    await viewer.getByRole('button', { name: 'Close' }).click();
    await expect.poll(() => p.getByRole('dialog').count()).toBe(0);

    const view = p.getByRole('link', { name: /^View .*opens in a new tab/ }).first();
    await expect.poll(() => view.count()).toBe(1);
    const pdfUrl = await view.getAttribute('href');
    const pdf = await p.evaluate(async (url) => {
      const r = await fetch(url!, { credentials: 'same-origin' });
      const bytes = new Uint8Array(await r.arrayBuffer());
      return { status: r.status, type: r.headers.get('content-type'), head: String.fromCharCode(...bytes.slice(0, 5)) };
    }, pdfUrl);
    expect(pdf).toEqual({ status: 200, type: 'application/pdf', head: '%PDF-' });
    const download = await p
      .getByRole('link', { name: /^Download / })
      .first()
      .getAttribute('href');
    expect(download).toBe(`${pdfUrl}?download=1`);
    await p.getByRole('note').filter({ hasText: 'do not replace' }).scrollIntoViewIfNeeded();
    await p.screenshot({ path: shot('sharing-portal-phone-summaries.png') });
    expect(athleteProblems).toEqual([]);
    await phone.close();
  });
});
