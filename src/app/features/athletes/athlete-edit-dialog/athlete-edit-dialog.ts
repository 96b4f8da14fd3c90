import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { firstValueFrom } from 'rxjs';
import type { AthleteDetail } from '../../../../contracts/api';
import { LIMITS } from '../../../../contracts/intake';
import { errorMessage, errorStatus, fieldProblems } from '../../../core/api-error';
import { errorText } from '../../../shared/forms/error-text';
import { applyServerErrors } from '../../../shared/forms/server-errors';
import { athleteIdentityControls, identityPayload } from '../athlete-form-fields';
import { AthletesApi } from '../../../core/data/athletes-api';

/** "Edit details": names, e-mail, coach and coach notes. Closes with the updated athlete. */
@Component({
  selector: 'app-athlete-edit-dialog',
  imports: [
    ReactiveFormsModule,
    MatDialogModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './athlete-edit-dialog.html',
  styleUrl: './athlete-edit-dialog.scss',
})
export class AthleteEditDialog {
  private readonly api = inject(AthletesApi);
  private readonly dialogRef = inject<MatDialogRef<AthleteEditDialog, AthleteDetail>>(MatDialogRef);
  private readonly fb = inject(NonNullableFormBuilder);
  protected readonly athlete = inject<AthleteDetail>(MAT_DIALOG_DATA);

  protected readonly coaches = rxResource({ stream: () => this.api.coaches() });
  protected readonly errorMessage = errorMessage;
  protected readonly coachOptions = computed(() => {
    const list = this.coaches.hasValue() ? this.coaches.value() : [];
    // Keep the current coach selectable even if the list no longer includes them.
    const current = this.athlete.coachId;
    return current !== null && !list.some((c) => c.id === current)
      ? [...list, { id: current, name: this.athlete.coachName ?? 'Current coach' }]
      : list;
  });
  protected readonly form = this.fb.group({
    ...athleteIdentityControls(this.fb),
    notes: this.fb.control('', Validators.maxLength(LIMITS.notes)),
  });
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly notesMax = LIMITS.notes;
  protected readonly errorText = errorText;

  constructor() {
    this.form.setValue({
      firstName: this.athlete.firstName,
      lastName: this.athlete.lastName,
      email: this.athlete.email ?? '',
      coachId: this.athlete.coachId,
      notes: this.athlete.notes ?? '',
    });
  }

  protected async submit(): Promise<void> {
    if (this.busy()) return;
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.problem.set(null);
    const value = this.form.getRawValue();
    const notes = value.notes.trim();
    try {
      const updated = await firstValueFrom(this.api.update(this.athlete.id, { ...identityPayload(value), notes: notes || null }));
      this.dialogRef.close(updated);
    } catch (err) {
      if (errorStatus(err) === 422) {
        const rest = applyServerErrors(this.form, fieldProblems(err));
        this.problem.set(rest.length ? rest.join(' ') : 'Check the highlighted fields.');
      }
    } finally {
      this.busy.set(false);
    }
  }
}
