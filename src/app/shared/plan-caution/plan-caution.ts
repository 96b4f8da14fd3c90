import { ChangeDetectionStrategy, Component } from '@angular/core';
import { PLAN_CAUTION } from '../../../contracts/plans';
import { CautionNote } from '../caution-note/caution-note';

/** The caution every plan and exercise page carries. */
@Component({
  selector: 'app-plan-caution',
  imports: [CautionNote],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `<app-caution-note [text]="text" />`,
})
export class PlanCaution {
  protected readonly text = PLAN_CAUTION;
}
