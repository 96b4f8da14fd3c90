import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { Assessment } from '../../../contracts/api';
import { FILM_SURFACE_LABELS } from '../../../contracts/assessment';
import { formatSpeed } from '../../shared/assessment-form-model';

/** The visit facts of an assessment as a definition list (no coach notes: pages add those). */
@Component({
  selector: 'app-assessment-facts',
  imports: [DatePipe],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <dl class="facts">
      <div>
        <dt>Date</dt>
        <dd>{{ assessment().date | date: 'longDate' }}</dd>
      </div>
      <div>
        <dt>Surface</dt>
        <dd>{{ surface() }}</dd>
      </div>
      <div>
        <dt>{{ assessment().surface === 'treadmill' ? 'Belt speed' : 'Speed' }}</dt>
        <dd>{{ speed() }}</dd>
      </div>
      @if (assessment().surface === 'treadmill') {
        <div>
          <dt>Incline</dt>
          <dd>{{ assessment().inclinePercent !== null ? assessment().inclinePercent + ' %' : 'Not recorded' }}</dd>
        </div>
      }
      <div>
        <dt>Shoes</dt>
        <dd>{{ assessment().shoes || 'Not recorded' }}</dd>
      </div>
      @if (assessment().cameraNotes) {
        <div class="wide">
          <dt>Camera notes</dt>
          <dd class="pre">{{ assessment().cameraNotes }}</dd>
        </div>
      }
    </dl>
  `,
  styles: `
    .facts {
      display: flex;
      flex-wrap: wrap;
      gap: 8px 32px;
      margin: 0;
    }
    dt {
      font: var(--mat-sys-label-medium);
      color: var(--mat-sys-on-surface-variant);
    }
    dd {
      margin: 0;
      font: var(--mat-sys-body-large);
    }
    .wide {
      flex-basis: 100%;
    }
    .pre {
      white-space: pre-wrap;
    }
  `,
})
export class AssessmentFacts {
  readonly assessment = input.required<Assessment>();
  protected readonly surface = computed(() => FILM_SURFACE_LABELS[this.assessment().surface]);
  protected readonly speed = computed(() => formatSpeed(this.assessment().speedMps, this.assessment().speedUnit));
}
