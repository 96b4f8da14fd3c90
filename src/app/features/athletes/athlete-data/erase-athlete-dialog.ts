import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import type { ErasureResult } from '../../../../contracts/privacy';
import { errorMessage, fieldProblems } from '../../../core/api-error';
import { PrivacyApi } from '../../../core/data/privacy-api';
import { CautionNote } from '../../../shared/caution-note/caution-note';
import { ERASURE_CAUTION } from '../../../shared/caution';

/** Who is to be erased. */
export interface EraseAthleteData {
  athleteId: number;
  fullName: string;
  keptInvoiceCount: number;
}

/** Erasure of an athlete, confirmed by typing their full name. Closes with the {@link ErasureResult}. */
@Component({
  selector: 'app-erase-athlete-dialog',
  imports: [FormsModule, MatButtonModule, MatDialogModule, MatFormFieldModule, MatInputModule, MatProgressBarModule, CautionNote],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <h2 mat-dialog-title>Erase {{ data.fullName }}?</h2>
    <form (ngSubmit)="erase()" novalidate>
      <mat-dialog-content>
        <p>
          This removes the profile and intake, consents, visits, every clip and its marks and measures, stills, summaries, annotated clips,
          plans and logs, exports and the audit entries about them, and ends the athlete's sign-in.
        </p>
        @if (data.keptInvoiceCount > 0) {
          <p>
            {{ data.keptInvoiceCount }} invoice{{ data.keptInvoiceCount === 1 ? '' : 's' }} stay{{ data.keptInvoiceCount === 1 ? 's' : '' }}
            for the clinic's records, showing a reference instead of the name.
          </p>
        }
        <app-caution-note [text]="caution" />
        <mat-form-field class="full">
          <mat-label>Type “{{ data.fullName }}” to confirm</mat-label>
          <input matInput name="confirmName" [(ngModel)]="typed" autocomplete="off" required />
          @if (problem(); as p) {
            <mat-hint class="problem" role="alert">{{ p }}</mat-hint>
          }
        </mat-form-field>
        @if (busy()) {
          <mat-progress-bar mode="indeterminate" aria-label="Erasing" />
        }
      </mat-dialog-content>
      <mat-dialog-actions align="end">
        <button mat-button type="button" mat-dialog-close>Keep athlete</button>
        <button mat-flat-button type="submit" class="danger" [disabled]="busy() || !typed.trim()">Erase for good</button>
      </mat-dialog-actions>
    </form>
  `,
  styles: `
    .full {
      width: 100%;
      margin-top: 12px;
    }
    .problem {
      color: var(--mat-sys-error);
    }
    .danger {
      --mat-button-filled-container-color: var(--mat-sys-error);
      --mat-button-filled-label-text-color: var(--mat-sys-on-error);
    }
  `,
})
export class EraseAthleteDialog {
  protected readonly data = inject<EraseAthleteData>(MAT_DIALOG_DATA);
  private readonly ref = inject<MatDialogRef<EraseAthleteDialog, ErasureResult>>(MatDialogRef);
  private readonly api = inject(PrivacyApi);
  protected readonly caution = ERASURE_CAUTION;
  protected typed = '';
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);

  protected erase(): void {
    // Enter twice, or a double click, before the button shows disabled: one request.
    if (this.busy() || !this.typed.trim()) return;
    this.busy.set(true);
    this.problem.set(null);
    this.api.erase(this.data.athleteId, this.typed).subscribe({
      next: (result) => this.ref.close(result),
      error: (err: unknown) => {
        this.busy.set(false);
        this.problem.set(fieldProblems(err)[0]?.message ?? errorMessage(err));
      },
    });
  }
}
