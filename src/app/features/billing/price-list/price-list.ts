import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { AbstractControl, NonNullableFormBuilder, ReactiveFormsModule, ValidationErrors, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatTableModule } from '@angular/material/table';
import { RouterLink } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import type { Currency, Price } from '../../../../contracts/billing';
import { errorMessage, errorStatus, fieldProblems } from '../../../core/api-error';
import { LeaveGuarded, LeaveWarning, UNSAVED_CHANGES_WARNING, warnBeforeUnload } from '../../../core/leave-guard';
import { ConfirmDialog, type ConfirmDialogData } from '../../../shared/confirm-dialog/confirm-dialog';
import { errorText } from '../../../shared/forms/error-text';
import { applyServerErrors } from '../../../shared/forms/server-errors';
import { requiredTrimmed } from '../../../shared/forms/validators';
import { ErrorState } from '../../../shared/states/error-state';
import { BillingApi } from '../../../core/data/billing-api';
import { amountText, money, parseAmount, parseTaxPercent, taxText } from '../../../shared/billing-words';
import { RetryKeys } from '../../../shared/retry-keys';
import { CurrencySetting } from '../currency-setting/currency-setting';

/** An amount with at most two decimals, more than zero. */
export function amountValidator(c: AbstractControl): ValidationErrors | null {
  const v = parseAmount(String(c.value ?? ''));
  if (String(c.value ?? '').trim() === '') return null;
  if (v === null) return { server: 'Enter an amount like 45.00 (at most two decimals).' };
  if (v <= 0) return { server: 'The amount must be more than zero.' };
  if (v > 100_000_000) return { server: 'The amount must be at most 1,000,000.00.' };
  return null;
}

/** Empty (no tax) or a percentage 0–100 with at most two decimals. */
export function taxValidator(c: AbstractControl): ValidationErrors | null {
  return parseTaxPercent(String(c.value ?? '')) === undefined
    ? { server: 'Enter a rate from 0 to 100 %, e.g. 20 or 7.5, or leave it empty.' }
    : null;
}

/** `/billing/prices` (owner): the clinic's price list, with a form to add or edit an entry, and the clinic's currency. */
@Component({
  selector: 'app-price-list',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    MatCardModule,
    MatTableModule,
    MatFormFieldModule,
    MatInputModule,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
    ErrorState,
    CurrencySetting,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { '(window:beforeunload)': 'onBeforeUnload($event)' },
  templateUrl: './price-list.html',
  styleUrl: './price-list.scss',
})
export class PriceList implements LeaveGuarded {
  private readonly api = inject(BillingApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);

  protected readonly prices = rxResource({ stream: () => this.api.prices() });
  protected readonly settings = rxResource({ stream: () => this.api.settings() });
  /** The clinic's currency once loaded (a resource in error throws from value(), so read it only when it has one). */
  protected readonly currency = computed(() => (this.settings.hasValue() ? this.settings.value().currency : null));
  protected readonly columns = ['item', 'amount', 'tax', 'actions'];
  protected readonly form = inject(NonNullableFormBuilder).group({
    item: ['', [requiredTrimmed, Validators.maxLength(80)]],
    description: ['', [Validators.maxLength(300)]],
    amount: ['', [Validators.required, amountValidator]],
    tax: ['', [taxValidator]],
  });
  /** The price being edited, or null when adding. */
  protected readonly editing = signal<Price | null>(null);
  protected readonly saving = signal(false);
  /** Adding the same price again after a lost answer (or a second click) adds one. */
  private readonly createKeys = new RetryKeys();
  protected readonly problem = signal<string | null>(null);
  protected readonly errorText = errorText;
  protected readonly errorMessage = errorMessage;
  protected readonly money = money;
  protected readonly taxText = taxText;

  /** Typed into the price form and not saved yet: asked before leaving. */
  leaveWarning(): LeaveWarning | null {
    return this.form.dirty ? UNSAVED_CHANGES_WARNING : null;
  }

  protected onBeforeUnload(event: BeforeUnloadEvent): void {
    warnBeforeUnload(event, this.leaveWarning());
  }

  /** The prices move to the new currency with the clinic; show them again. */
  protected onCurrencySaved(currency: Currency): void {
    this.settings.set({ currency });
    this.prices.reload();
    this.snackBar.open(`Prices are now in ${currency}`, 'OK', { duration: 3000 });
  }

  /** Applies a saved change to the shown list; when the list failed to load meanwhile, loads it again instead. */
  private changeList(change: (list: Price[]) => Price[]): void {
    if (this.prices.hasValue()) this.prices.set(change(this.prices.value()));
    else this.prices.reload();
  }

  protected edit(p: Price): void {
    this.editing.set(p);
    this.form.reset({
      item: p.item,
      description: p.description,
      amount: amountText(p.amountMinor),
      tax: p.taxRateBp === null ? '' : String(p.taxRateBp / 100),
    });
  }

  protected cancelEdit(): void {
    this.editing.set(null);
    this.form.reset();
  }

  protected async save(): Promise<void> {
    if (this.saving()) return;
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    const v = this.form.getRawValue();
    const body = {
      item: v.item.trim(),
      description: v.description.trim(),
      amountMinor: parseAmount(v.amount)!,
      taxRateBp: parseTaxPercent(v.tax) ?? null,
    };
    this.saving.set(true);
    this.problem.set(null);
    try {
      const current = this.editing();
      const saved = await firstValueFrom(
        current ? this.api.updatePrice(current.id, body) : this.api.createPrice(body, this.createKeys.for(body)),
      );
      if (!current) this.createKeys.reset();
      this.changeList((list) => [...list.filter((p) => p.id !== saved.id), saved].sort((a, b) => a.item.localeCompare(b.item)));
      this.snackBar.open(current ? `${saved.item} updated` : `${saved.item} added`, 'OK', { duration: 3000 });
      this.cancelEdit();
    } catch (err) {
      if (errorStatus(err) === 422) {
        const problems = fieldProblems(err).map((p) => ({
          ...p,
          path: p.path[0] === 'amountMinor' ? ['amount'] : p.path[0] === 'taxRateBp' ? ['tax'] : p.path,
        }));
        const rest = applyServerErrors(this.form, problems);
        this.problem.set(rest.length ? rest.join(' ') : null);
      }
    } finally {
      this.saving.set(false);
    }
  }

  protected remove(p: Price): void {
    this.dialog
      .open<ConfirmDialog, ConfirmDialogData, boolean>(ConfirmDialog, {
        data: {
          title: `Remove ${p.item}?`,
          message: 'It leaves the price list. Invoices that already use it keep their lines.',
          confirmLabel: 'Remove',
        },
      })
      .afterClosed()
      .subscribe(async (ok) => {
        if (!ok) return;
        try {
          await firstValueFrom(this.api.archivePrice(p.id));
          this.changeList((list) => list.filter((x) => x.id !== p.id));
          if (this.editing()?.id === p.id) this.cancelEdit();
        } catch {
          // Reported by the error snackbar.
        }
      });
  }
}
