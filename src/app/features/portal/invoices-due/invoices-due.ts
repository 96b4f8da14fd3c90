import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { BillingApi } from '../../../core/data/billing-api';
import { amountDueText } from '../../../shared/billing-words';

/**
 * The athlete's "anything to pay?" line for the portal home's invoices card, from their own
 * invoices (`GET /api/invoices` answers only theirs): "1 invoice to pay · 78.00 EUR due 8 Dec 2026"
 * or "Nothing to pay".
 */
@Component({
  selector: 'app-invoices-due',
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    @if (summary(); as text) {
      <p class="due" [class.to-pay]="toPay()" data-testid="invoices-due">{{ text }}</p>
    } @else if (list.error()) {
      <p class="muted">Couldn't check your invoices just now.</p>
    } @else {
      <p class="muted">Checking your invoices…</p>
    }
    <p class="muted">Pay issued ones by card and download receipts.</p>
  `,
  styles: `
    :host {
      display: block;
    }
    p {
      margin: 0 0 4px;
    }
    .due {
      font: var(--mat-sys-body-large);
    }
    .to-pay {
      font-weight: 500;
    }
  `,
})
export class InvoicesDue {
  private readonly api = inject(BillingApi);
  protected readonly list = rxResource({ stream: () => this.api.invoices() });
  protected readonly summary = computed(() => (this.list.hasValue() ? amountDueText(this.list.value().invoices) : null));
  protected readonly toPay = computed(() => (this.list.hasValue() ? this.list.value().invoices.some((i) => i.status === 'issued') : false));
}
