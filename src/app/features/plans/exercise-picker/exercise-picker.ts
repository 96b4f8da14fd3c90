import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import type { Exercise, LoadingKind } from '../../../../contracts/plans';
import { EXERCISE_REGIONS, EXERCISE_REGION_LABELS, LOADING_KINDS, LOADING_KIND_LABELS } from '../../../../contracts/plans';
import { errorMessage } from '../../../core/api-error';
import { EmptyState } from '../../../shared/states/empty-state';
import { ErrorState } from '../../../shared/states/error-state';
import { exerciseFilters } from '../exercise-filters';
import { formatDose } from '../../../shared/plan-words';
import { PlansApi } from '../../../core/data/plans-api';

export interface ExercisePickerData {
  /** Where the exercise goes, for the title (e.g. the stage name). */
  stageName: string;
  /** Kind to filter by at first (e.g. isometric for a holds stage). */
  kind?: LoadingKind;
  /** Exercises already in the stage (shown as added). */
  chosenIds: number[];
}

/** Search the library by text, region and loading kind, and pick one exercise for a stage. */
@Component({
  selector: 'app-exercise-picker',
  imports: [
    MatDialogModule,
    MatButtonModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatIconModule,
    MatProgressBarModule,
    EmptyState,
    ErrorState,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './exercise-picker.html',
  styleUrl: './exercise-picker.scss',
})
export class ExercisePicker {
  private readonly api = inject(PlansApi);
  private readonly dialogRef = inject<MatDialogRef<ExercisePicker, Exercise>>(MatDialogRef);
  protected readonly data = inject<ExercisePickerData>(MAT_DIALOG_DATA);
  protected readonly filters = exerciseFilters({ kind: this.data.kind });
  protected readonly results = rxResource({ params: () => this.filters.query(), stream: ({ params }) => this.api.exercises(params) });
  protected readonly rows = computed(() => (this.results.hasValue() ? this.results.value() : []));
  protected readonly regions = EXERCISE_REGIONS;
  protected readonly regionLabels = EXERCISE_REGION_LABELS;
  protected readonly kinds = LOADING_KINDS;
  protected readonly kindLabels = LOADING_KIND_LABELS;
  protected readonly formatDose = formatDose;
  protected readonly errorMessage = errorMessage;

  protected chosen(e: Exercise): boolean {
    return this.data.chosenIds.includes(e.id);
  }

  protected pick(e: Exercise): void {
    this.dialogRef.close(e);
  }
}
