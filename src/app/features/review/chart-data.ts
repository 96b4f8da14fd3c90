/**
 * Data for the joint-angle chart: one line per chosen angle and side, plus the gait-event markers
 * (drawn by a small chart.js plugin of ours) and the current frame. Pure apart from the plugin's
 * drawing, which only touches the chart's canvas.
 */
import type { ChartDataset, Plugin } from 'chart.js';
import type { GaitEventKind, GaitEventMark } from '../../../contracts/annotations';
import type { Side } from '../../../contracts/assessment';
import type { AngleSample } from '../../../contracts/measures';
import { EVENT_SHORT } from './annotation-ops';

export type AngleSeriesId = 'thigh' | 'knee' | 'shank' | 'trunk' | 'foot';

export interface AngleSeries {
  id: AngleSeriesId;
  /** Short name for the series picker. */
  short: string;
  label: string;
  field: keyof Pick<AngleSample, 'thighDeg' | 'kneeFlexionDeg' | 'shankDeg' | 'trunkDeg' | 'footDeg'>;
  /** Line dash, so series differ by more than colour. */
  dash: number[];
  /** Point marker shape. */
  point: 'circle' | 'rect' | 'triangle' | 'rectRot' | 'crossRot';
}

export const ANGLE_SERIES: AngleSeries[] = [
  { id: 'thigh', short: 'Thigh', label: 'Thigh from vertical (+ flexion)', field: 'thighDeg', dash: [], point: 'circle' },
  { id: 'knee', short: 'Knee flexion', label: 'Knee flexion', field: 'kneeFlexionDeg', dash: [6, 4], point: 'rect' },
  { id: 'shank', short: 'Shank', label: 'Shank from vertical', field: 'shankDeg', dash: [2, 3], point: 'triangle' },
  { id: 'trunk', short: 'Trunk lean', label: 'Trunk lean', field: 'trunkDeg', dash: [10, 3, 2, 3], point: 'rectRot' },
  { id: 'foot', short: 'Foot', label: 'Foot from horizontal', field: 'footDeg', dash: [1, 3], point: 'crossRot' },
];

export const SIDE_COLOURS: Record<Side, string> = { left: '#7B4FD6', right: '#E08A1E' };
export const TRUNK_COLOUR = '#3E4C59';
const SIDE_LABELS: Record<Side, string> = { left: 'Left', right: 'Right' };

export type AngleDataset = ChartDataset<'line', { x: number; y: number }[]>;

/** One dataset per chosen series and side that has any value (trunk drawn in slate). */
export function angleDatasets(samples: readonly AngleSample[], series: readonly AngleSeriesId[], sides: readonly Side[]): AngleDataset[] {
  const out: AngleDataset[] = [];
  for (const def of ANGLE_SERIES.filter((s) => series.includes(s.id))) {
    for (const side of sides) {
      const data = samples
        .filter((s) => s.side === side && typeof s[def.field] === 'number')
        .map((s) => ({ x: s.frame, y: Math.round((s[def.field] as number) * 10) / 10 }))
        .sort((a, b) => a.x - b.x);
      if (!data.length) continue;
      const colour = def.id === 'trunk' ? TRUNK_COLOUR : SIDE_COLOURS[side];
      out.push({
        label: `${def.short} · ${SIDE_LABELS[side]}`,
        data,
        borderColor: colour,
        backgroundColor: colour,
        borderDash: def.dash,
        borderWidth: 2,
        pointStyle: def.point,
        pointRadius: 3,
        pointHoverRadius: 5,
        tension: 0,
        spanGaps: true,
      });
    }
  }
  return out;
}

/** The frame nearest a chart x value, inside the clip. */
export function frameFromChartValue(value: number | undefined, frameCount: number): number | null {
  if (value === undefined || !Number.isFinite(value) || frameCount <= 0) return null;
  return Math.min(frameCount - 1, Math.max(0, Math.round(value)));
}

/** What the marker plugin draws; the chart component mutates it and asks the chart to redraw. */
export interface MarkerState {
  events: GaitEventMark[];
  currentFrame: number;
  currentColour: string;
  font: string;
}

/** Rows of event labels above the plot, and their height, px (the chart keeps room for them). */
export const MARKER_LABEL_ROWS = 2;
export const MARKER_LABEL_ROW_PX = 13;

/** "IC L", "TO R": an event's label on the chart (the legend and tooltip spell it out). */
export function markerLabel(e: GaitEventMark): string {
  return `${EVENT_SHORT[e.kind]} ${e.side === 'left' ? 'L' : 'R'}`;
}

/** Space kept between two labels of one row, px. */
export const MARKER_LABEL_GAP_PX = 8;

/**
 * Rows for event labels centred on their lines at `x` (`width` px wide), so that each one shown is
 * readable and names its own line only: -1 (left out; the line still shows, and the chart's tooltip
 * names it) when another event's line runs under the label (which of the lines it named could not
 * be told) or when no row has room; otherwise, in x order, the lowest row where it clears the
 * previous label of that row by `gap` px. On a phone-wide chart of a long clip the lines stand
 * closer than a label is wide, so labels are left out rather than crowded together.
 */
export function staggerLabels(spans: readonly { x: number; width: number }[], rows: number, gap = MARKER_LABEL_GAP_PX): number[] {
  const out = spans.map(() => -1);
  const ends = Array.from({ length: rows }, () => -Infinity);
  const order = spans.map((_, i) => i).sort((a, b) => spans[a]!.x - spans[b]!.x || a - b);
  const lines = order.map((i) => spans[i]!.x);
  for (const [k, i] of order.entries()) {
    const { x, width } = spans[i]!;
    // The nearest other lines are the neighbours in x order (several events on one frame share a line).
    const clear = (j: number) => j < 0 || j >= lines.length || lines[j] === x || Math.abs(lines[j]! - x) > width / 2 + 1;
    let before = k - 1;
    while (before >= 0 && lines[before] === x) before--;
    let after = k + 1;
    while (after < lines.length && lines[after] === x) after++;
    if (!clear(before) || !clear(after)) continue;
    const row = ends.findIndex((end) => x - width / 2 >= end + gap);
    if (row < 0) continue;
    out[i] = row;
    ends[row] = x + width / 2;
  }
  return out;
}

/** The dash of an event's vertical line, by kind (the colour is the side's). */
export const EVENT_DASH: Record<GaitEventKind, number[]> = { initial_contact: [], midstance: [2, 3], toe_off: [6, 3] };

/** The events key under the chart: each kind's short label, name and the dash of its line (SVG `stroke-dasharray`). */
export const EVENT_KEY: readonly { short: string; name: string; dash: string }[] = [
  { short: 'IC', name: 'initial contact', dash: EVENT_DASH.initial_contact.join(' ') },
  { short: 'MS', name: 'midstance', dash: EVENT_DASH.midstance.join(' ') },
  { short: 'TO', name: 'toe-off', dash: EVENT_DASH.toe_off.join(' ') },
];
/** Label text colours: the side colours darkened to read on white (WCAG AA for small text). */
const LABEL_COLOURS: Record<Side, string> = { left: '#5B35AE', right: '#8A4F00' };

/**
 * A chart.js plugin that draws the marked gait events as vertical lines (side colour, dash by kind,
 * a short label on top where it can name its own line alone, staggered over {@link MARKER_LABEL_ROWS} rows so labels never overlap: {@link staggerLabels}) and
 * the current frame as a solid line. Reads `state` on every draw.
 */
export function eventMarkersPlugin(state: MarkerState): Plugin<'line'> {
  return {
    id: 'trailframeEventMarkers',
    afterDatasetsDraw(chart) {
      const { ctx, chartArea, scales } = chart;
      const x = scales['x'];
      if (!x || !chartArea) return;
      const labelsTop = chartArea.top - MARKER_LABEL_ROWS * MARKER_LABEL_ROW_PX - 2;
      ctx.save();
      ctx.beginPath();
      ctx.rect(chartArea.left - 12, labelsTop, chartArea.right - chartArea.left + 24, chartArea.bottom - labelsTop);
      ctx.clip();
      ctx.font = state.font;
      ctx.textAlign = 'center';
      ctx.textBaseline = 'bottom';
      const shown = state.events
        .map((e) => ({ e, px: x.getPixelForValue(e.frame), text: markerLabel(e) }))
        .filter((m) => m.px >= chartArea.left - 1 && m.px <= chartArea.right + 1);
      const rows = staggerLabels(
        shown.map((m) => ({ x: m.px, width: ctx.measureText(m.text).width })),
        MARKER_LABEL_ROWS,
      );
      shown.forEach(({ e, px, text }, i) => {
        // A proposed event (not yet accepted) is drawn paler than a placed or accepted one.
        ctx.globalAlpha = e.origin === 'proposed' ? 0.45 : 1;
        ctx.strokeStyle = SIDE_COLOURS[e.side];
        ctx.lineWidth = 1.5;
        ctx.setLineDash(EVENT_DASH[e.kind]);
        ctx.beginPath();
        ctx.moveTo(px, chartArea.top);
        ctx.lineTo(px, chartArea.bottom);
        ctx.stroke();
        const row = rows[i]!;
        if (row < 0) return;
        ctx.fillStyle = LABEL_COLOURS[e.side];
        ctx.fillText(text, px, chartArea.top - 1 - row * MARKER_LABEL_ROW_PX);
      });
      ctx.globalAlpha = 1;
      const cx = x.getPixelForValue(state.currentFrame);
      if (cx >= chartArea.left && cx <= chartArea.right) {
        ctx.setLineDash([]);
        ctx.strokeStyle = state.currentColour;
        ctx.lineWidth = 2;
        ctx.beginPath();
        ctx.moveTo(cx, chartArea.top);
        ctx.lineTo(cx, chartArea.bottom);
        ctx.stroke();
      }
      ctx.restore();
    },
  };
}
