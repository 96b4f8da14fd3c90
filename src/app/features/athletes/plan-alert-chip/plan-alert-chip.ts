import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import type { PainAlert } from '../../../../contracts/plans';
import { alertSummary } from '../../../shared/plan-words';

/** A small warning chip for a plan's pain alerts (nothing when there are none); links to the plan. */
@Component({
  selector: 'app-plan-alert-chip',
  imports: [MatIconModule, RouterLink],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    @if (alerts().length) {
      <a
        class="plan-alert-link"
        [routerLink]="['/plans', planId()]"
        [attr.title]="details()"
        [attr.aria-label]="'Plan alert: ' + summary() + '. ' + details()"
      >
        <span class="plan-alert-chip">
          <mat-icon aria-hidden="true">warning</mat-icon>
          <span>{{ summary() }}</span>
        </span>
      </a>
    }
  `,
  styles: `
    .plan-alert-link {
      display: inline-flex;
      align-items: center;
      color: inherit;
      text-decoration: none;
    }
    /* The pill stays small; on a touch screen the link around it is 44 px tall for a finger. */
    @media (pointer: coarse) {
      .plan-alert-link {
        min-block-size: 44px;
      }
    }
    .plan-alert-chip {
      display: inline-flex;
      align-items: center;
      gap: 4px;
      padding: 2px 10px 2px 6px;
      border-radius: 999px;
      background: var(--mat-sys-error-container);
      color: var(--mat-sys-on-error-container);
      font: var(--mat-sys-label-medium);
      text-decoration: none;
      white-space: nowrap;
    }
    :host {
      display: inline-block;
    }
    .plan-alert-link:hover .plan-alert-chip {
      text-decoration: underline;
    }
    mat-icon {
      font-size: 18px;
      inline-size: 18px;
      block-size: 18px;
    }
  `,
})
export class PlanAlertChip {
  readonly alerts = input.required<readonly PainAlert[]>();
  readonly planId = input.required<number>();
  /** Short words, for narrow cells. */
  readonly compact = input(false);
  protected readonly summary = computed(() => alertSummary(this.alerts(), this.compact()));
  protected readonly details = computed(() =>
    this.alerts()
      .map((a) => a.message)
      .join(' '),
  );
}
