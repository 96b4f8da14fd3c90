import type { MeasureTrends } from '../../../contracts/measures';
import { OVERLAY_COLOURS } from '../../../kinematics';
import { viewScaleOf } from './compare-canvas';
import { TREND_SIDE_STYLE, trendChart, unitTitle } from './trend-chart';

const trends: MeasureTrends = {
  keys: ['hip_extension_toe_off', 'cadence'],
  points: [
    {
      assessmentId: 1,
      date: '2026-10-06',
      kind: 'baseline',
      values: [
        { key: 'hip_extension_toe_off', side: 'right', mean: 4 },
        { key: 'hip_extension_toe_off', side: 'left', mean: 4 },
        { key: 'cadence', side: null, mean: 166 },
      ],
    },
    {
      assessmentId: 2,
      date: '2026-11-24',
      kind: 'retest',
      values: [
        { key: 'hip_extension_toe_off', side: 'right', mean: 11 },
        { key: 'hip_extension_toe_off', side: 'left', mean: 11 },
        { key: 'cadence', side: null, mean: 172 },
      ],
    },
  ],
};

describe('trend chart', () => {
  it('tells the sides apart by the project colours, dash and marker size, so equal values do not hide a line', () => {
    const { data } = trendChart(trends, ['hip_extension_toe_off'], ['Baseline', 'Re-test']);
    const right = data.datasets.find((d) => d.label === 'Hip extension at toe-off (thigh from vertical, right)')!;
    const left = data.datasets.find((d) => d.label === 'Hip extension at toe-off (thigh from vertical, left)')!;
    expect(right.borderColor).toBe(OVERLAY_COLOURS.right);
    expect(left.borderColor).toBe(OVERLAY_COLOURS.left);
    expect(left.borderDash).not.toEqual(right.borderDash);
    expect(left.pointRadius).not.toBe(right.pointRadius);
    // Chart.js draws the lowest order on top: the left side's thinner dashed line over the right's.
    expect(left.order).toBeLessThan(right.order!);
    expect(right.data).toEqual([4, 11]);
  });

  it('titles the axis with the unit, one axis per unit, and keeps the legend', () => {
    const { options, units, data } = trendChart(trends, ['hip_extension_toe_off', 'cadence'], ['Baseline', 'Re-test']);
    expect(units).toEqual(['°', 'steps/min']);
    const scales = options.scales as Record<string, { title?: { text?: string }; position?: string }>;
    expect(scales['y']!.title!.text).toBe('Degrees (°)');
    expect(scales['y1']!.title!.text).toBe('Steps per minute');
    expect(scales['y1']!.position).toBe('right');
    expect(data.datasets.find((d) => d.label === 'Cadence')!.yAxisID).toBe('y1');
    expect(data.datasets.find((d) => d.label === 'Cadence')!.borderColor).toBe(TREND_SIDE_STYLE.both.colour);
    expect(options.plugins?.legend?.position).toBe('bottom');
    expect(unitTitle('%')).toBe('Percent (%)');
  });

  it("sizes overlay labels by the canvas's shown width: 640 frame px shown 366 px wide is 0.57 view px per frame px", () => {
    expect(viewScaleOf(366, 640)).toBeCloseTo(0.571875, 6);
    expect(viewScaleOf(0, 640)).toBeUndefined();
  });
});
