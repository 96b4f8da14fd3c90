import { ChangeDetectionStrategy, Component, computed, effect, inject, input, output, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { filter, firstValueFrom, map, startWith } from 'rxjs';
import type { ReferenceBand } from '../../../../contracts/measures';
import { errorMessage, errorStatus, fieldProblems } from '../../../core/api-error';
import { ConfirmDialog, ConfirmDialogData } from '../../../shared/confirm-dialog/confirm-dialog';
import { DecimalInput } from '../../../shared/forms/decimal-input';
import { errorText } from '../../../shared/forms/error-text';
import { applyServerErrors } from '../../../shared/forms/server-errors';
import { BAND_TEXT_LIMITS, EVIDENCE_OPTIONS, MEASURE_LABELS, bandForm, bandWrite, unitOf } from '../band-form-model';
import { ReferenceBandsApi } from '../../../core/data/reference-bands-api';

/** One reference band as an editable card: limits, unit, context, source, evidence; save or reset. */
@Component({
  selector: 'app-band-editor',
  imports: [ReactiveFormsModule, DecimalInput, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatSelectModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './band-editor.html',
  styleUrl: './band-editor.scss',
})
export class BandEditor {
  private readonly api = inject(ReferenceBandsApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);

  readonly band = input.required<ReferenceBand>();
  /** Whether the band shown is the shipped default. */
  readonly isDefault = input(false);
  /** Whether a shipped default exists to go back to. */
  readonly hasDefault = input(true);
  /** A band being added (not saved yet). */
  readonly isNew = input(false);
  /** The server's band after a save or reset (null: the clinic's band was removed and no default exists). */
  readonly changed = output<{ key: ReferenceBand['key']; band: ReferenceBand | null }>();
  /** The new band was abandoned. */
  readonly cancelled = output<void>();

  protected readonly form = bandForm({ key: 'cadence', low: null, high: null, unit: '', context: '', source: '', evidence: 'pub' });
  protected readonly saving = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly evidenceOptions = EVIDENCE_OPTIONS;
  protected readonly limits = BAND_TEXT_LIMITS;
  protected readonly errorText = errorText;
  protected readonly notANumber = { number: 'Enter a number, e.g. 12.5 or 12,5' };
  /** The measure's unit, shown beside each limit so no number stands without one. */
  protected readonly unit = computed(() => unitOf(this.band().key));
  protected readonly title = computed(() => MEASURE_LABELS[this.band().key] ?? this.band().key);
  protected readonly dirty = toSignal(
    this.form.valueChanges.pipe(
      map(() => this.form.dirty),
      startWith(false),
    ),
    { initialValue: false },
  );
  /** Group-level problem (limits), shown under the limit fields once touched. */
  protected readonly limitsError = toSignal(
    this.form.statusChanges.pipe(
      startWith(this.form.status),
      map(() =>
        this.form.hasError('lowAboveHigh')
          ? 'The lower limit is above the upper limit.'
          : this.form.hasError('noLimits')
            ? 'Give a lower limit, an upper limit, or both.'
            : null,
      ),
    ),
    { initialValue: null },
  );

  constructor() {
    // Show the band as the server has it whenever it changes.
    effect(() => {
      const b = this.band();
      this.form.reset({ low: b.low, high: b.high, unit: unitOf(b.key), context: b.context, source: b.source, evidence: b.evidence });
    });
  }

  /** Whether the band was changed here and not saved yet. */
  hasUnsavedChanges(): boolean {
    return this.form.dirty;
  }

  protected async save(): Promise<void> {
    if (this.saving()) return;
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.saving.set(true);
    this.problem.set(null);
    try {
      const saved = await firstValueFrom(this.api.save(this.band().key, bandWrite(this.form.getRawValue())));
      this.changed.emit({ key: saved.key, band: saved });
      this.snackBar.open(`Band saved: ${this.title()}`, 'OK', { duration: 3000 });
    } catch (err) {
      if (errorStatus(err) === 422) {
        const rest = applyServerErrors(this.form, fieldProblems(err));
        this.problem.set(rest.length ? rest.join(' ') : null);
      } else {
        this.problem.set(errorMessage(err));
      }
    } finally {
      this.saving.set(false);
    }
  }

  protected discard(): void {
    if (this.isNew()) {
      this.cancelled.emit();
      return;
    }
    const b = this.band();
    this.form.reset({ low: b.low, high: b.high, unit: unitOf(b.key), context: b.context, source: b.source, evidence: b.evidence });
    this.problem.set(null);
  }

  protected confirmReset(): void {
    const withDefault = this.hasDefault();
    this.dialog
      .open<ConfirmDialog, ConfirmDialogData, boolean>(ConfirmDialog, {
        data: {
          title: withDefault ? 'Go back to the default band?' : 'Remove this band?',
          message: withDefault
            ? `The clinic's own band for ${this.title()} is dropped and the shipped default applies again.`
            : `${this.title()} has no default band; without the clinic's own band it is shown without one.`,
          confirmLabel: withDefault ? 'Reset to default' : 'Remove band',
        },
        maxWidth: '95vw',
        width: '440px',
      })
      .afterClosed()
      .pipe(filter((yes) => yes === true))
      .subscribe(() => void this.reset());
  }

  private async reset(): Promise<void> {
    this.saving.set(true);
    this.problem.set(null);
    try {
      await firstValueFrom(this.api.reset(this.band().key));
      this.changed.emit({ key: this.band().key, band: null });
      this.snackBar.open(this.hasDefault() ? `Default band restored: ${this.title()}` : `Band removed: ${this.title()}`, 'OK', {
        duration: 3000,
      });
    } catch {
      // The error snackbar says why.
    } finally {
      this.saving.set(false);
    }
  }
}
