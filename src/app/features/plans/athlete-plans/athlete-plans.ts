import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { PAIN_ALERT_LABELS, PLAN_STATUS_LABELS } from '../../../../contracts/plans';
import { errorMessage } from '../../../core/api-error';
import { EmptyState } from '../../../shared/states/empty-state';
import { ErrorState } from '../../../shared/states/error-state';
import { runningPlan, statusClass } from '../plan-words';
import { PlansApi } from '../plans-api';

/**
 * An athlete's plans on their profile (staff): the running one with its alerts first, then the
 * others, and "New plan". With `alertsOnly`, just the running plan's alerts (above the tabs).
 */
@Component({
  selector: 'app-athlete-plans',
  imports: [DatePipe, RouterLink, MatButtonModule, MatIconModule, MatProgressBarModule, EmptyState, ErrorState],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './athlete-plans.html',
  styleUrl: './athlete-plans.scss',
})
export class AthletePlans {
  private readonly api = inject(PlansApi);
  readonly athleteId = input.required<number>();
  readonly alertsOnly = input(false);

  protected readonly plans = rxResource({ params: () => this.athleteId(), stream: ({ params }) => this.api.plansOf(params) });
  protected readonly rows = computed(() => (this.plans.hasValue() ? this.plans.value() : []));
  protected readonly running = computed(() => runningPlan(this.rows()));
  protected readonly statusLabels = PLAN_STATUS_LABELS;
  protected readonly alertLabels = PAIN_ALERT_LABELS;
  protected readonly statusClass = statusClass;
  protected readonly errorMessage = errorMessage;
}
