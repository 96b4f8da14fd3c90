import { ChangeDetectionStrategy, Component, computed, effect, inject, signal, viewChild } from '@angular/core';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { Chart, ChartConfiguration, Legend, LineController, LineElement, LinearScale, PointElement, Tooltip } from 'chart.js';
import { BaseChartDirective } from 'ng2-charts';
import { SIDES } from '../../../../contracts/assessment';
import { ANGLE_SERIES, AngleSeriesId, MarkerState, angleDatasets, eventMarkersPlugin, frameFromChartValue } from '../chart-data';
import { ReviewStore } from '../review-store';
import { MEASURES_CAUTION } from '../../../shared/caution';

// Only the chart.js parts this line chart uses.
Chart.register(LineController, LineElement, PointElement, LinearScale, Tooltip, Legend);

/**
 * Joint angles across the clip's frames for the marked frames, with the gait events as vertical
 * markers and the current frame as a line. Clicking the chart moves to that frame.
 */
@Component({
  selector: 'app-angle-chart',
  imports: [BaseChartDirective, MatButtonToggleModule],
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

  protected readonly options = computed<ChartConfiguration<'line', { x: number; y: number }[]>['options']>(() => {
    const last = Math.max(1, this.store.frameCount() - 1);
    return {
      animation: false,
      responsive: true,
      maintainAspectRatio: false,
      layout: { padding: { top: 16 } },
      interaction: { mode: 'nearest', axis: 'x', intersect: false },
      scales: {
        x: { type: 'linear', min: 0, max: last, title: { display: true, text: 'Frame' }, ticks: { precision: 0 } },
        y: { title: { display: true, text: 'Degrees' } },
      },
      plugins: {
        legend: { position: 'bottom', labels: { usePointStyle: true, boxWidth: 8, padding: 8, font: { size: 11 } } },
        tooltip: {
          callbacks: {
            title: (items) => (items.length ? `Frame ${items[0].parsed.x}` : ''),
            label: (item) => `${item.dataset.label}: ${item.parsed.y}°`,
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
