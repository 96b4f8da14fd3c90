import type { Assessment } from '../../../contracts/api';
import type { ComparisonRow, MeasureTrends } from '../../../contracts/measures';
import {
  CAUTION_LINE,
  COMPARE_FRAME_KEYS,
  alignAtHip,
  citationText,
  defaultPair,
  eventFrames,
  formatValue,
  frameOfStep,
  lastCommonStep,
  sidedLabel,
  stepKey,
  trendSeries,
  VERDICT_TEXT,
} from './compare-logic';

const visit = (id: number, date: string, kind: 'baseline' | 'retest') => ({ id, date, kind }) as Assessment;

describe('compare logic', () => {
  it('picks the latest Re-test and the latest Baseline by default', () => {
    expect(
      defaultPair([
        visit(1, '2026-10-06', 'baseline'),
        visit(2, '2026-11-24', 'retest'),
        visit(3, '2026-11-30', 'baseline'),
        visit(4, '2026-10-20', 'retest'),
      ]),
    ).toEqual({ baseline: 3, retest: 2 });
    expect(defaultPair([visit(1, '2026-10-06', 'baseline')])).toEqual({ baseline: 1, retest: null });
  });

  it('finds the frames of one side and kind, and steps within them', () => {
    const events = [
      { frame: 30, side: 'right', kind: 'initial_contact' },
      { frame: 10, side: 'right', kind: 'initial_contact' },
      { frame: 20, side: 'left', kind: 'initial_contact' },
      { frame: 15, side: 'right', kind: 'toe_off' },
    ] as const;
    const frames = eventFrames([...events], 'right', 'initial_contact');
    expect(frames).toEqual([10, 30]);
    expect(frameOfStep(frames, 0)).toBe(10);
    expect(frameOfStep(frames, 5)).toBe(30);
    expect(frameOfStep([], 0)).toBeNull();
    expect(lastCommonStep([1, 2, 3], [4, 5])).toBe(1);
    expect(lastCommonStep([], [4])).toBe(-1);
    expect([stepKey('['), stepKey(']'), stepKey('x')]).toEqual([-1, 1, 0]);
    expect([stepKey('ArrowLeft'), stepKey('ArrowRight'), stepKey('Home'), stepKey('End')]).toEqual([-1, 1, -Infinity, Infinity]);
    for (const k of ['[', ']', 'ArrowLeft', 'ArrowRight', 'Home', 'End']) expect(COMPARE_FRAME_KEYS.has(k)).toBe(true);
  });

  it('moves the baseline skeleton so its hip lands on the re-test hip', () => {
    const rows = [
      { frame: 5, side: 'right' as const, points: { hip: { x: 0.4, y: 0.5 }, knee: { x: 0.45, y: 0.7 } } },
      { frame: 5, side: 'left' as const, points: { hip: { x: 0.41, y: 0.5 } } },
    ];
    const moved = alignAtHip(rows, 'right', { x: 0.5, y: 0.4 });
    expect(moved[0]!.points.hip!.x).toBeCloseTo(0.5);
    expect(moved[0]!.points.knee).toEqual({ x: expect.closeTo(0.55), y: expect.closeTo(0.6) });
    expect(moved[1]!.points.hip!.x).toBeCloseTo(0.51);
    expect(alignAtHip(rows, 'right', null)).toBe(rows);
  });

  it('writes values and changes with their unit', () => {
    expect(formatValue(7, '°', true)).toBe('+7.0°');
    expect(formatValue(-2, 'steps/min', true)).toBe('−2 steps/min');
    expect(formatValue(22.45, '°')).toBe('22.5°'); // the overlay label's text too (one formatter)
    expect(formatValue(4, '°')).toBe('4.0°');
    expect(formatValue(null, '°')).toBe('—');
    expect(formatValue(-0.02, '°', true)).toBe('0.0°');
    expect(formatValue(-0.0001, 's', true)).toBe('0.000 s');
    expect(VERDICT_TEXT.no_threshold).toBe('No published threshold');
  });

  it("carries the whole caution: clinician's judgement, pain, local regulations", () => {
    expect(CAUTION_LINE).toContain("support, and do not replace, a licensed clinician's judgement");
    expect(CAUTION_LINE).toContain('sharp or worsening pain');
    expect(CAUTION_LINE).toContain('follow local regulations');
  });

  it('cites the threshold, or says there is none', () => {
    const row = {
      threshold: { value: 5.5, unit: '°', source: 'Damsted et al. 2015', evidence: 'calc', derivation: 'Half the width.' },
    } as ComparisonRow;
    expect(citationText(row)).toBe('±5.5° — Half the width. Source: Damsted et al. 2015 [calc].');
    expect(citationText({ threshold: null } as ComparisonRow)).toMatch(/No published/);
  });

  it('builds one trend line per key and side, with gaps where a visit lacks it', () => {
    const trends: MeasureTrends = {
      keys: ['hip_extension_toe_off'],
      points: [
        { assessmentId: 1, date: '2026-10-06', kind: 'baseline', values: [{ key: 'hip_extension_toe_off', side: 'right', mean: 4 }] },
        {
          assessmentId: 2,
          date: '2026-11-24',
          kind: 'retest',
          values: [
            { key: 'hip_extension_toe_off', side: 'right', mean: 11 },
            { key: 'hip_extension_toe_off', side: 'left', mean: 9 },
          ],
        },
      ],
    };
    expect(trendSeries(trends, ['hip_extension_toe_off'])).toEqual([
      { key: 'hip_extension_toe_off', side: 'right', values: [4, 11] },
      { key: 'hip_extension_toe_off', side: 'left', values: [null, 9] },
    ]);
  });
});

describe('sidedLabel', () => {
  it('adds the side in brackets, or inside the bracket a name already ends with (never two pairs)', () => {
    expect(sidedLabel('Knee flexion at initial contact', 'left')).toBe('Knee flexion at initial contact (left)');
    expect(sidedLabel('Hip extension at toe-off (thigh from vertical)', 'right')).toBe(
      'Hip extension at toe-off (thigh from vertical, right)',
    );
    expect(sidedLabel('Cadence', null)).toBe('Cadence');
  });
});
