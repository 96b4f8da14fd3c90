import { ChangeDetectionStrategy, Component, computed, effect, inject, signal, viewChild } from '@angular/core';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatTooltipModule } from '@angular/material/tooltip';
import { Chart, ChartConfiguration, LineController, LineElement, LinearScale, PointElement, Tooltip } from 'chart.js';
import { BaseChartDirective } from 'ng2-charts';
import { SIDES } from '../../../../contracts/assessment';
import { eventNamesAt } from '../../../../kinematics/event-names';
import {
  ANGLE_SERIES,
  EVENT_KEY,
  AngleSeriesId,
  MARKER_LABEL_ROWS,
  MARKER_LABEL_ROW_PX,
  MarkerState,
  angleDatasets,
  eventMarkersPlugin,
  frameFromChartValue,
} from '../chart-data';
import { ReviewStore } from '../review-store';
import { MEASURES_CAUTION } from '../../../shared/caution';

// Only the chart.js parts this line chart uses (the legend is ours, in HTML).
Chart.register(LineController, LineElement, PointElement, LinearScale, Tooltip);

/**
 * Joint angles (degrees) across the clip's frames for the marked frames, with the gait events as
 * vertical markers (a label only where it names its own line alone, staggered so labels never
 * overlap; the tooltip names a frame's events in full) and the current frame as a line; a legend of lines and event marks. Clicking the chart
 * moves to that frame.
 */
@Component({
  selector: 'app-angle-chart',
  imports: [BaseChartDirective, MatButtonToggleModule, MatTooltipModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './angle-chart.html',
  styleUrl: './angle-chart.scss',
})
export class AngleChart {
  protected readonly store = inject(ReviewStore);
  private readonly chartDir = viewChild(BaseChartDirective);

  protected readonly seriesDefs = ANGLE_SERIES;
  /** The chart shows figures, so it carries the caution (quietly; the Measures tab shows it boxed). */
  protected readonly caution = MEASURES_CAUTION;
  protected readonly series = signal<AngleSeriesId[]>(['thigh', 'knee']);
  protected readonly eventKey = EVENT_KEY;
  protected readonly eventsKeyLong =
    'IC initial contact, MS midstance, TO toe-off; L left, R right; point at or tap a frame for its events in full';

  private readonly markers: MarkerState = {
    events: [],
    currentFrame: 0,
    currentColour: '#1f5f4a',
    font: '600 11px "Source Sans 3", sans-serif',
  };
  protected readonly plugins = [eventMarkersPlugin(this.markers)];

  protected readonly data = computed<ChartConfiguration<'line', { x: number; y: number }[]>['data']>(() => ({
    datasets: angleDatasets(this.store.measures().value?.angles ?? [], this.series(), SIDES),
  }));
  protected readonly hasData = computed(() => this.data().datasets.length > 0);
  /** One legend entry per line drawn: its colour, dash and name. */
  protected readonly legend = computed(() =>
    this.data().datasets.map((d) => ({
      label: d.label ?? '',
      colour: String(d.borderColor),
      dash: Array.isArray(d.borderDash) ? d.borderDash.join(' ') : '',
    })),
  );

  protected readonly options = computed<ChartConfiguration<'line', { x: number; y: number }[]>['options']>(() => {
    const last = Math.max(1, this.store.frameCount() - 1);
    return {
      animation: false,
      responsive: true,
      maintainAspectRatio: false,
      layout: { padding: { top: MARKER_LABEL_ROWS * MARKER_LABEL_ROW_PX + 4, right: 8 } },
      interaction: { mode: 'nearest', axis: 'x', intersect: false },
      scales: {
        x: {
          type: 'linear',
          min: 0,
          max: last,
          title: { display: true, text: 'Frame (number)', padding: 0, font: { size: 12 } },
          ticks: { precision: 0, font: { size: 11 }, maxTicksLimit: 12 },
        },
        y: { title: { display: true, text: 'Angle (°)', padding: 0, font: { size: 12 } }, ticks: { font: { size: 11 }, maxTicksLimit: 6 } },
      },
      plugins: {
        legend: { display: false },
        tooltip: {
          callbacks: {
            title: (items) => (items.length ? `Frame ${items[0].parsed.x}` : ''),
            label: (item) => `${item.dataset.label}: ${item.parsed.y}°`,
            footer: (items) => (items.length ? eventNamesAt(this.store.events(), items[0].parsed.x ?? -1).map((n) => n.text) : []),
          },
        },
      },
    };
  });

  constructor() {
    // Events and the current frame are drawn by the plugin: redraw without re-layout.
    effect(() => {
      this.markers.events = this.store.events();
      this.markers.currentFrame = this.store.frame();
      this.chartDir()?.chart?.draw();
    });
  }

  protected setSeries(value: AngleSeriesId[]): void {
    this.series.set(value.length ? value : ['thigh']);
  }

  protected onChartClick(e: { event?: { x: number | null } }): void {
    const chart = this.chartDir()?.chart;
    const x = e.event?.x;
    if (!chart || x === null || x === undefined) return;
    const frame = frameFromChartValue(chart.scales['x']?.getValueForPixel(x), this.store.frameCount());
    if (frame !== null) this.store.step(frame - this.store.frame());
  }
}
