import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { AdherenceWeek } from '../../../../contracts/plans';
import { shortDate } from '../pain-chart/pain-chart-data';

/** Sessions done against prescribed, one row per week, newest first, with a bar. */
@Component({
  selector: 'app-adherence-list',
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    @if (rows().length === 0) {
      <p class="muted">No weeks yet: adherence shows once the plan has started.</p>
    } @else {
      <table class="adherence">
        <caption class="visually-hidden">
          Sessions done of sessions prescribed, per week
        </caption>
        <thead>
          <tr>
            <th scope="col">Week of</th>
            <th scope="col">Done</th>
            <th scope="col"><span class="visually-hidden">Share</span></th>
          </tr>
        </thead>
        <tbody>
          @for (w of rows(); track w.weekStart) {
            <tr>
              <th scope="row">{{ label(w.weekStart) }}</th>
              <td class="count">{{ w.done }} of {{ w.prescribed }}</td>
              <td class="bar-cell">
                <span class="bar" aria-hidden="true"
                  ><span class="fill" [class.full]="w.done >= w.prescribed" [style.inline-size.%]="percent(w)"></span
                ></span>
              </td>
            </tr>
          }
        </tbody>
      </table>
    }
  `,
  styles: `
    .adherence {
      inline-size: 100%;
      border-collapse: collapse;
      font: var(--mat-sys-body-medium);
    }
    th,
    td {
      padding: 6px 8px 6px 0;
      text-align: start;
      border-block-end: 1px solid var(--mat-sys-outline-variant);
    }
    thead th {
      font: var(--mat-sys-title-small);
      color: var(--mat-sys-on-surface-variant);
    }
    tbody th {
      font-weight: 400;
      white-space: nowrap;
    }
    .count {
      white-space: nowrap;
      font-variant-numeric: tabular-nums;
    }
    .bar-cell {
      inline-size: 50%;
    }
    .bar {
      display: block;
      block-size: 10px;
      border-radius: 5px;
      background: var(--mat-sys-surface-container-high);
      overflow: hidden;
    }
    .fill {
      display: block;
      block-size: 100%;
      background: var(--mat-sys-tertiary);
    }
    .fill.full {
      background: var(--mat-sys-primary);
    }
  `,
})
export class AdherenceList {
  readonly weeks = input.required<readonly AdherenceWeek[]>();
  protected readonly rows = computed(() => [...this.weeks()].reverse());
  protected readonly label = shortDate;

  protected percent(w: AdherenceWeek): number {
    if (w.prescribed <= 0) return w.done > 0 ? 100 : 0;
    return Math.min(100, Math.round((w.done / w.prescribed) * 100));
  }
}
