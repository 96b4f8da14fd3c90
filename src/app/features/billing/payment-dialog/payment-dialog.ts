import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatDatepickerModule } from '@angular/material/datepicker';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { firstValueFrom } from 'rxjs';
import { PAYMENT_NOTE_MAX, type InvoiceDetail, type ManualPaymentMethod } from '../../../../contracts/billing';
import { parseIsoDate, toIsoDate } from '../../../shared/dates';
import { errorText } from '../../../shared/forms/error-text';
import { saveProblem } from '../../../shared/forms/server-errors';
import { BillingApi } from '../../../core/data/billing-api';
import { money } from '../../../shared/billing-words';
import { newLogKey } from '../../../shared/plan-words';

/** What the dialog does: record a received payment, or a refund of one (with a note). */
export interface PaymentDialogData {
  invoice: InvoiceDetail;
  mode: 'record' | 'refund';
}

/**
 * Owner: "Record payment" — a bank transfer or cash the clinic received, the day it arrived and a
 * note (e.g. the transfer's reference) — or "Refund" of such a payment, with a note; no payment
 * service is involved. The server's 422s show under their fields; closes with the updated invoice.
 */
@Component({
  selector: 'app-payment-dialog',
  imports: [
    ReactiveFormsModule,
    MatDialogModule,
    MatButtonModule,
    MatButtonToggleModule,
    MatDatepickerModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <h2 mat-dialog-title>{{ data.mode === 'record' ? 'Record a payment' : 'Refund the payment' }}</h2>
    <form [formGroup]="form" (ngSubmit)="save()" novalidate>
      <mat-dialog-content>
        <p class="lead">
          @if (data.mode === 'record') {
            {{ data.invoice.number }} · {{ money(data.invoice.totalMinor, data.invoice.currency) }} from {{ data.invoice.athleteName }},
            paid outside the card payment page. The invoice becomes Paid and the receipt says how.
          } @else {
            {{ money(data.invoice.totalMinor, data.invoice.currency) }} goes back to {{ data.invoice.athleteName }} from the clinic (it was
            paid by {{ data.invoice.paymentMethod === 'cash' ? 'cash' : 'bank transfer' }}); this records it. No payment service is
            involved.
          }
        </p>
        @if (problem(); as p) {
          <p class="form-problem" role="alert">
            <mat-icon aria-hidden="true">error_outline</mat-icon><span>{{ p }}</span>
          </p>
        }
        @if (data.mode === 'record') {
          <div class="method" role="group" aria-labelledby="method-label">
            <span id="method-label" class="label">Paid by</span>
            <mat-button-toggle-group formControlName="method" aria-labelledby="method-label">
              <mat-button-toggle value="bank_transfer">Bank transfer</mat-button-toggle>
              <mat-button-toggle value="cash">Cash</mat-button-toggle>
            </mat-button-toggle-group>
            @if (form.controls.method.errors?.['server']; as m) {
              <p class="field-problem" role="alert">{{ m }}</p>
            }
          </div>
          <mat-form-field>
            <mat-label>Received on</mat-label>
            <input matInput [matDatepicker]="picker" formControlName="paidOn" [max]="today" required />
            <mat-datepicker-toggle matIconSuffix [for]="picker" />
            <mat-datepicker #picker />
            <mat-hint>The day the money arrived, e.g. 14/03/2024</mat-hint>
            <mat-error>{{
              errorText(form.controls.paidOn, 'The date', {
                matDatepickerMax: 'The date cannot be in the future',
              })
            }}</mat-error>
          </mat-form-field>
        }
        <mat-form-field class="note-field">
          <mat-label>Note (optional)</mat-label>
          <textarea
            matInput
            formControlName="note"
            rows="2"
            [placeholder]="data.mode === 'record' ? 'e.g. the transfer reference' : 'e.g. handed back in cash'"
          ></textarea>
          <mat-hint align="end">{{ form.controls.note.value.length }} / {{ noteMax }}</mat-hint>
          <mat-error>{{ errorText(form.controls.note, 'Note') }}</mat-error>
        </mat-form-field>
        @if (busy()) {
          <mat-progress-bar mode="indeterminate" aria-label="Saving" />
        }
      </mat-dialog-content>
      <mat-dialog-actions align="end">
        <button mat-button type="button" mat-dialog-close>Close</button>
        <button mat-flat-button type="submit" [disabled]="busy()">{{ data.mode === 'record' ? 'Mark as paid' : 'Record refund' }}</button>
      </mat-dialog-actions>
    </form>
  `,
  styles: `
    .lead {
      margin-block-start: 0;
    }
    .method {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      gap: 8px 12px;
      margin-block-end: 16px;
    }
    .label {
      font: var(--mat-sys-label-large);
    }
    .field-problem {
      flex-basis: 100%;
      margin: 0;
      color: var(--mat-sys-error);
      font: var(--mat-sys-body-small);
    }
    mat-form-field {
      display: block;
      margin-block-end: 14px;
    }
  `,
})
export class PaymentDialog {
  private readonly api = inject(BillingApi);
  private readonly ref = inject<MatDialogRef<PaymentDialog, InvoiceDetail>>(MatDialogRef);
  protected readonly data = inject<PaymentDialogData>(MAT_DIALOG_DATA);
  private readonly fb = inject(NonNullableFormBuilder);

  protected readonly today = parseIsoDate(toIsoDate(new Date())!);
  protected readonly noteMax = PAYMENT_NOTE_MAX;
  protected readonly form = this.fb.group({
    method: this.fb.control<ManualPaymentMethod>('bank_transfer'),
    paidOn: this.fb.control<Date | null>(this.today, Validators.required),
    note: this.fb.control('', Validators.maxLength(PAYMENT_NOTE_MAX)),
  });
  /** One key per dialog: saving again after a lost answer is the same payment or refund, never a second. */
  private readonly key = newLogKey();
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly money = money;
  protected readonly errorText = errorText;

  protected async save(): Promise<void> {
    if (this.busy()) return;
    this.problem.set(null);
    const record = this.data.mode === 'record';
    if (record ? this.form.invalid : this.form.controls.note.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    const v = this.form.getRawValue();
    try {
      const updated = await firstValueFrom(
        record
          ? this.api.recordPayment(this.data.invoice.id, { method: v.method, paidOn: toIsoDate(v.paidOn)!, note: v.note.trim() }, this.key)
          : this.api.act(this.data.invoice.id, 'refund', { note: v.note.trim() }, this.key),
      );
      this.ref.close(updated);
    } catch (err) {
      this.problem.set(saveProblem(this.form, err));
    } finally {
      this.busy.set(false);
    }
  }
}
