import { ChangeDetectionStrategy, Component, computed, effect, inject, input, output, signal } from '@angular/core';
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatSelectModule } from '@angular/material/select';
import { firstValueFrom } from 'rxjs';
import { CURRENCIES, type Currency } from '../../../../contracts/billing';
import { errorMessage } from '../../../core/api-error';
import { BillingApi } from '../../../core/data/billing-api';

let nextId = 0;

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
    <form [formGroup]="form" (ngSubmit)="save()" novalidate>
      <div class="row">
        <mat-form-field subscriptSizing="dynamic" class="field">
          <mat-label>Currency</mat-label>
          <mat-select formControlName="currency" [attr.aria-describedby]="refusal() ? refusalId : null">
            @for (c of currencies; track c) {
              <mat-option [value]="c">{{ c }}</mat-option>
            }
          </mat-select>
        </mat-form-field>
        <button mat-stroked-button type="submit" [disabled]="!changed() || saving()">Save</button>
      </div>
      @if (refusal(); as message) {
        <p class="refusal" role="alert" [id]="refusalId">{{ message }}</p>
      }
    </form>
  `,
  styles: `
    .row {
      display: flex;
      align-items: center;
      gap: 8px;
    }
    .field {
      inline-size: 140px;
    }
    .refusal {
      margin: 4px 0 0;
      max-inline-size: 30em;
      color: var(--mat-sys-error);
      font: var(--mat-sys-body-small);
    }
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
  /** The server's reason for refusing the last Save (e.g. invoices exist); cleared by a new choice. */
  protected readonly refusal = signal<string | null>(null);
  protected readonly refusalId = `currency-refusal-${nextId++}`;

  constructor() {
    // Follows the saved value until the owner starts choosing.
    effect(() => {
      const current = this.currency();
      if (this.control.pristine) this.control.setValue(current);
    });
    this.control.valueChanges.pipe(takeUntilDestroyed()).subscribe(() => this.refusal.set(null));
  }

  protected async save(): Promise<void> {
    if (!this.changed() || this.saving()) return;
    this.saving.set(true);
    try {
      const s = await firstValueFrom(this.api.putSettings({ currency: this.control.value }));
      this.control.markAsPristine();
      this.saved.emit(s.currency);
    } catch (err) {
      // The field turns red and the reason shows under it; the choice stays as picked.
      this.refusal.set(errorMessage(err));
      this.control.setErrors({ server: errorMessage(err) });
      this.control.markAsTouched();
    } finally {
      this.saving.set(false);
    }
  }
}
