/**
 * The visit summary PDF of one fixed visit of the demo athlete, read back with pdf-parse (npm) and
 * checked line by line, top to bottom. Fixed data and a fixed day ("2 Dec 2026"), no clock. The
 * figures are a worked example: means and SDs print rounded half away from zero to one decimal
 * (8.44 → 8.4, 1.26 → 1.3, 2.04 → 2.0); the bands are REFERENCES.md's: hip extension at toe-off
 * ≥ 10° (common practice [trade]) and knee flexion at initial contact 17.8 ± 4.0° = 13.8–21.8°
 * (Heiderscheit et al. 2011, Table 3 [pub]).
 */
import { PDFParse } from 'pdf-parse';
import { describe, expect, it } from 'vitest';
import type { Measure, MeasureKey } from '../../../src/contracts/measures';
import { DEFAULT_REFERENCE_BANDS, evaluateBand } from '../../../src/kinematics';
import { renderSummaryPdf, SUMMARY_CAUTION, type SummaryDocument } from '../../../server/render/summary-pdf';
import { DEMO_CLINIC_NAME, DEMO_SIGN_INS } from '../../../seeds/demo-scenario';

const coach = DEMO_SIGN_INS[1];
const athlete = DEMO_SIGN_INS[3];

function measure(key: MeasureKey, label: string, mean: number, sd: number, n: number): Measure {
  const band = DEFAULT_REFERENCE_BANDS.find((b) => b.key === key && b.unit === '°')!;
  return {
    key,
    label,
    unit: '°',
    side: 'right',
    event: null,
    status: 'ok',
    mean,
    sd,
    n,
    values: [],
    derivation: '',
    band: evaluateBand(mean, band)!,
  };
}

const visit: SummaryDocument = {
  clinicName: DEMO_CLINIC_NAME,
  athleteName: athlete.name,
  title: 'Visit summary',
  issuedOn: '2 Dec 2026',
  coachName: coach.name,
  visits: [{ label: 'Baseline · 6 Oct 2026', surface: 'Treadmill', speed: '3.00 m/s (10.8 km/h)', incline: '1 %', shoes: 'Daily trainer' }],
  measures: [
    {
      heading: 'Clip 1',
      measures: [
        measure('hip_extension_toe_off', 'Hip extension', 8.44, 1.26, 8),
        measure('knee_flexion_initial_contact', 'Knee flexion', 17.8, 2.04, 8),
      ],
    },
  ],
  comparison: null,
  stills: [],
  findings: 'Push-off is short on the right.',
  planText: 'Hip extension drills, three times a week.',
  caution: SUMMARY_CAUTION,
};

describe('the visit summary PDF of a fixed visit, line by line', () => {
  it('prints header, caution, visit facts, findings, measures with bands, plan, sources and footer in order', async () => {
    const { pdf, pageCount } = await renderSummaryPdf(visit);
    expect(pageCount).toBe(1);
    const text = (await new PDFParse({ data: new Uint8Array(pdf) }).getText()).pages[0]!.text;
    const lines = text
      .split('\n')
      .map((l) => l.trim())
      .filter(Boolean);
    const cautionLines = lines.slice(4, 6);
    expect(cautionLines.join(' ')).toBe(SUMMARY_CAUTION);
    expect([...lines.slice(0, 4), ...lines.slice(6)]).toEqual([
      'Larchwood Running Clinic',
      'Visit summary',
      'Athlete: Ada Kestrel',
      'Prepared by Tobin Achterberg on 2 Dec 2026',
      // caution (two lines, above)
      'Visit',
      'Baseline · 6 Oct 2026',
      'Surface Treadmill',
      'Speed 3.00 m/s (10.8 km/h)',
      'Incline 1 %',
      'Shoes Daily trainer',
      'Findings',
      'Push-off is short on the right.',
      'Measures',
      'Measure Mean ± SD (steps) Reference band Where it sits',
      'Hip extension (right) 8.4 ± 1.3° (n = 8) ≥ 10°',
      'Common practice in the trade [1]',
      'Below',
      'Knee flexion (right) 17.8 ± 2.0° (n = 8) 13.8–21.8°',
      'Heiderscheit et al. 2011 [2]',
      'Within',
      'Plan',
      'Hip extension drills, three times a week.',
      'Sources of reference bands and thresholds',
      '[1] Common practice in the trade, no single source. See Souza 2016, Phys Med Rehabil Clin N Am 27(1):217–236 (a slow runner with',
      '~10° peak hip extension needed no intervention)',
      '[2] Heiderscheit et al. 2011, Med Sci Sports Exerc 43(2):296–302, Table 3',
      'Ada Kestrel · Visit summary · Larchwood Running Clinic · page 1 of 1',
    ]);
  });
});

describe('the visit summary PDF with names and text in other scripts', () => {
  it('renders (the job does not fail) and keeps the letters its font has: accented, Greek and Cyrillic names read back exactly', async () => {
    const { pdf, pageCount } = await renderSummaryPdf({
      ...visit,
      athleteName: 'Zoë Łukasz-Ζωή Дарья 李小龍 שלום 🏃🏽',
      findings: `Push-off is short on the right. ${'跑步时髋关节伸展不足'.repeat(40)} Ångström.`,
      planText: 'שלום עולם مرحبا 👍🏽 e\u0301',
    });
    expect(pageCount).toBeGreaterThanOrEqual(1);
    const text = (await new PDFParse({ data: new Uint8Array(pdf) }).getText()).pages.map((p) => p.text).join('\n');
    // The complete Source Sans 3 carries Latin with accents, Greek and Cyrillic (the font's published coverage, from memory).
    expect(text).toContain('Zoë Łukasz-Ζωή Дарья');
    expect(text).toContain('Push-off is short on the right.');
    expect(text).toContain('Ångström.');
  });
});
