import { ChangeDetectionStrategy, Component, effect, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { firstValueFrom } from 'rxjs';
import { LEGAL_LIMITS, type ClinicLegalDetails } from '../../../../contracts/billing';
import { errorMessage } from '../../../core/api-error';
import { errorText } from '../../../shared/forms/error-text';
import { saveProblem } from '../../../shared/forms/server-errors';
import { ErrorState } from '../../../shared/states/error-state';
import { ClinicSettingsApi } from '../clinic-settings-api';

/**
 * The clinic's legal details card: legal name, address, tax number and contact line, as invoices
 * and receipts print them. The server's 422s show under their fields; nothing typed is lost.
 */
@Component({
  selector: 'app-legal-details-form',
  imports: [
    ReactiveFormsModule,
    MatButtonModule,
    MatCardModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    ErrorState,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './legal-details-form.html',
  styles: `
    .card-title {
      font: var(--mat-sys-title-large);
      margin: 0 0 4px;
    }
    .intro {
      margin: 0 0 16px;
      color: var(--mat-sys-on-surface-variant);
    }
    /* Room between one field's hint and the next field's floating label. */
    mat-form-field {
      display: block;
      margin-block-end: 14px;
    }
    .actions {
      display: flex;
      justify-content: flex-end;
      align-items: center;
      gap: 12px;
    }
    .saved {
      color: var(--mat-sys-on-surface-variant);
      font: var(--mat-sys-body-medium);
    }
  `,
})
export class LegalDetailsForm {
  private readonly api = inject(ClinicSettingsApi);
  private readonly snackBar = inject(MatSnackBar);
  private readonly fb = inject(NonNullableFormBuilder);

  protected readonly L = LEGAL_LIMITS;
  protected readonly stored = rxResource({ stream: () => this.api.legalDetails() });
  protected readonly form = this.fb.group({
    legalName: this.fb.control('', [Validators.required, Validators.maxLength(LEGAL_LIMITS.legalName)]),
    address: this.fb.control('', [Validators.required, Validators.maxLength(LEGAL_LIMITS.address)]),
    taxNumber: this.fb.control('', [Validators.maxLength(LEGAL_LIMITS.taxNumber), Validators.pattern(/^[A-Za-z0-9 .\-/]*$/)]),
    contactLine: this.fb.control('', Validators.maxLength(LEGAL_LIMITS.contactLine)),
  });
  protected readonly saving = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly errorText = errorText;
  protected readonly errorMessage = errorMessage;

  constructor() {
    // Fill the form from the server once (and after a save), unless the owner is typing.
    effect(() => {
      if (this.stored.hasValue() && this.form.pristine) this.form.setValue(this.stored.value());
    });
  }

  /** Whether legal details were typed and not saved yet. */
  hasUnsavedChanges(): boolean {
    return this.form.dirty;
  }

  protected async save(): Promise<void> {
    if (this.saving()) return;
    this.problem.set(null);
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.saving.set(true);
    try {
      const saved: ClinicLegalDetails = await firstValueFrom(this.api.putLegalDetails(this.form.getRawValue()));
      this.form.reset(saved);
      this.stored.set(saved);
      this.snackBar.open('Legal details saved; new receipts carry them', 'OK', { duration: 4000 });
    } catch (err) {
      this.problem.set(saveProblem(this.form, err));
    } finally {
      this.saving.set(false);
    }
  }
}
