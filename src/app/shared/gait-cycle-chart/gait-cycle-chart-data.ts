/**
 * Data for the gait-cycle chart: per curve series (a side, of one visit) the mean line and a
 * mean ± SD band over 0–100 % of the cycle, and its toe-off marker. Pure apart from the marker
 * plugin's drawing, which only touches the chart's canvas.
 */
import type { ChartDataset, Plugin } from 'chart.js';
import type { Side } from '../../../contracts/assessment';
import { OVERLAY_COLOURS } from '../../../kinematics/overlay';
import { type CycleAngleKey, type CycleMarker, type SideCycleCurves } from '../../../kinematics/gait-cycle';
import { formatValue } from '../../../kinematics/format';

/** One set of curves to draw: a side of one clip, named ("Right", "Baseline · right"). */
export interface CycleChartSeries {
  id: string;
  label: string;
  side: Side;
  curves: SideCycleCurves;
  /** Drawn dashed and lighter (the other visit on the Re-test comparison). */
  secondary?: boolean;
  /** Label of its toe-off marker on the chart ("TO R"). */
  markerLabel: string;
}

export type CycleDataset = ChartDataset<'line', { x: number; y: number }[]>;

/** A toe-off marker to draw: where (percent of the cycle), in which colour and dash. */
export interface CycleMarkerLine {
  pct: number;
  colour: string;
  dash: number[];
  label: string;
}

const round1 = (v: number) => Math.round(v * 10) / 10;

/** `#RRGGBB` + alpha → `rgba(…)`. */
export function withAlpha(hex: string, alpha: number): string {
  const n = parseInt(hex.slice(1), 16);
  return `rgba(${(n >> 16) & 255}, ${(n >> 8) & 255}, ${n & 255}, ${alpha})`;
}

/** Colour of a series: the side's limb colour (trunk slate for the trunk angle). */
export function seriesColour(side: Side, key: CycleAngleKey): string {
  return key === 'trunkDeg' ? OVERLAY_COLOURS.trunk : OVERLAY_COLOURS[side];
}

/**
 * Datasets for one angle: per series that has it, the SD band (upper edge filled down to the lower
 * edge, no line) and the mean line on top. A secondary series is dashed and lighter.
 */
export function cycleDatasets(series: readonly CycleChartSeries[], key: CycleAngleKey): CycleDataset[] {
  const out: CycleDataset[] = [];
  for (const s of series) {
    const curve = s.curves.curves.find((c) => c.key === key);
    if (!curve) continue;
    const colour = seriesColour(s.side, key);
    const line = s.secondary ? withAlpha(colour, 0.7) : colour;
    const pts = (f: (i: number) => number) => curve.mean.map((_, i) => ({ x: i, y: round1(f(i)) }));
    const band = { borderWidth: 0, pointRadius: 0, pointHitRadius: 0, tension: 0 };
    out.push(
      {
        ...band,
        label: `${s.label} + SD`,
        data: pts((i) => curve.mean[i]! + curve.sd[i]!),
        fill: '+1',
        backgroundColor: withAlpha(colour, s.secondary ? 0.08 : 0.16),
        borderColor: 'transparent',
      },
      {
        ...band,
        label: `${s.label} − SD`,
        data: pts((i) => curve.mean[i]! - curve.sd[i]!),
        fill: false,
        backgroundColor: 'transparent',
        borderColor: 'transparent',
      },
      {
        label: `${s.label} (${curve.strides} stride${curve.strides === 1 ? '' : 's'})`,
        data: pts((i) => curve.mean[i]!),
        borderColor: line,
        backgroundColor: line,
        borderDash: s.secondary ? [7, 4] : [],
        borderWidth: s.secondary ? 2 : 2.5,
        pointRadius: 0,
        pointHoverRadius: 4,
        tension: 0,
        fill: false,
      },
    );
  }
  return out;
}

/** "Toe-off 35.7 ± 1.2 %" (± left out for one stride). */
export function markerText(name: string, m: CycleMarker | null): string {
  if (!m) return `${name} not marked`;
  return m.strides > 1 ? `${name} ${formatValue(m.meanPct, '%')} ± ${formatValue(m.sdPct, '%')}` : `${name} ${formatValue(m.meanPct, '%')}`;
}

/** The toe-off lines of the series that have one. */
export function toeOffLines(series: readonly CycleChartSeries[], key: CycleAngleKey): CycleMarkerLine[] {
  return series
    .filter((s) => s.curves.toeOff && s.curves.curves.some((c) => c.key === key))
    .map((s) => ({
      pct: s.curves.toeOff!.meanPct,
      colour: seriesColour(s.side, key),
      dash: s.secondary ? [2, 3] : [6, 3],
      label: s.markerLabel,
    }));
}

/** A chart.js plugin drawing the toe-off markers (vertical lines with a "TO" label on top). */
export function cycleMarkersPlugin(state: { lines: CycleMarkerLine[]; font: string }): Plugin<'line'> {
  return {
    id: 'trailframeCycleMarkers',
    afterDatasetsDraw(chart) {
      const { ctx, chartArea, scales } = chart;
      const x = scales['x'];
      if (!x || !chartArea) return;
      ctx.save();
      ctx.font = state.font;
      ctx.textAlign = 'center';
      ctx.textBaseline = 'bottom';
      state.lines.forEach((m, i) => {
        const px = x.getPixelForValue(m.pct);
        ctx.strokeStyle = m.colour;
        ctx.lineWidth = 1.5;
        ctx.setLineDash(m.dash);
        ctx.beginPath();
        ctx.moveTo(px, chartArea.top);
        ctx.lineTo(px, chartArea.bottom);
        ctx.stroke();
        ctx.fillStyle = '#2b2b2b';
        ctx.fillText(m.label, px, chartArea.top - 1 - (i % 2) * 12);
      });
      ctx.restore();
    },
  };
}
