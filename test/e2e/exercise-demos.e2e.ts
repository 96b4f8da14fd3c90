/**
 * Exercise demonstrations in Debian chromium: the coach adds two pictures (our own drawings of the
 * exercise's key positions) and a short clip (the same drawings, made into a video with Debian's
 * ffmpeg) to an exercise of the demo athlete's running plan, captions them and sees them on the
 * library card; the athlete on a phone (390×844, touch) sees them in today's session above the
 * dose and swipes to the second picture and to the clip, which plays inline, muted and looping.
 * The clinic's logo, set by the owner, shows in the portal's header. Screenshots land in
 * test-results/screenshots.
 */
import { execFileSync } from 'node:child_process';
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
  // 4 s: each key position held 2 s.
  execFileSync('ffmpeg', [
    ...['-hide_banner', '-loglevel', 'error', '-framerate', '0.5', '-i', path.join(dir, 'position-%d.png')],
    ...['-vf', 'fps=25,scale=trunc(iw/2)*2:trunc(ih/2)*2,format=yuv420p', '-c:v', 'libx264', '-preset', 'ultrafast'],
    path.join(dir, 'clip.mp4'),
  ]);
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

  it('the coach adds two pictures and a clip to an exercise, captions them, and sees them on the library card', async () => {
    const { context, page, problems } = await h.newPage();
    await page.setViewportSize(DESKTOP);
    await h.signIn(page, coach.email, coach.password);
    await page.goto(`${h.baseUrl}/exercises`);
    await page.getByRole('button', { name: `Pictures of ${EXERCISE}` }).click();
    const dialog = page.getByRole('dialog');
    // No pictures yet: the dialog says so and how to add them, at both sizes.
    await dialog.getByText('No pictures yet').waitFor();
    await page.screenshot({ path: shot('demos-editor-empty-1440.png') });
    await page.setViewportSize(PHONE);
    await page.waitForTimeout(300);
    await page.screenshot({ path: shot('demos-editor-empty-390.png') });
    await page.setViewportSize(DESKTOP);
    await dialog.locator('input[type=file][multiple]').setInputFiles([path.join(dir, 'position-1.png'), path.join(dir, 'position-2.png')]);
    const pictures = dialog.getByRole('list', { name: 'Pictures in order' }).getByRole('listitem');
    await expect.poll(() => pictures.count(), { timeout: 60_000 }).toBe(2);
    const caption = dialog.getByLabel('Caption 1');
    await caption.fill('Hold the thigh upright, knee bent');
    await caption.press('Enter');
    await expect.poll(() => dialog.getByRole('img', { name: 'Hold the thigh upright, knee bent' }).count()).toBe(1);
    await dialog.getByLabel('Caption 2').fill('Straighten the knee slowly');
    await dialog.getByLabel('Caption 2').press('Enter');
    await expect.poll(() => dialog.getByRole('img', { name: 'Straighten the knee slowly' }).count()).toBe(1);
    // The clip: uploaded, made ready for phones on the server (progress shown), then playable here.
    await dialog.locator('app-demo-clip-editor input[type=file]').setInputFiles(path.join(dir, 'clip.mp4'));
    const clip = dialog.locator('app-demo-clip-editor video');
    await expect.poll(() => clip.count(), { timeout: 90_000 }).toBe(1);
    await dialog.getByLabel('Clip caption').fill('Lift and straighten, two seconds each');
    await dialog.getByLabel('Clip caption').press('Enter');
    await expect.poll(() => clip.getAttribute('aria-label')).toBe('Lift and straighten, two seconds each');
    await expect.poll(() => clip.evaluate((v: HTMLVideoElement) => v.readyState >= 2), { timeout: 20_000 }).toBe(true);
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
    expect(await track.getAttribute('aria-label')).toBe('Picture 1 of 3');
    await page.screenshot({ path: shot('demos-portal-390-first.png') });

    // A touch swipe from right to left across the picture: finger down, moved in steps, lifted.
    const cdp = await context.newCDPSession(page);
    const swipe = async () => {
      const box = (await track.boundingBox())!;
      const y = Math.round(box.y + box.height / 2);
      const from = Math.round(box.x + box.width * 0.85);
      const to = Math.round(box.x + box.width * 0.15);
      await cdp.send('Input.dispatchTouchEvent', { type: 'touchStart', touchPoints: [{ x: from, y }] });
      for (let i = 1; i <= 12; i++) {
        await cdp.send('Input.dispatchTouchEvent', {
          type: 'touchMove',
          touchPoints: [{ x: Math.round(from + ((to - from) * i) / 12), y }],
        });
        await page.waitForTimeout(16);
      }
      await cdp.send('Input.dispatchTouchEvent', { type: 'touchEnd', touchPoints: [] });
    };
    await swipe();
    await expect.poll(() => track.getAttribute('aria-label'), { timeout: 10_000 }).toBe('Picture 2 of 3');
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

    // The clip, after the pictures: inline, muted, looping, playing without a tap.
    await swipe();
    await expect.poll(() => track.getAttribute('aria-label'), { timeout: 10_000 }).toBe('Clip 3 of 3');
    const video = gallery.locator('video');
    expect(await video.evaluate((v: HTMLVideoElement) => ({ muted: v.muted, loop: v.loop, inline: v.playsInline }))).toEqual({
      muted: true,
      loop: true,
      inline: true,
    });
    expect(await video.getAttribute('poster')).toMatch(/^\/api\/demo-clips\/\d+\/poster\.jpg\?v=1$/);
    await expect.poll(() => video.evaluate((v: HTMLVideoElement) => v.readyState >= 2 && v.videoWidth > 0), { timeout: 20_000 }).toBe(true);
    await expect.poll(() => video.evaluate((v: HTMLVideoElement) => !v.paused && v.currentTime > 0), { timeout: 20_000 }).toBe(true);
    await page.screenshot({ path: shot('demos-portal-390-clip.png') });
    // The clinic's logo in the portal's header.
    expect(await page.locator('.top-bar img.clinic-logo').count()).toBe(1);
    expect(problems).toEqual([]);
    await context.close();
  }, 120_000);
});
