/**
 * Visit summary PDF without the API: the document's text as pdf-parse (npm) extracts it, every
 * character it prints checked against the embedded faces with fontkit (pdfkit's font engine), page
 * breaks (no page ends with a heading), and every page rendered to PNG with poppler's pdftoppm
 * (Debian) into test-results/screenshots. Figures are worked examples, not sources; thresholds
 * and bands are REFERENCES.md's, named where checked.
 */
import { execFile } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { createCanvas } from '@napi-rs/canvas';
import * as fontkit from 'fontkit';
import { PDFParse } from 'pdf-parse';
import { afterAll, describe, expect, it } from 'vitest';
import type { ComparisonRow, Measure, MeasureKey } from '../../../src/contracts/measures';
import type { Side } from '../../../src/contracts/assessment';
import { BETTER_DIRECTIONS, DEFAULT_REFERENCE_BANDS, evaluateBand, MEASUREMENT_ERROR } from '../../../src/kinematics';
import { PDF_FONT_FILES } from '../../../server/render/fonts';
import {
  plainCitation,
  printable,
  renderSummaryPdf,
  shortCitation,
  SUMMARY_CAUTION,
  type SummaryDocument,
} from '../../../server/render/summary-pdf';

const run = promisify(execFile);
const SCREENSHOTS = path.resolve('test-results/screenshots');
const tmp = fs.mkdtempSync(path.join(os.tmpdir(), 'summary-pdf-'));
afterAll(() => fs.rmSync(tmp, { recursive: true, force: true }));

const HEADINGS = [
  'Visit',
  'Visits compared',
  'Findings',
  'Measures',
  'Measures: Baseline and Re-test',
  'Annotated stills',
  'Plan',
  'Sources of reference bands and thresholds',
];

async function pages(pdf: Buffer): Promise<string[]> {
  const result = await new PDFParse({ data: new Uint8Array(pdf) }).getText();
  return result.pages.map((p) => p.text);
}
const flat = (texts: string[]) => texts.join('\n').replace(/\s+/g, ' ');

/** Characters of the text that no embedded face can print (they would show as boxes). */
function missingGlyphs(text: string): string[] {
  const faces = Object.values(PDF_FONT_FILES).map((f) => fontkit.openSync(f));
  const missing = new Set<string>();
  for (const ch of text) {
    if (/\s/.test(ch)) continue;
    if (!faces.every((f) => f.hasGlyphForCodePoint(ch.codePointAt(0)!))) missing.add(ch);
  }
  return [...missing];
}

/** Pages (1-based) that show an image, by poppler's pdfimages. */
async function pagesWithImages(pdf: Buffer): Promise<Set<number>> {
  const file = path.join(tmp, `images-${Math.random().toString(36).slice(2)}.pdf`);
  fs.writeFileSync(file, pdf);
  const { stdout } = await run('pdfimages', ['-list', file]);
  return new Set(
    stdout
      .split('\n')
      .slice(2)
      .filter((l) => l.trim())
      .map((l) => Number(l.trim().split(/\s+/)[0])),
  );
}

/** Renders every page with pdftoppm; returns the PNG paths (copied to test-results/screenshots). */
async function renderPages(pdf: Buffer, name: string): Promise<string[]> {
  const file = path.join(tmp, `${name}.pdf`);
  fs.writeFileSync(file, pdf);
  await run('pdftoppm', ['-png', '-r', '60', file, path.join(tmp, name)]);
  fs.mkdirSync(SCREENSHOTS, { recursive: true });
  const pngs = fs
    .readdirSync(tmp)
    .filter((f) => f.startsWith(`${name}-`) && f.endsWith('.png'))
    .sort();
  for (const p of pngs) fs.copyFileSync(path.join(tmp, p), path.join(SCREENSHOTS, `pdf-${p}`));
  return pngs.map((p) => path.join(tmp, p));
}

const measure = (key: MeasureKey, side: Side | null, mean: number, unit = '°', n = 8): Measure => {
  const band = DEFAULT_REFERENCE_BANDS.find((b) => b.key === key && b.unit === unit);
  const ev = band ? evaluateBand(mean, band) : null;
  return {
    key,
    label: key.replaceAll('_', ' '),
    unit,
    side,
    event: null,
    status: 'ok',
    mean,
    sd: 1.25,
    n,
    values: [],
    derivation: '',
    ...(ev ? { band: ev } : {}),
  };
};

const row = (
  key: MeasureKey,
  side: Side | null,
  baseline: number,
  retest: number,
  unit: string,
  over: Partial<ComparisonRow>,
): ComparisonRow => ({
  key,
  side,
  label: key.replaceAll('_', ' '),
  unit,
  baseline,
  retest,
  change: retest - baseline,
  baselineSteps: 8,
  retestSteps: 8,
  threshold: MEASUREMENT_ERROR[key] ?? null,
  verdict: 'no_threshold',
  direction: 'larger',
  betterDirection: BETTER_DIRECTIONS[key] ?? null,
  ...over,
});

function still(): { image: Buffer; width: number; height: number; caption: string } {
  const c = createCanvas(1280, 720);
  const ctx = c.getContext('2d');
  ctx.fillStyle = '#556';
  ctx.fillRect(0, 0, 1280, 720);
  ctx.fillStyle = '#E08A1E';
  ctx.fillRect(600, 100, 80, 500);
  return { image: c.toBuffer('image/png'), width: 1280, height: 720, caption: '' };
}

const base: SummaryDocument = {
  clinicName: 'Test Clinic',
  athleteName: 'Zoë Łukasiewicz-Ğüneş',
  title: 'Re-test comparison',
  issuedOn: '2 Dec 2026',
  coachName: 'Test Coach',
  visits: [
    { label: 'Baseline · 6 Oct 2026', surface: 'Treadmill', speed: '3.00 m/s (10.8 km/h)', incline: null, shoes: null },
    { label: 'Re-test · 24 Nov 2026', surface: 'Treadmill', speed: '3.00 m/s (10.8 km/h)', incline: null, shoes: null },
  ],
  measures: [],
  comparison: [
    row('hip_extension_toe_off', 'right', 4, 11, '°', { change: 7, verdict: 'beyond_measurement_error', direction: 'better' }),
    row('knee_flexion_initial_contact', 'right', 17, 19, '°', { change: 2, verdict: 'too_few_steps', retestSteps: 5 }),
    row('foot_angle_initial_contact', 'right', 8, 10, '°', { change: 2, verdict: 'within_measurement_error' }),
    row('cadence', null, 166, 172, 'steps/min', { change: 6 }),
  ],
  stills: [],
  findings: 'Better push-off 👍 at toe-off.',
  planText: '',
  caution: SUMMARY_CAUTION,
};

describe('renderSummaryPdf — a Re-test comparison', () => {
  it('prints verdicts with direction, the reference band column with unit and source, and plain numbered sources', async () => {
    const { pdf } = await renderSummaryPdf(base);
    const text = flat(await pages(pdf));
    expect(text).toContain('Zoë Łukasiewicz-Ğüneş');
    expect(text).toContain('+7.0°');
    // [calc] 7° > 5.5° (half of the Damsted et al. 2015 hip prediction-interval width); more hip extension toward ~10° [trade].
    expect(text).toMatch(/Beyond measurement error · better \(threshold ±5\.5°\) \[\d\]/);
    // [pub] Dingenen et al. 2018: thresholds assume means of at least 7 steps.
    expect(text).toContain('Too few steps to judge (8 and 5 steps; 7 needed in each visit)');
    expect(text).toContain('No published threshold');
    // The band column: [trade] hip ≥ 10°, [pub] Heiderscheit et al. 2011 knee 13.8–21.8°, [pub] Mo et al. 2021 foot −0.8 to 7.4°, [pub] de Ruiter et al. 2019 cadence 157–173.
    expect(text).toContain('Reference band');
    expect(text).toContain('≥ 10°');
    expect(text).toContain('13.8–21.8°');
    expect(text).toContain('\u22120.8 to 7.4°');
    expect(text).toContain('157–173 steps/min');
    expect(text).toMatch(/Heiderscheit et al\. 2011 \[\d\]/);
    expect(text).toContain('Sources of reference bands and thresholds');
    expect(text).toContain('Damsted et al. 2015');
    expect(text).toContain('mean of ≥ 7 steps'); // Dingenen et al. 2018's condition, printed with its own sign
    // Cited plainly: no evidence tags in a patient document.
    expect(text).not.toMatch(/\[(pub|mem|trade|calc)\]|from memory/i);
    expect(text).toContain('de Ruiter et al. 2019, Eur J Sport Sci');
    expect(text).toContain('No plan written for this visit.');
    expect(text).not.toContain('👍');
  });

  it('every character the PDF prints has a glyph in the embedded faces (no boxes), ≥ included', async () => {
    const { pdf } = await renderSummaryPdf(base);
    const text = (await pages(pdf)).join('\n');
    expect(text).toContain('≥');
    expect(missingGlyphs(text)).toEqual([]);
    // The web's Latin subset would have lacked these (what printed "mean of ⊠ 7 steps" before).
    expect(missingGlyphs('≥≤→−±–·°ŁĞ')).toEqual([]);
  });
});

describe('renderSummaryPdf — names and text in other scripts', () => {
  // Invented names in each script; the expected text is the input itself (what the clinician typed).
  const NAMES = {
    chinese: '陈小明',
    japanese: '山田さくら',
    hebrew: 'שרה כהן',
    arabic: 'ليلى حداد',
    greek: 'Αλέξης Παπαδόπουλος',
    latin: 'Zoë Łukasiewicz-Ğüneş',
  };
  const doc = (athleteName: string, findings = ''): SummaryDocument => ({ ...base, athleteName, findings });

  it('every character of a Chinese, Japanese, Hebrew, Arabic, Greek and accented Latin name is in the text layer', async () => {
    for (const [script, name] of Object.entries(NAMES)) {
      const text = (await pages((await renderSummaryPdf(doc(name, `${name} ran well.`))).pdf)).join('\n');
      const letters = (t: string) => [...t.normalize('NFKC')].filter((c) => /\p{L}|\p{M}/u.test(c)).sort();
      // pdf.js (pdf-parse) reads each ToUnicode map; every letter typed comes back at least twice (header and findings).
      for (const ch of letters(name)) expect(letters(text).filter((c) => c === ch).length, `${script} ${ch}`).toBeGreaterThanOrEqual(2);
    }
  });

  it('a Hebrew or Arabic name reads right to left: its first word is drawn to the right of its second', async () => {
    for (const name of [NAMES.hebrew, NAMES.arabic]) {
      const text = flat(await pages((await renderSummaryPdf(doc(name))).pdf)).normalize('NFKC');
      // pdf.js (pdf-parse) gives each word's letters in reading order (it applies the Unicode bidi algorithm
      // within a run) but lists the runs of a line by place on the page, left to right: a name read right
      // to left therefore comes back with its words swapped, and in typed order had it been drawn left to right.
      const [first, second] = name.split(' ');
      expect(text).toContain(`Athlete: ${second} ${first}`);
      expect(text).not.toContain(name);
    }
  });

  it('CJK, Hebrew and Arabic glyphs are drawn (embedded faces, no boxes) and a Latin document embeds no script face', async () => {
    const scripts = await renderSummaryPdf(doc(`${NAMES.chinese} ${NAMES.hebrew}`, `${NAMES.japanese} ${NAMES.arabic}`));
    const fonts = (pdf: Buffer) => [...pdf.toString('latin1').matchAll(/\/BaseFont \/[A-Z]{6}\+([\w-]+)/g)].map((m) => m[1]);
    expect(fonts(scripts.pdf)).toEqual(expect.arrayContaining(['NotoSansHans-Regular', 'NotoSansHebrew', 'NotoNaskhArabic']));
    expect(fonts((await renderSummaryPdf(base)).pdf).filter((f) => /Noto/.test(f!))).toEqual([]);
    const [png] = await renderPages(scripts.pdf, 'scripts');
    expect(fs.statSync(png!).size).toBeGreaterThan(0);
  });
});

describe('renderSummaryPdf — page breaks', () => {
  const longVisit = (stills: number, findingsLines: number): SummaryDocument => {
    const keys: [MeasureKey, string][] = [
      ['hip_extension_toe_off', '°'],
      ['knee_flexion_initial_contact', '°'],
      ['knee_flexion_peak_stance', '°'],
      ['shank_angle_initial_contact', '°'],
      ['foot_angle_initial_contact', '°'],
      ['trunk_lean', '°'],
      ['cadence', 'steps/min'],
      ['duty_factor', '%'],
      ['contact_time', 's'],
    ];
    const clipMeasures = keys.flatMap(([k, u]) =>
      (['left', 'right'] as const).map((s) =>
        measure(k, u === 'steps/min' ? null : s, u === 'steps/min' ? 171.43 : u === 's' ? 0.25 : 22.45, u),
      ),
    );
    return {
      ...base,
      title: 'Visit summary',
      visits: [base.visits[0]!],
      comparison: null,
      measures: [1, 2].map((i) => ({ heading: `Clip ${i} of 2`, measures: clipMeasures })),
      stills: Array.from({ length: stills }, still),
      findings: Array.from(
        { length: findingsLines },
        (_, i) => `Finding ${i + 1}: hip extension at toe-off is short of the usual range on the right.`,
      ).join('\n'),
      planText: 'Isometric holds, then slow lengthening.',
    };
  };

  it('no page ends with a heading, for documents whose sections fall at every place on the page', async () => {
    // Different amounts of findings move every later heading down the page by a line at a time.
    for (const findingsLines of [0, 4, 8, 12, 16, 20]) {
      const { pdf, pageCount } = await renderSummaryPdf(longVisit(3, findingsLines));
      const texts = await pages(pdf);
      const withImages = await pagesWithImages(pdf);
      expect(texts.length).toBe(pageCount);
      texts.forEach((t, i) => {
        const lines = t
          .split('\n')
          .map((l) => l.trim())
          .filter(Boolean);
        expect(lines.at(-1), `page ${i + 1} footer`).toMatch(/page \d+ of \d+$/);
        const lastContent = lines.at(-2);
        // A still is an image (no text): "Annotated stills" may be a page's last text only above one.
        if (lastContent === 'Annotated stills' && withImages.has(i + 1)) return;
        expect(HEADINGS, `page ${i + 1} of ${pageCount} (findings ${findingsLines}) ends with "${lastContent}"`).not.toContain(lastContent);
        expect(lastContent).not.toMatch(/^Clip \d of 2$/);
      });
    }
  });

  it('one rounding rule in the PDF too: a mean of 22.45° prints 22.5 ± 1.3°', async () => {
    const { pdf } = await renderSummaryPdf(longVisit(0, 0));
    expect(flat(await pages(pdf))).toContain('22.5 ± 1.3° (n = 8)');
  });

  it('renders every page to PNG with pdftoppm (poppler), one image per page', async () => {
    const { pdf, pageCount } = await renderSummaryPdf(longVisit(3, 12));
    expect(pageCount).toBeGreaterThan(1);
    const pngs = await renderPages(pdf, 'visit-summary');
    expect(pngs.length).toBe(pageCount);
    for (const p of pngs) expect(fs.statSync(p).size).toBeGreaterThan(2000);
    const cmp = await renderSummaryPdf(base);
    expect((await renderPages(cmp.pdf, 'retest-comparison')).length).toBe(cmp.pageCount);
  });
});

describe('citations in documents', () => {
  it('cites plainly: a derived threshold says how, others print their source as is', () => {
    const hip = MEASUREMENT_ERROR.hip_extension_toe_off!;
    expect(plainCitation(hip.source, hip.evidence, hip.derivation)).toBe(`${hip.source}. ${hip.derivation}`);
    expect(plainCitation('Mo et al. 2021, Res Sports Med', 'pub')).toBe('Mo et al. 2021, Res Sports Med');
    expect(plainCitation('de Ruiter et al. 2019, Eur J Sport Sci (numbers as published; author list from memory)', 'pub')).toBe(
      'de Ruiter et al. 2019, Eur J Sport Sci',
    );
    expect(shortCitation('Heiderscheit et al. 2011, Med Sci Sports Exerc 43(2):296–302, Table 3')).toBe('Heiderscheit et al. 2011');
    expect(shortCitation('Common practice in the trade, no single source.')).toBe('Common practice in the trade');
    expect(printable('Good 👍🏽 run 🇩🇪 © ↔')).toBe('Good  run  © ↔');
  });
});
