import type { SideCycleCurves } from '../../../kinematics/gait-cycle';
import { cycleDatasets, markerText, toeOffLines, withAlpha } from './gait-cycle-chart-data';

const curves: SideCycleCurves = {
  side: 'right',
  strides: 2,
  curves: [{ key: 'thighDeg', mean: Array.from({ length: 101 }, (_, i) => i / 10), sd: Array.from({ length: 101 }, () => 2), strides: 2 }],
  toeOff: { meanPct: 35.714, sdPct: 1.25, strides: 2 },
  otherContact: null,
  excluded: [],
};

describe('gait-cycle chart data', () => {
  it('a band (mean ± SD, filled between) and the mean line per series, baseline dashed and lighter', () => {
    const ds = cycleDatasets(
      [
        { id: 'b', label: 'Baseline · right', side: 'right', curves, secondary: true, markerLabel: 'TO baseline' },
        { id: 'r', label: 'Re-test · right', side: 'right', curves, markerLabel: 'TO re-test' },
      ],
      'thighDeg',
    );
    expect(ds).toHaveLength(6);
    expect(ds[0]!.data[50]).toEqual({ x: 50, y: 7 }); // 5 + 2
    expect(ds[1]!.data[50]).toEqual({ x: 50, y: 3 }); // 5 − 2
    expect(ds[0]!.fill).toBe('+1');
    expect(ds[2]!.label).toBe('Baseline · right (2 strides)');
    expect(ds[2]!.borderDash).toEqual([7, 4]);
    expect(ds[5]!.borderDash).toEqual([]);
    expect(ds[5]!.borderColor).toBe('#E08A1E');
    expect(cycleDatasets([{ id: 'r', label: 'R', side: 'right', curves, markerLabel: 'TO R' }], 'kneeFlexionDeg')).toEqual([]);
  });

  it('toe-off markers and words', () => {
    expect(toeOffLines([{ id: 'l', label: 'Left', side: 'left', curves, markerLabel: 'TO L' }], 'thighDeg')).toEqual([
      { pct: 35.714, colour: '#7B4FD6', dash: [6, 3], label: 'TO L' },
    ]);
    expect(markerText('toe-off', curves.toeOff)).toBe('toe-off 35.7% ± 1.3%');
    expect(markerText('toe-off', { meanPct: 40, sdPct: 0, strides: 1 })).toBe('toe-off 40.0%');
    expect(markerText('toe-off', null)).toBe('toe-off not marked');
    expect(withAlpha('#E08A1E', 0.5)).toBe('rgba(224, 138, 30, 0.5)');
  });
});
