import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import type { InvoiceStatus } from '../../../../contracts/billing';
import { STATUS_WORDS } from '../../../shared/billing-words';

/** A small status badge: icon and word (never colour alone). */
@Component({
  selector: 'app-invoice-status',
  imports: [MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { '[class]': '"invoice-status status-" + status()' },
  template: `<mat-icon aria-hidden="true">{{ words().icon }}</mat-icon
    >{{ words().label }}`,
  styles: `
    :host {
      display: inline-flex;
      align-items: center;
      gap: 4px;
      padding: 2px 8px;
      border-radius: 12px;
      font: var(--mat-sys-label-large);
      border: 1px solid var(--mat-sys-outline-variant);
      white-space: nowrap;
    }
    mat-icon {
      font-size: 18px;
      inline-size: 18px;
      block-size: 18px;
    }
    :host(.status-paid) {
      background: #dcefe6;
      color: #174a3c;
      border-color: #9fcbb8;
    }
    :host(.status-issued) {
      background: #fdf1dc;
      color: #6b4300;
      border-color: #e9c98f;
    }
    :host(.status-cancelled),
    :host(.status-refunded) {
      color: var(--mat-sys-on-surface-variant);
    }
  `,
})
export class InvoiceStatusBadge {
  readonly status = input.required<InvoiceStatus>();
  protected readonly words = computed(() => STATUS_WORDS[this.status()]);
}
