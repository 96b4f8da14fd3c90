import type { ChartConfiguration } from 'chart.js';
import type { Side } from '../../../contracts/assessment';
import type { MeasureKey, MeasureTrends } from '../../../contracts/measures';
import { MEASURE_DEFINITIONS, OVERLAY_COLOURS } from '../../../kinematics';
import { formatValue } from '../../../kinematics/format';
import { sidedLabel, trendSeries } from './compare-logic';

type LineData = ChartConfiguration<'line', (number | null)[]>['data'];
type LineOptions = NonNullable<ChartConfiguration<'line', (number | null)[]>['options']>;

/** Each side's look: the project's limb colours, and a dash and marker of its own so one line never hides the other. */
export const TREND_SIDE_STYLE: Record<Side | 'both', { colour: string; dash: number[]; pointRadius: number; words: string }> = {
  right: { colour: OVERLAY_COLOURS.right, dash: [], pointRadius: 6, words: 'amber, solid line' },
  left: { colour: OVERLAY_COLOURS.left, dash: [7, 5], pointRadius: 4, words: 'violet, dashed line' },
  both: { colour: OVERLAY_COLOURS.trunk, dash: [2, 3], pointRadius: 5, words: 'slate, dotted line' },
};

/** Markers by measure (first chosen measure circles, the next diamonds, …). */
export const TREND_POINT_STYLES = ['circle', 'rectRot', 'triangle', 'rect', 'star', 'crossRot'] as const;

/** "Degrees (°)", "Steps per minute", … for an axis title. */
export function unitTitle(unit: string): string {
  const words: Record<string, string> = {
    '°': 'Degrees (°)',
    'steps/min': 'Steps per minute',
    s: 'Seconds (s)',
    m: 'Metres (m)',
    cm: 'Centimetres (cm)',
    '%': 'Percent (%)',
  };
  return words[unit] ?? unit;
}

/** The chart's lines and axes: one y axis per unit (the first on the left), titled with it. */
export function trendChart(
  trends: MeasureTrends,
  keys: MeasureKey[],
  visitLabels: string[],
): { data: LineData; options: LineOptions; units: string[] } {
  const series = trendSeries(trends, keys);
  const units = [...new Set(series.map((s) => MEASURE_DEFINITIONS[s.key].unit))];
  const axisOf = (unit: string) => (units.indexOf(unit) === 0 ? 'y' : `y${units.indexOf(unit)}`);
  // Chart.js draws the first dataset (lowest `order`) on top: the left side's smaller, dashed
  // marks go first, over the right side's wider solid ones, so equal values show both lines.
  const order = (s: Side | null) => (s === 'left' ? 0 : s === 'right' ? 1 : 2);
  const datasets = [...series]
    .sort((a, b) => keys.indexOf(a.key) - keys.indexOf(b.key) || order(a.side) - order(b.side))
    .map((s) => {
      const def = MEASURE_DEFINITIONS[s.key];
      const style = TREND_SIDE_STYLE[s.side ?? 'both'];
      return {
        order: order(s.side),
        label: sidedLabel(def.label, s.side),
        data: s.values,
        yAxisID: axisOf(def.unit),
        borderColor: style.colour,
        backgroundColor: style.colour,
        borderDash: style.dash,
        borderWidth: 2.5,
        pointStyle: TREND_POINT_STYLES[Math.max(0, keys.indexOf(s.key)) % TREND_POINT_STYLES.length],
        pointRadius: style.pointRadius,
        pointHoverRadius: style.pointRadius + 2,
        spanGaps: true,
        tension: 0,
      };
    });
  const scales: LineOptions['scales'] = { x: { title: { display: true, text: 'Visit' } } };
  units.forEach((unit, i) => {
    scales[axisOf(unit)] = {
      type: 'linear',
      position: i === 0 ? 'left' : 'right',
      title: { display: true, text: unitTitle(unit) },
      ticks: { callback: (v) => formatValue(Number(v), unit) },
      grid: { drawOnChartArea: i === 0 },
    };
  });
  const unitOf = new Map(series.map((s) => [sidedLabel(MEASURE_DEFINITIONS[s.key].label, s.side), MEASURE_DEFINITIONS[s.key].unit]));
  return {
    data: { labels: visitLabels, datasets },
    units,
    options: {
      responsive: true,
      maintainAspectRatio: false,
      animation: false,
      scales,
      plugins: {
        legend: { position: 'bottom', labels: { usePointStyle: true, boxWidth: 28, padding: 14 } },
        tooltip: {
          callbacks: {
            label: (item) => `${item.dataset.label}: ${formatValue(item.parsed.y ?? null, unitOf.get(item.dataset.label ?? '') ?? '')}`,
          },
        },
      },
    },
  };
}
