import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { PLAN_STATUS_LABELS } from '../../../../contracts/plans';
import { errorMessage } from '../../../core/api-error';
import { PAIN_CAUTION } from '../../../shared/caution';
import { CautionNote } from '../../../shared/caution-note/caution-note';
import { EmptyState } from '../../../shared/states/empty-state';
import { ErrorState } from '../../../shared/states/error-state';
import { PlanCaution } from '../../../shared/plan-caution/plan-caution';
import { alertChipText, runningPlan, statusClass } from '../../../shared/plan-words';
import { PlansApi } from '../../../core/data/plans-api';

/**
 * An athlete's plans on their profile (staff): the running one with its alerts first, then the
 * others, and "New plan", under the plan caution. With `alertsOnly`, just the running plan's alerts
 * (above the tabs), each naming the rule that fired, with the pain caution.
 */
@Component({
  selector: 'app-athlete-plans',
  imports: [DatePipe, RouterLink, MatButtonModule, MatIconModule, MatProgressBarModule, EmptyState, ErrorState, CautionNote, PlanCaution],
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
  protected readonly alertChipText = alertChipText;
  /** Beside the alert banner: alerts point, the clinician decides. */
  protected readonly painCaution = PAIN_CAUTION;
  protected readonly statusClass = statusClass;
  protected readonly errorMessage = errorMessage;
}
