import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { EXERCISE_LIBRARY_CAUTION, PLAN_CAUTION } from '../../../contracts/plans';
import { CautionNote } from '../caution-note/caution-note';

/** The caution every plan and exercise page carries; the exercise library's speaks of exercises, not "this plan". */
@Component({
  selector: 'app-plan-caution',
  imports: [CautionNote],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `<app-caution-note [text]="text()" />`,
})
export class PlanCaution {
  readonly for = input<'plan' | 'library'>('plan');
  protected readonly text = computed(() => (this.for() === 'library' ? EXERCISE_LIBRARY_CAUTION : PLAN_CAUTION));
}
