import { ChangeDetectionStrategy, Component } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { PLAN_CAUTION } from '../../../../contracts/plans';

/** The caution every plan and exercise page carries. */
@Component({
  selector: 'app-plan-caution',
  imports: [MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `<p class="caution" role="note"><mat-icon aria-hidden="true">health_and_safety</mat-icon><span>{{ text }}</span></p>`,
})
export class PlanCaution {
  protected readonly text = PLAN_CAUTION;
}
