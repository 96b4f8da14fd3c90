import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { firstValueFrom } from 'rxjs';
import type { Exercise } from '../../../../contracts/plans';
import { EXERCISE_REGIONS, EXERCISE_REGION_LABELS, LOADING_KINDS, LOADING_KIND_LABELS, PLAN_LIMITS } from '../../../../contracts/plans';
import { errorCode, errorMessage, errorStatus, fieldProblems } from '../../../core/api-error';
import { errorText } from '../../../shared/forms/error-text';
import { applyServerErrors } from '../../../shared/forms/server-errors';
import { DoseFields } from '../dose-fields/dose-fields';
import { PlanCaution } from '../../../shared/plan-caution/plan-caution';
import { createExerciseForm, exerciseFromForm } from '../plan-form-model';
import { RetryKeys } from '../../../shared/retry-keys';
import { PlansApi } from '../../../core/data/plans-api';

/** "New exercise" / "Edit exercise" of the library. Closes with the exercise as saved. */
@Component({
  selector: 'app-exercise-dialog',
  imports: [
    ReactiveFormsModule,
    MatDialogModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
    DoseFields,
    PlanCaution,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './exercise-dialog.html',
  styles: `
    fieldset {
      border: 0;
      padding: 0;
      margin: 0 0 8px;
    }
    legend {
      font: var(--mat-sys-title-small);
      margin-block-end: 8px;
    }
  `,
})
export class ExerciseDialog {
  private readonly api = inject(PlansApi);
  private readonly dialogRef = inject<MatDialogRef<ExerciseDialog, Exercise>>(MatDialogRef);
  protected readonly data = inject<{ exercise?: Exercise } | null>(MAT_DIALOG_DATA, { optional: true });
  protected readonly editing = !!this.data?.exercise;
  protected readonly form = createExerciseForm(inject(NonNullableFormBuilder), this.data?.exercise);
  /** Adding the same exercise again after a lost answer (or a second click) adds one. */
  private readonly createKeys = new RetryKeys();
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly regions = EXERCISE_REGIONS;
  protected readonly regionLabels = EXERCISE_REGION_LABELS;
  protected readonly kinds = LOADING_KINDS;
  protected readonly kindLabels = LOADING_KIND_LABELS;
  protected readonly L = PLAN_LIMITS;
  protected readonly errorText = errorText;

  protected async submit(): Promise<void> {
    if (this.busy()) return;
    this.problem.set(null);
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    const body = exerciseFromForm(this.form.getRawValue());
    const existing = this.data?.exercise;
    try {
      const saved = await firstValueFrom(
        existing ? this.api.updateExercise(existing.id, body) : this.api.createExercise(body, this.createKeys.for(body)),
      );
      this.dialogRef.close(saved);
    } catch (err) {
      if (errorStatus(err) === 422) {
        const rest = applyServerErrors(this.form, fieldProblems(err));
        this.problem.set(rest.length ? rest.join(' ') : 'Check the highlighted fields.');
      } else if (errorCode(err) === 'exercise_name_taken') {
        this.form.controls.name.setErrors({ server: errorMessage(err) });
        this.form.controls.name.markAsTouched();
      } else {
        this.problem.set(errorMessage(err));
      }
    } finally {
      this.busy.set(false);
    }
  }
}
