/**
 * Visit summary PDF pieces without the API: number formatting in the comparison table, the
 * Latin-subset fallbacks, and the document's text as pdf-parse (npm) extracts it. Values are
 * worked examples, not sources.
 */
import { describe, expect, it } from 'vitest';
import { PDFParse } from 'pdf-parse';
import { pdfSafe, renderSummaryPdf, signedChange, SUMMARY_CAUTION } from '../../../server/render/summary-pdf';
import { MEASUREMENT_ERROR } from '../../../src/kinematics';

describe('signedChange', () => {
  it('signs a change with the true minus sign and drops the sign of a change that rounds to zero', () => {
    expect(signedChange(6.99998, '°')).toBe('+7.0°');
    expect(signedChange(-2.7, '°')).toBe('−2.7°');
    expect(signedChange(-0.00001, '°')).toBe('0.0°');
    expect(signedChange(3.4, 'steps/min')).toBe('+3 steps/min');
  });
});

describe('pdfSafe', () => {
  it('writes the signs the shipped Latin face lacks in words', () => {
    expect(pdfSafe('≥ 10°')).toBe('at least 10°');
    expect(pdfSafe('≤ 8 cm')).toBe('at most 8 cm');
  });
});

describe('renderSummaryPdf', () => {
  it('prints the comparison with its verdicts and the threshold sources', async () => {
    const hip = MEASUREMENT_ERROR.hip_extension_toe_off!;
    const { pdf, pageCount } = await renderSummaryPdf({
      clinicName: 'Test Clinic',
      athleteName: 'Test Runner',
      title: 'Re-test comparison',
      issuedOn: '2 Dec 2026',
      coachName: 'Test Coach',
      visits: [
        { label: 'Baseline · 6 Oct 2026', surface: 'Treadmill', speed: '3.00 m/s (10.8 km/h)', incline: null, shoes: null },
        { label: 'Re-test · 24 Nov 2026', surface: 'Treadmill', speed: '3.00 m/s (10.8 km/h)', incline: null, shoes: null },
      ],
      measures: [],
      comparison: [
        { key: 'hip_extension_toe_off', side: 'right', label: 'Hip extension at toe-off', unit: '°', baseline: 4, retest: 11, change: 7, threshold: hip, verdict: 'beyond_measurement_error', baselineSteps: 8, retestSteps: 8, direction: 'better', betterDirection: null },
        { key: 'cadence', side: null, label: 'Cadence', unit: 'steps/min', baseline: 170, retest: 172, change: 2, threshold: null, verdict: 'no_threshold', baselineSteps: 8, retestSteps: 8, direction: 'larger', betterDirection: null },
      ],
      stills: [],
      findings: 'Better push-off.',
      planText: '',
      caution: SUMMARY_CAUTION,
    });
    expect(pageCount).toBe(1);
    const text = (await new PDFParse({ data: new Uint8Array(pdf) }).getText()).text.replace(/\s+/g, ' ');
    expect(text).toContain('Test Runner');
    expect(text).toContain('+7.0°');
    // [calc] 7° > 5.5° (half of the Damsted et al. 2015 hip prediction-interval width).
    expect(text).toContain('Beyond measurement error · better (threshold 5.5°)');
    expect(text).toContain('170 steps/min');
    expect(text).toContain('No published threshold');
    expect(text).toContain('Damsted et al. 2015');
    expect(text).toContain('No plan written for this visit.');
  });
});
