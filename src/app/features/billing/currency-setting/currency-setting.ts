import { ChangeDetectionStrategy, Component, computed, effect, inject, input, output, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatSelectModule } from '@angular/material/select';
import { firstValueFrom } from 'rxjs';
import { CURRENCIES, type Currency } from '../../../../contracts/billing';
import { errorMessage } from '../../../core/api-error';
import { errorText } from '../../../shared/forms/error-text';
import { BillingApi } from '../billing-api';

/**
 * The clinic's currency with a Save button (owner, Prices page header). The server refuses a
 * change once invoices exist in the current currency; its reason shows under the field and the
 * choice stays as picked.
 */
@Component({
  selector: 'app-currency-setting',
  imports: [ReactiveFormsModule, MatFormFieldModule, MatSelectModule, MatButtonModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <form class="currency" [formGroup]="form" (ngSubmit)="save()" novalidate>
      <mat-form-field subscriptSizing="dynamic" class="field">
        <mat-label>Currency</mat-label>
        <mat-select formControlName="currency">
          @for (c of currencies; track c) {
            <mat-option [value]="c">{{ c }}</mat-option>
          }
        </mat-select>
        <mat-error>{{ errorText(control, 'Currency') }}</mat-error>
      </mat-form-field>
      <button mat-stroked-button type="submit" [disabled]="!changed() || saving()">Save</button>
    </form>
  `,
  styles: `
    .currency { display: flex; align-items: flex-start; gap: 8px; }
    .field { inline-size: 150px; max-inline-size: 60vw; }
    .field:has(mat-error) { inline-size: min(300px, 70vw); }
    button { margin-block-start: 8px; }
  `,
})
export class CurrencySetting {
  private readonly api = inject(BillingApi);

  /** The clinic's current currency. */
  readonly currency = input.required<Currency>();
  /** Emits the new currency once the server saved it. */
  readonly saved = output<Currency>();

  protected readonly currencies = CURRENCIES;
  protected readonly control = new FormControl<Currency>('EUR', { nonNullable: true });
  protected readonly form = new FormGroup({ currency: this.control });
  private readonly picked = toSignal(this.control.valueChanges, { initialValue: this.control.value });
  /** Whether the pick differs from the saved currency. */
  protected readonly changed = computed(() => this.picked() !== this.currency());
  protected readonly saving = signal(false);
  protected readonly errorText = errorText;

  constructor() {
    // Follows the saved value until the owner starts choosing.
    effect(() => {
      const current = this.currency();
      if (this.control.pristine) this.control.setValue(current);
    });
  }

  protected async save(): Promise<void> {
    if (!this.changed() || this.saving()) return;
    this.saving.set(true);
    try {
      const s = await firstValueFrom(this.api.putSettings({ currency: this.control.value }));
      this.control.markAsPristine();
      this.saved.emit(s.currency);
    } catch (err) {
      this.control.setErrors({ server: errorMessage(err) });
      this.control.markAsTouched();
    } finally {
      this.saving.set(false);
    }
  }
}
