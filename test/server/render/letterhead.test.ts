/**
 * The clinic's logo and legal details on a visit summary: the PDF carries exactly one image, with a
 * soft mask (its transparency), as poppler's pdfimages lists it (Debian); the page rendered with
 * pdftoppm shows the logo's colour in the top-right corner and white where it is transparent; the
 * legal line is in the text pdf-parse extracts.
 */
import { execFile } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { loadImage, createCanvas } from '@napi-rs/canvas';
import { Jimp } from 'jimp';
import { PDFParse } from 'pdf-parse';
import { afterAll, describe, expect, it } from 'vitest';
import { processLogo } from '../../../server/pictures/picture-processing';
import { MARGIN } from '../../../server/render/pdf-layout';
import { renderSummaryPdf, SUMMARY_CAUTION, type SummaryDocument } from '../../../server/render/summary-pdf';

const run = promisify(execFile);
const tmp = fs.mkdtempSync(path.join(os.tmpdir(), 'letterhead-'));
const SCREENSHOTS = path.resolve('test-results/screenshots');
afterAll(() => fs.rmSync(tmp, { recursive: true, force: true }));

const doc: SummaryDocument = {
  clinicName: 'Test Clinic',
  athleteName: 'Test Athlete',
  title: 'Visit summary',
  issuedOn: '2 Dec 2026',
  coachName: 'Test Coach',
  visits: [{ label: 'Baseline · 6 Oct 2026', surface: 'Treadmill', speed: 'Not recorded', incline: null, shoes: null }],
  measures: [],
  comparison: null,
  stills: [],
  findings: '',
  planText: '',
  caution: SUMMARY_CAUTION,
};

async function imageList(pdf: Buffer): Promise<string[][]> {
  const file = path.join(tmp, `${Math.random().toString(36).slice(2)}.pdf`);
  fs.writeFileSync(file, pdf);
  const { stdout } = await run('pdfimages', ['-list', file]);
  return stdout
    .split('\n')
    .slice(2)
    .filter((l) => l.trim())
    .map((l) => l.trim().split(/\s+/));
}

describe('visit summary letterhead', () => {
  it('carries the logo as one image with its transparency, top right, and the legal details under the name', async () => {
    const src = new Jimp({ width: 600, height: 200, color: 0x00000000 });
    for (let y = 40; y < 160; y++) for (let x = 40; x < 560; x++) src.setPixelColor(0xe08a1eff, x, y);
    const logo = await processLogo(await src.getBuffer('image/png'));
    const withLogo = await renderSummaryPdf({
      ...doc,
      clinicLogo: { png: logo.bytes, width: logo.width, height: logo.height },
      clinicLegalLines: ['Test Clinic Ltd', '1 Test Road, Testville', 'Tax number TC 42', 'desk@test-clinic.test'],
    });
    const without = await renderSummaryPdf(doc);
    expect(await imageList(without.pdf)).toEqual([]);
    const images = await imageList(withLogo.pdf);
    // pdfimages columns: page num type width height …; the PNG's alpha arrives as an "smask" beside the image.
    expect(images.map((r) => r[2])).toEqual(['image', 'smask']);
    expect(images.every((r) => r[0] === '1')).toBe(true);

    const text = (await new PDFParse({ data: new Uint8Array(withLogo.pdf) }).getText()).text;
    expect(text).toContain('Test Clinic Ltd · 1 Test Road, Testville · Tax number TC 42 · desk@test-clinic.test');

    const file = path.join(tmp, 'letterhead.pdf');
    fs.writeFileSync(file, withLogo.pdf);
    await run('pdftoppm', ['-png', '-r', '72', '-f', '1', '-l', '1', file, path.join(tmp, 'page')]);
    const pngFile = fs.readdirSync(tmp).find((f) => f.startsWith('page') && f.endsWith('.png'))!;
    fs.mkdirSync(SCREENSHOTS, { recursive: true });
    fs.copyFileSync(path.join(tmp, pngFile), path.join(SCREENSHOTS, 'pdf-letterhead.png'));
    const page = await loadImage(path.join(tmp, pngFile));
    const ctx = createCanvas(page.width, page.height).getContext('2d');
    ctx.drawImage(page, 0, 0);
    // At 72 dpi a pixel is a point. The 600×200 logo fits the 140×48 pt box as 140×46.7 pt, its right
    // edge on the right margin and its top on the top margin [calc]; its outer 40 px (9.3 pt) are transparent.
    const at = (x: number, y: number) => [...ctx.getImageData(x, y, 1, 1).data];
    const left = page.width - MARGIN - 140;
    const amber = at(left + 70, MARGIN + 23);
    expect(amber[0]).toBeGreaterThan(200);
    expect(amber[2]).toBeLessThan(80);
    const corner = at(left + 3, MARGIN + 3); // inside the logo's box, where it is transparent: the white page shows
    expect(Math.min(...corner.slice(0, 3))).toBeGreaterThan(240);
  });
});
