import { DatePipe, DOCUMENT } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { rxResource, toSignal } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatProgressSpinnerModule } from '@angular/material/progress-spinner';
import { ActivatedRoute, RouterLink } from '@angular/router';
import { firstValueFrom, map, switchMap, takeWhile, timer } from 'rxjs';
import { ASSESSMENT_KIND_LABELS } from '../../../../contracts/assessment';
import { errorMessage } from '../../../core/api-error';
import { ErrorState } from '../../../shared/states/error-state';
import { BillingApi } from '../../../core/data/billing-api';
import { money, paidText } from '../../../shared/billing-words';
import { InvoiceLinesTable } from '../invoice-lines-table/invoice-lines-table';
import { InvoiceSeller } from '../invoice-seller/invoice-seller';
import { InvoiceStatusBadge } from '../invoice-status/invoice-status';
import { payView, POLL_MS, POLL_TRIES, returnedWith } from './pay-view';

/**
 * `/portal/invoices/:id` (athlete): one of their invoices, "Pay by card" for an open one, and the
 * state after the payment page sent them back (`?checkout=success|cancel`): it reflects the
 * server's status, polling while the payment service's confirmation is on its way.
 */
@Component({
  selector: 'app-portal-invoice',
  imports: [
    DatePipe,
    RouterLink,
    MatCardModule,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
    MatProgressSpinnerModule,
    ErrorState,
    InvoiceStatusBadge,
    InvoiceLinesTable,
    InvoiceSeller,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './portal-invoice.html',
  styleUrl: './portal-invoice.scss',
})
export class PortalInvoice {
  private readonly api = inject(BillingApi);
  private readonly document = inject(DOCUMENT);

  /** Route parameter. */
  readonly id = input.required<string>();
  private readonly returned = toSignal(inject(ActivatedRoute).queryParamMap.pipe(map((q) => returnedWith(q.get('checkout')))), {
    initialValue: null,
  });
  /** The invoice, re-read every 1.5 s while a returned payment waits for the server's confirmation. */
  protected readonly kindLabels = ASSESSMENT_KIND_LABELS;
  protected readonly loaded = rxResource({
    params: () => ({ id: Number(this.id()), returned: this.returned() }),
    stream: ({ params }) =>
      timer(0, POLL_MS).pipe(
        switchMap((attempt) => this.api.invoice(params.id).pipe(map((invoice) => ({ invoice, attempt })))),
        takeWhile(({ invoice, attempt }) => payView(invoice, params.returned, attempt >= POLL_TRIES - 1) === 'waiting', true),
      ),
  });
  protected readonly view = computed(() => {
    // A resource in error throws from value(): read it only when it has one.
    if (!this.loaded.hasValue()) return null;
    const v = this.loaded.value();
    return payView(v.invoice, this.returned(), v.attempt >= POLL_TRIES - 1);
  });
  protected readonly starting = signal(false);
  protected readonly payProblem = signal<string | null>(null);
  protected readonly receiptUrl = computed(() => this.api.receiptUrl(Number(this.id())));
  protected readonly money = money;
  protected readonly paidText = paidText;
  protected readonly errorMessage = errorMessage;

  /** Opens the payment service's page for this invoice. */
  protected async pay(): Promise<void> {
    if (this.starting()) return;
    this.starting.set(true);
    this.payProblem.set(null);
    try {
      const { url } = await firstValueFrom(this.api.checkout(Number(this.id())));
      this.document.location.assign(url);
    } catch (err) {
      this.payProblem.set(errorMessage(err));
      this.starting.set(false);
    }
  }
}
