import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router, RouterLink } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import { ASSESSMENT_KIND_LABELS } from '../../../../contracts/assessment';
import type { InvoiceDetail } from '../../../../contracts/billing';
import { errorMessage } from '../../../core/api-error';
import { ConfirmDialog, type ConfirmDialogData } from '../../../shared/confirm-dialog/confirm-dialog';
import { ErrorState } from '../../../shared/states/error-state';
import { AthletesApi } from '../../../core/data/athletes-api';
import { InvitePrompt } from '../../../shared/invite-prompt/invite-prompt';
import { BillingApi } from '../../../core/data/billing-api';
import { InvoiceLinesTable } from '../invoice-lines-table/invoice-lines-table';
import { InvoiceStatusBadge } from '../invoice-status/invoice-status';
import { InvoiceSeller } from '../invoice-seller/invoice-seller';
import { PaymentDialog, type PaymentDialogData } from '../payment-dialog/payment-dialog';
import { newLogKey } from '../../../shared/plan-words';
import { PAYMENT_METHOD_WORDS, money, paidText } from '../../../shared/billing-words';

type Action = 'issue' | 'cancel' | 'refund';

const CONFIRM: Record<Action, (i: InvoiceDetail, hasAccount: boolean) => ConfirmDialogData> = {
  issue: (i, hasAccount) => ({
    title: 'Issue this invoice?',
    message: hasAccount
      ? `It gets its number and ${i.athleteName} receives an e-mail with a link to pay ${money(i.totalMinor, i.currency)} by card. Lines can no longer change.`
      : `It gets its number and ${i.athleteName} receives an e-mail with the amount (${money(i.totalMinor, i.currency)}) and how to get access to pay online; they have no Trailframe account yet. Lines can no longer change.`,
    confirmLabel: 'Issue',
  }),
  cancel: (i) => ({
    title: 'Cancel this invoice?',
    message: `${i.number ?? 'The draft'} can no longer be paid. This cannot be undone.`,
    confirmLabel: 'Cancel invoice',
    dismissLabel: 'Keep invoice',
  }),
  refund: (i) => ({
    title: 'Refund the payment?',
    message: `${money(i.totalMinor, i.currency)} goes back to ${i.athleteName}'s card through the payment service. This cannot be undone.`,
    confirmLabel: 'Refund',
  }),
};

/**
 * `/billing/invoices/:id` (owner): one invoice with the clinic's legal details, Issue, Cancel invoice,
 * Record payment (bank transfer or cash) and Refund (each confirmed); a draft also offers Edit
 * (`/billing/invoices/:id/edit`) and a confirmed Delete draft.
 */
@Component({
  selector: 'app-invoice-detail',
  imports: [
    DatePipe,
    RouterLink,
    MatCardModule,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
    ErrorState,
    InvoiceStatusBadge,
    InvoiceLinesTable,
    InvitePrompt,
    InvoiceSeller,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './invoice-detail.html',
  styleUrl: './invoice-detail.scss',
})
export class InvoiceDetailPage {
  private readonly api = inject(BillingApi);
  private readonly athletesApi = inject(AthletesApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly router = inject(Router);

  /** Route parameter. */
  readonly id = input.required<string>();
  protected readonly invoice = rxResource({ params: () => Number(this.id()), stream: ({ params }) => this.api.invoice(params) });
  /** The athlete billed: without an account, Issue prompts an invitation. */
  protected readonly athlete = rxResource({
    params: () => (this.invoice.hasValue() ? this.invoice.value().athleteId : undefined),
    stream: ({ params }) => this.athletesApi.get(params),
  });
  /** One key per act on an invoice: doing it again after a lost answer finds it done (an act happens once). */
  private readonly actKeys = new Map<string, string>();
  protected readonly busy = signal(false);
  protected readonly receiptUrl = computed(() => this.api.receiptUrl(Number(this.id())));
  protected readonly errorMessage = errorMessage;
  protected readonly money = money;
  protected readonly paidText = paidText;
  protected readonly kindLabels = ASSESSMENT_KIND_LABELS;

  protected act(action: Action, inv: InvoiceDetail): void {
    this.dialog
      .open<ConfirmDialog, ConfirmDialogData, boolean>(ConfirmDialog, {
        data: CONFIRM[action](inv, this.athlete.hasValue() ? this.athlete.value().hasAccount : true),
      })
      .afterClosed()
      .subscribe(async (ok) => {
        if (!ok) return;
        this.busy.set(true);
        try {
          const keyOf = `${inv.id}:${action}`;
          const key = this.actKeys.get(keyOf) ?? newLogKey();
          this.actKeys.set(keyOf, key);
          const updated = await firstValueFrom(this.api.act(inv.id, action, {}, key));
          this.invoice.set(updated);
          const done = {
            issue: `Issued as ${updated.number}; the athlete was e-mailed`,
            cancel: 'Invoice cancelled',
            refund: 'Payment refunded',
          }[action];
          this.snackBar.open(done, 'OK', { duration: 4000 });
        } catch {
          // The error snackbar shows the server's reason (e.g. a conflict).
          this.invoice.reload();
        } finally {
          this.busy.set(false);
        }
      });
  }

  /** Record a bank transfer or cash payment, or the refund of one (with a note): a dialog with its own fields. */
  protected openPayment(inv: InvoiceDetail, mode: PaymentDialogData['mode']): void {
    this.dialog
      .open<PaymentDialog, PaymentDialogData, InvoiceDetail>(PaymentDialog, {
        data: { invoice: inv, mode },
        width: '480px',
        maxWidth: '95vw',
      })
      .afterClosed()
      .subscribe((updated) => {
        if (!updated) return;
        this.invoice.set(updated);
        this.snackBar.open(
          mode === 'record' ? `Marked as paid: ${PAYMENT_METHOD_WORDS[updated.paymentMethod ?? 'cash'].toLowerCase()}` : 'Refund recorded',
          'OK',
          { duration: 4000 },
        );
      });
  }

  /** Whether the payment was recorded by hand (its refund is recorded too, not sent to the payment service). */
  protected manual(inv: InvoiceDetail): boolean {
    return inv.paymentMethod === 'bank_transfer' || inv.paymentMethod === 'cash';
  }

  /** Asks first, deletes the draft and goes back to the list; a refusal (409) is shown by the error snackbar. */
  protected deleteDraft(inv: InvoiceDetail): void {
    this.dialog
      .open<ConfirmDialog, ConfirmDialogData, boolean>(ConfirmDialog, {
        data: {
          title: 'Delete this draft?',
          message: `The draft for ${inv.athleteName} (${money(inv.totalMinor, inv.currency)}) is deleted with its lines. It was never sent and has no number. This cannot be undone.`,
          confirmLabel: 'Delete draft',
        },
      })
      .afterClosed()
      .subscribe(async (ok) => {
        if (!ok) return;
        this.busy.set(true);
        try {
          await firstValueFrom(this.api.deleteInvoice(inv.id));
          this.snackBar.open('Draft deleted', 'OK', { duration: 4000 });
          await this.router.navigate(['/billing/invoices']);
        } catch {
          this.invoice.reload();
        } finally {
          this.busy.set(false);
        }
      });
  }
}
