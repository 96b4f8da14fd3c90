import { ChangeDetectionStrategy, Component, computed, effect, input, signal, viewChild } from '@angular/core';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { Chart, ChartConfiguration, Filler, LineController, LineElement, LinearScale, PointElement, Tooltip } from 'chart.js';
import { BaseChartDirective } from 'ng2-charts';
import { CYCLE_ANGLES, type CycleAngleKey } from '../../../kinematics/gait-cycle';
import {
  CycleChartSeries,
  CycleMarkerLine,
  cycleDatasets,
  cycleMarkersPlugin,
  markerText,
  seriesColour,
  toeOffLines,
} from './gait-cycle-chart-data';

// The line chart parts plus Filler for the ± SD bands (the legend is ours, in HTML).
Chart.register(LineController, LineElement, PointElement, LinearScale, Tooltip, Filler);

/**
 * Gait-cycle curves: one joint angle over 0–100 % of the cycle (initial contact to the next of the
 * same side), mean line with a ± SD band per series (side, or side of one visit), and toe-off
 * markers; an angle picker; a legend with strides and toe-off %; an empty state with the reason.
 * Used by the review (one clip, both sides) and the Re-test comparison (baseline dashed and lighter).
 * It shows figures: the page around it carries `MEASURES_CAUTION` (both pages that use it do).
 */
@Component({
  selector: 'app-gait-cycle-chart',
  imports: [BaseChartDirective, MatButtonToggleModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './gait-cycle-chart.html',
  styleUrl: './gait-cycle-chart.scss',
})
export class GaitCycleChart {
  /** What to draw; series without a whole stride are left out. */
  readonly series = input.required<CycleChartSeries[]>();
  /** Shown when no series has a whole stride. */
  readonly emptyText = input(
    'Gait-cycle curves appear once landmarks are on every frame of at least one stride (initial contact → toe-off → next initial contact of one side, events placed or accepted).',
  );
  /** Heading size: `panel` (a tool panel's small title) or `section` (a page section's heading). */
  readonly heading = input<'panel' | 'section'>('panel');
  /** Heading id prefix (two charts on one page need different ids). */
  readonly idPrefix = input('cycle');

  private readonly chartDir = viewChild(BaseChartDirective);
  protected readonly angles = CYCLE_ANGLES;
  protected readonly angle = signal<CycleAngleKey>('thighDeg');

  protected readonly shown = computed(() => this.series().filter((s) => s.curves.strides > 0));
  protected readonly hasData = computed(() => this.shown().some((s) => s.curves.curves.some((c) => c.key === this.angle())));
  protected readonly angleLabel = computed(() => CYCLE_ANGLES.find((a) => a.key === this.angle())!.label);
  /** Reasons strides were left out, for the note under the chart. */
  protected readonly excluded = computed(() => this.series().flatMap((s) => s.curves.excluded.map((e) => `${s.label}: ${e}`)));

  protected readonly data = computed<ChartConfiguration<'line', { x: number; y: number }[]>['data']>(() => ({
    datasets: cycleDatasets(this.shown(), this.angle()),
  }));
  protected readonly legend = computed(() =>
    this.shown().map((s) => {
      const curve = s.curves.curves.find((c) => c.key === this.angle());
      return {
        id: s.id,
        label: s.label,
        colour: seriesColour(s.side, this.angle()),
        dash: s.secondary ? '7 4' : '',
        strides: curve?.strides ?? 0,
        toeOff: markerText('toe-off', s.curves.toeOff),
      };
    }),
  );

  private readonly markers: { lines: CycleMarkerLine[]; font: string } = { lines: [], font: '600 11px "Source Sans 3", sans-serif' };
  protected readonly plugins = [cycleMarkersPlugin(this.markers)];

  protected readonly options: ChartConfiguration<'line', { x: number; y: number }[]>['options'] = {
    animation: false,
    responsive: true,
    maintainAspectRatio: false,
    layout: { padding: { top: 26, right: 8 } },
    interaction: { mode: 'nearest', axis: 'x', intersect: false },
    scales: {
      x: {
        type: 'linear',
        min: 0,
        max: 100,
        title: { display: true, text: 'Gait cycle (% from initial contact)', padding: 0, font: { size: 12 } },
        ticks: { stepSize: 10, font: { size: 11 } },
      },
      y: { title: { display: true, text: 'Angle (°)', padding: 0, font: { size: 12 } }, ticks: { font: { size: 11 }, maxTicksLimit: 6 } },
    },
    plugins: {
      legend: { display: false },
      tooltip: {
        filter: (item) => !String(item.dataset.label).includes('SD'),
        callbacks: {
          title: (items) => (items.length ? `${items[0].parsed.x} % of the cycle` : ''),
          label: (item) => `${item.dataset.label}: ${item.parsed.y}°`,
        },
      },
    },
  };

  constructor() {
    effect(() => {
      this.markers.lines = toeOffLines(this.shown(), this.angle());
      this.chartDir()?.chart?.draw();
    });
  }

  protected setAngle(value: CycleAngleKey | undefined): void {
    if (value) this.angle.set(value);
  }
}
