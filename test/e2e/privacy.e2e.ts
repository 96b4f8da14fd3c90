/**
 * Athlete data in Debian chromium: the owner's Data tab on the athlete page (export with progress
 * and a download, the prompt to erase clips after consent to video is withdrawn, erasure confirmed
 * by typing the full name), the athlete's "Your data" in the portal profile on a phone, and the clip
 * retention card in clinic settings (the due list with sizes, Confirm). Screenshots at 1440×900 and
 * 390×844.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { axeProblems } from './axe';
import { SCREENSHOTS, startHarness, type Harness } from './harness';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';

const [owner, , , athlete] = DEMO_SIGN_INS;
const PHONE = { width: 390, height: 844 };
const DESKTOP = { width: 1440, height: 900 };
const shot = (name: string) => path.join(SCREENSHOTS, name);

let h: Harness;
let adaId = 0;

beforeAll(async () => {
  h = await startHarness();
  adaId = (await h.server.db('athletes').where({ email: athlete.email }).first()).id;
});
afterAll(async () => {
  await h?.close();
});

/** A clip row (no files) for an athlete's first visit, as if uploaded at `at`. */
async function clipRow(athleteId: number, assessmentId: number, at: string, name: string, size: number): Promise<void> {
  await h.server.db('clips').insert({
    clinic_id: 1,
    athlete_id: athleteId,
    assessment_id: assessmentId,
    original_name: name,
    stored_name: 'original.mp4',
    size_bytes: size,
    container: 'mp4',
    status: 'failed',
    error: 'not processed (browser test)',
    created_at: at,
    updated_at: at,
  });
}

/** A full-page phone screenshot. */
async function phoneShot(page: Page, name: string): Promise<void> {
  await page.setViewportSize(PHONE);
  await page.waitForTimeout(800);
  await page.screenshot({ path: shot(name), fullPage: true });
}

describe('athlete data', () => {
  it("the owner exports an athlete's data from the Data tab and downloads the zip", async () => {
    const { page, problems } = await h.newPage();
    await page.setViewportSize(DESKTOP);
    await h.signIn(page, owner.email, owner.password);
    await page.goto(`${h.baseUrl}/athletes/${adaId}?tab=data`);
    await page.getByRole('heading', { name: 'Erase athlete' }).waitFor();
    await page.getByRole('button', { name: 'Prepare export' }).click();
    const link = page.getByRole('link', { name: 'Download zip' });
    await link.waitFor({ timeout: 60_000 });
    await expect.poll(() => page.getByText(/The link works until/).count()).toBe(1);
    const [download] = await Promise.all([page.waitForEvent('download'), link.click()]);
    expect(download.suggestedFilename()).toMatch(/^trailframe-data-\d+-\d{4}-\d{2}-\d{2}\.zip$/);
    await page.screenshot({ path: shot('privacy-data-tab-desktop.png'), fullPage: true });
    expect(await axeProblems(page)).toEqual([]);
    await phoneShot(page, 'privacy-data-tab-phone.png');
    expect(problems).toEqual([]);
  }, 120_000);

  it('after consent to video is withdrawn the owner is asked, and erases the clips only', async () => {
    const visit = await h.server.db('assessments').where({ athlete_id: adaId }).orderBy('id').first();
    await clipRow(adaId, visit.id, new Date().toISOString(), 'treadmill-side.mp4', 48_000_000);
    await h.server.db('consents').insert({
      clinic_id: 1,
      athlete_id: adaId,
      kind: 'video_recording',
      granted: false,
      recorded_at: new Date().toISOString(),
    });
    const { page } = await h.newPage();
    await page.setViewportSize(DESKTOP);
    await h.signIn(page, owner.email, owner.password);
    await page.goto(`${h.baseUrl}/athletes/${adaId}?tab=data`);
    await page.getByRole('heading', { name: /Consent to video withdrawn/ }).waitFor();
    await page.screenshot({ path: shot('privacy-video-withdrawn-desktop.png') });
    await phoneShot(page, 'privacy-video-withdrawn-phone.png');
    await page.setViewportSize(DESKTOP);
    await page.getByRole('button', { name: 'Erase clips only' }).click();
    await page.getByRole('button', { name: 'Erase clips', exact: true }).click();
    await page.getByText(/clips? erased/).waitFor();
    await expect.poll(() => page.getByRole('heading', { name: /Consent to video withdrawn/ }).count()).toBe(0);
    expect(await h.server.db('clips').where({ athlete_id: adaId }).count('* as n')).toEqual([{ n: 0 }]);
  }, 60_000);

  it('erasure asks for the full name, refuses another, and takes the athlete off the roster', async () => {
    const teodor = await h.server.db('athletes').where({ email: 'teodor.brannick@runner.test' }).first();
    const { page } = await h.newPage();
    await page.setViewportSize(DESKTOP);
    await h.signIn(page, owner.email, owner.password);
    await page.goto(`${h.baseUrl}/athletes/${teodor.id}?tab=data`);
    await page.getByRole('button', { name: 'Erase athlete…' }).click();
    const dialog = page.getByRole('dialog');
    await dialog.getByLabel(/to confirm/).fill('Teodor Brannik');
    await dialog.getByRole('button', { name: 'Erase for good' }).click();
    await dialog.getByRole('alert').waitFor();
    expect(await dialog.getByRole('alert').textContent()).toMatch(/Type “Teodor Brannick” to confirm/);
    await page.screenshot({ path: shot('privacy-erase-dialog-desktop.png') });
    expect(await axeProblems(page, 'mat-dialog-container')).toEqual([]);
    await page.setViewportSize(PHONE);
    await page.waitForTimeout(500);
    await page.screenshot({ path: shot('privacy-erase-dialog-phone.png') });
    await page.setViewportSize(DESKTOP);
    await dialog.getByLabel(/to confirm/).fill('Teodor Brannick');
    await dialog.getByRole('button', { name: 'Erase for good' }).click();
    await page.waitForURL(/\/athletes$/);
    await page.getByText(/Teodor Brannick was erased/).waitFor();
    expect(await page.getByText('Brannick', { exact: false }).count()).toBeLessThanOrEqual(1); // only the snack bar
  }, 60_000);

  it('the athlete prepares and downloads their data from the portal profile on a phone', async () => {
    const { page, problems } = await h.newPage();
    await page.setViewportSize(PHONE);
    await h.signIn(page, athlete.email, athlete.password);
    await page.goto(`${h.baseUrl}/portal/profile`);
    await page.getByRole('heading', { name: 'Your data' }).waitFor();
    await page.getByRole('button', { name: 'Prepare export' }).click();
    await page.getByRole('link', { name: 'Download zip' }).first().waitFor({ timeout: 60_000 });
    await page.getByRole('heading', { name: 'Your data' }).scrollIntoViewIfNeeded();
    await page.screenshot({ path: shot('privacy-portal-your-data-phone.png') });
    await page.setViewportSize(DESKTOP);
    await page.waitForTimeout(500);
    await page.getByRole('heading', { name: 'Your data' }).scrollIntoViewIfNeeded();
    await page.screenshot({ path: shot('privacy-portal-your-data-desktop.png') });
    expect(problems).toEqual([]);
  }, 90_000);

  it('clip retention: the owner sets months, checks, sees the due clips with sizes and confirms', async () => {
    const long = '2024-01-10T09:00:00.000Z';
    const [a] = await h.server
      .db('athletes')
      .insert({ clinic_id: 1, first_name: 'Wren', last_name: 'Ostby', created_at: long, updated_at: long })
      .returning('id');
    const wren = (a as { id: number }).id;
    const [v] = await h.server
      .db('assessments')
      .insert({
        clinic_id: 1,
        athlete_id: wren,
        date: '2024-01-10',
        kind: 'baseline',
        surface: 'track',
        created_at: long,
        updated_at: long,
      })
      .returning('id');
    await clipRow(wren, (v as { id: number }).id, long, 'track-lap-side.mp4', 212_400_000);
    await clipRow(wren, (v as { id: number }).id, long, 'track-lap-front.mov', 96_100_000);

    const { page, problems } = await h.newPage();
    await page.setViewportSize(DESKTOP);
    await h.signIn(page, owner.email, owner.password);
    await page.goto(`${h.baseUrl}/settings/clinic`);
    await page.getByRole('heading', { name: 'Clip retention' }).waitFor();
    await page.getByLabel('Months without activity').fill('24');
    await page.getByRole('button', { name: 'Save', exact: true }).click();
    await page.getByRole('button', { name: 'Check now' }).click();
    await page.getByRole('heading', { name: /Due for removal/ }).waitFor();
    const rows = page.locator('table.due tbody tr');
    await expect.poll(() => rows.count()).toBe(2);
    expect(await rows.first().textContent()).toContain('Wren Ostby');
    expect(await page.locator('.row strong').textContent()).toMatch(/2 clips\s·\s309 MB/); // 212.4 + 96.1 = 308.5 MB, shown to 3 significant figures [calc]
    const snack = page.locator('mat-snack-bar-container');
    if (await snack.count()) await snack.getByRole('button').click();
    await expect.poll(() => snack.count()).toBe(0);
    await page.getByRole('button', { name: 'Confirm removal' }).scrollIntoViewIfNeeded();
    await page.screenshot({ path: shot('privacy-retention-desktop.png') });
    expect(await axeProblems(page)).toEqual([]);
    await phoneShot(page, 'privacy-retention-phone.png');
    await page.setViewportSize(DESKTOP);
    await page.getByRole('button', { name: 'Confirm removal' }).click();
    await page.getByRole('button', { name: 'Remove clips' }).click();
    await page.getByText(/2 clips\s+removed/).waitFor();
    expect(await h.server.db('clips').where({ athlete_id: wren }).count('* as n')).toEqual([{ n: 0 }]);
    expect(problems).toEqual([]);
  }, 90_000);
});
