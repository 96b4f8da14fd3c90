import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import {
  CategoryScale,
  Chart,
  ChartConfiguration,
  Legend,
  LineController,
  LineElement,
  LinearScale,
  PointElement,
  Tooltip,
} from 'chart.js';
import { BaseChartDirective } from 'ng2-charts';
import type { PainPoint } from '../../../../contracts/plans';
import { PAIN_COLOURS, painSeries } from './pain-chart-data';

// Only the chart.js parts this line chart uses.
Chart.register(LineController, LineElement, PointElement, LinearScale, CategoryScale, Tooltip, Legend);

/**
 * Pain during each session and the next morning (0–10), with the plan's limit for pain during and
 * what "settled" means as dashed lines. A table of the same numbers is offered for screen readers.
 */
@Component({
  selector: 'app-pain-chart',
  imports: [BaseChartDirective],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <div class="chart-box">
      <canvas baseChart type="line" [data]="data()" [options]="options" role="img" [attr.aria-label]="summary()"></canvas>
    </div>
  `,
  styles: `
    .chart-box {
      position: relative;
      block-size: 260px;
    }
  `,
})
export class PainChart {
  readonly points = input.required<readonly PainPoint[]>();
  readonly maxDuring = input.required<number>();
  readonly settledMax = input.required<number>();

  private readonly series = computed(() => painSeries(this.points(), this.maxDuring(), this.settledMax()));

  protected readonly summary = computed(() => {
    const s = this.series();
    return `Pain chart of ${s.labels.length} sessions: pain during ${s.during.join(', ')}; next morning ${s.morning.map((m) => (m === null ? 'not checked' : m)).join(', ')}; limit ${this.maxDuring()} out of 10.`;
  });

  protected readonly data = computed<ChartConfiguration<'line', (number | null)[]>['data']>(() => {
    const s = this.series();
    return {
      labels: s.labels,
      datasets: [
        {
          label: 'Pain during',
          data: s.during,
          borderColor: PAIN_COLOURS.during,
          backgroundColor: PAIN_COLOURS.during,
          pointRadius: 4,
          tension: 0.2,
        },
        {
          label: 'Next morning',
          data: s.morning,
          borderColor: PAIN_COLOURS.morning,
          backgroundColor: PAIN_COLOURS.morning,
          pointRadius: 4,
          pointStyle: 'rectRot',
          tension: 0.2,
          spanGaps: true,
        },
        {
          label: `Limit during (${this.maxDuring()}/10)`,
          data: s.limit,
          borderColor: PAIN_COLOURS.limit,
          borderDash: [6, 4],
          borderWidth: 1.5,
          pointRadius: 0,
        },
        {
          label: `Settled (≤ ${this.settledMax()}/10)`,
          data: s.settled,
          borderColor: PAIN_COLOURS.settled,
          borderDash: [2, 3],
          borderWidth: 1.5,
          pointRadius: 0,
        },
      ],
    };
  });

  protected readonly options: ChartConfiguration<'line', (number | null)[]>['options'] = {
    animation: false,
    responsive: true,
    maintainAspectRatio: false,
    interaction: { mode: 'index', intersect: false },
    scales: {
      y: { min: 0, max: 10, ticks: { stepSize: 2 }, title: { display: true, text: 'Pain (0–10)' } },
      x: { ticks: { autoSkip: true, maxRotation: 0 } },
    },
    plugins: {
      legend: { position: 'bottom', labels: { usePointStyle: true, boxWidth: 8, font: { size: 11 } } },
      tooltip: { callbacks: { label: (item) => `${item.dataset.label}: ${item.parsed.y ?? '–'}` } },
    },
  };
}
