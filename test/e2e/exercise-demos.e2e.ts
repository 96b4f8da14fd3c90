/**
 * Exercise demonstrations in Debian chromium: the coach adds two pictures (our own drawings of the
 * exercise's key positions) to an exercise of the demo athlete's running plan, captions one and
 * sees them on the library card; the athlete on a phone (390×844, touch) sees them in today's
 * session above the dose and swipes to the second with a touch gesture. The clinic's logo, set by
 * the owner, shows in the portal's header. Screenshots land in test-results/screenshots.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Jimp } from 'jimp';
import { SCREENSHOTS, startHarness, type Harness } from './harness';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { seedDemoHamstringPlan } from '../../seeds/demo-plans';
import { DEMO_ILLUSTRATIONS } from '../../seeds/demo-illustrations/poses';
import { drawKeyPositions } from '../../seeds/demo-illustrations/seed-pictures';

const [owner, coach, , athlete] = DEMO_SIGN_INS;
const PHONE = { width: 390, height: 844 };
const DESKTOP = { width: 1440, height: 900 };
const EXERCISE = 'Hip-flexed knee extension';
const shot = (name: string) => path.join(SCREENSHOTS, name);

let h: Harness;
let dir: string;

beforeAll(async () => {
  h = await startHarness();
  const ada = await h.server.db('athletes').where({ email: athlete.email }).first();
  await seedDemoHamstringPlan(h.server.db, ada.clinic_id, ada, null);
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'demos-e2e-'));
  drawKeyPositions(DEMO_ILLUSTRATIONS[EXERCISE]!).forEach((png, i) => fs.writeFileSync(path.join(dir, `position-${i + 1}.png`), png));
  const logo = new Jimp({ width: 480, height: 160, color: 0x00000000 });
  for (let y = 30; y < 130; y++) for (let x = 20; x < 460; x++) if ((x - 20) % 120 < 90) logo.setPixelColor(0x1f5a4aff, x, y);
  fs.writeFileSync(path.join(dir, 'logo.png'), await logo.getBuffer('image/png'));
}, 240_000);
afterAll(async () => {
  await h?.close();
  if (dir) fs.rmSync(dir, { recursive: true, force: true });
});

describe('exercise demonstrations', () => {
  it('the owner sets the clinic logo in Clinic details', async () => {
    const { context, page, problems } = await h.newPage();
    await page.setViewportSize(DESKTOP);
    await h.signIn(page, owner.email, owner.password);
    await page.goto(`${h.baseUrl}/settings/clinic`);
    await page.locator('app-logo-card input[type=file]').setInputFiles(path.join(dir, 'logo.png'));
    await expect.poll(() => page.getByRole('img', { name: 'Current logo' }).count(), { timeout: 30_000 }).toBe(1);
    await expect.poll(() => page.locator('.top-bar img.clinic-logo').count()).toBe(1);
    await page.screenshot({ path: shot('demos-clinic-logo-1440.png') });
    expect(problems).toEqual([]);
    await context.close();
  }, 90_000);

  it('the coach adds two pictures to an exercise, captions one, and sees them on the library card', async () => {
    const { context, page, problems } = await h.newPage();
    await page.setViewportSize(DESKTOP);
    await h.signIn(page, coach.email, coach.password);
    await page.goto(`${h.baseUrl}/exercises`);
    await page.getByRole('button', { name: `Pictures of ${EXERCISE}` }).click();
    const dialog = page.getByRole('dialog');
    await dialog.locator('input[type=file]').setInputFiles([path.join(dir, 'position-1.png'), path.join(dir, 'position-2.png')]);
    const pictures = dialog.getByRole('list', { name: 'Pictures in order' }).getByRole('listitem');
    await expect.poll(() => pictures.count(), { timeout: 60_000 }).toBe(2);
    const caption = dialog.getByLabel('Caption 1');
    await caption.fill('Hold the thigh upright, knee bent');
    await caption.press('Enter');
    await expect.poll(() => dialog.getByRole('img', { name: 'Hold the thigh upright, knee bent' }).count()).toBe(1);
    await dialog.getByLabel('Caption 2').fill('Straighten the knee slowly');
    await dialog.getByLabel('Caption 2').press('Enter');
    await expect.poll(() => dialog.getByRole('img', { name: 'Straighten the knee slowly' }).count()).toBe(1);
    await page.screenshot({ path: shot('demos-editor-1440.png') });
    await dialog.getByRole('button', { name: 'Done' }).click();
    const card = page.getByRole('region', { name: `How ${EXERCISE} looks` });
    await expect.poll(() => card.count()).toBe(1);
    await card.scrollIntoViewIfNeeded();
    await page.screenshot({ path: shot('demos-library-1440.png') });
    expect(problems).toEqual([]);
    await context.close();
  }, 120_000);

  it('the athlete on a phone sees them in today’s session above the dose and swipes to the second', async () => {
    const context = await h.browser.newContext({ viewport: PHONE, hasTouch: true, isMobile: true, deviceScaleFactor: 2 });
    const page = await context.newPage();
    const problems: string[] = [];
    page.on('pageerror', (e) => problems.push(e.message));
    await h.signIn(page, athlete.email, athlete.password);
    await page.goto(`${h.baseUrl}/portal/plan`);
    const gallery = page.getByRole('region', { name: `How ${EXERCISE} looks` });
    await expect.poll(() => gallery.count(), { timeout: 30_000 }).toBe(1);
    await gallery.scrollIntoViewIfNeeded();
    const track = gallery.locator('.track');
    // The first picture has loaded and stands above the dose.
    await expect
      .poll(() =>
        gallery
          .locator('img')
          .first()
          .evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth > 0),
      )
      .toBe(true);
    const galleryBox = (await gallery.boundingBox())!;
    const doseBox = (await page.locator('app-exercise-card', { has: gallery }).getByLabel('Dose').boundingBox())!;
    expect(galleryBox.y + galleryBox.height).toBeLessThanOrEqual(doseBox.y + 1);
    expect(galleryBox.width).toBeGreaterThan(300);
    expect(await track.getAttribute('aria-label')).toBe('Picture 1 of 2');
    await page.screenshot({ path: shot('demos-portal-390-first.png') });

    // A touch swipe from right to left across the picture: finger down, moved in steps, lifted.
    const cdp = await context.newCDPSession(page);
    const box = (await track.boundingBox())!;
    const y = Math.round(box.y + box.height / 2);
    const from = Math.round(box.x + box.width * 0.85);
    const to = Math.round(box.x + box.width * 0.15);
    await cdp.send('Input.dispatchTouchEvent', { type: 'touchStart', touchPoints: [{ x: from, y }] });
    for (let i = 1; i <= 12; i++) {
      await cdp.send('Input.dispatchTouchEvent', { type: 'touchMove', touchPoints: [{ x: Math.round(from + ((to - from) * i) / 12), y }] });
      await page.waitForTimeout(16);
    }
    await cdp.send('Input.dispatchTouchEvent', { type: 'touchEnd', touchPoints: [] });
    await expect.poll(() => track.getAttribute('aria-label'), { timeout: 10_000 }).toBe('Picture 2 of 2');
    await expect.poll(() => track.evaluate((el) => Math.round(el.scrollLeft / el.clientWidth))).toBe(1);
    await expect
      .poll(() =>
        gallery
          .locator('img')
          .nth(1)
          .evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth > 0),
      )
      .toBe(true);
    await page.screenshot({ path: shot('demos-portal-390-second.png') });
    // The clinic's logo in the portal's header.
    expect(await page.locator('.top-bar img.clinic-logo').count()).toBe(1);
    expect(problems).toEqual([]);
    await context.close();
  }, 120_000);
});
