import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import type { Exercise } from '../../../../contracts/plans';
import { EXERCISE_REGIONS, EXERCISE_REGION_LABELS, LOADING_KINDS, LOADING_KIND_LABELS } from '../../../../contracts/plans';
import { errorMessage } from '../../../core/api-error';
import { ConfirmDialog, ConfirmDialogData } from '../../../shared/confirm-dialog/confirm-dialog';
import { EmptyState } from '../../../shared/states/empty-state';
import { ErrorState } from '../../../shared/states/error-state';
import { ExerciseCard } from '../exercise-card/exercise-card';
import { ExerciseDialog } from '../exercise-dialog/exercise-dialog';
import { DemoEditorDialog } from '../demo-editor/demo-editor-dialog';
import { exerciseFilters } from '../exercise-filters';
import { PlanCaution } from '../../../shared/plan-caution/plan-caution';
import { PlansApi } from '../../../core/data/plans-api';

/** `/exercises`: the clinic's exercise library — search, filter by region and loading, add, edit, archive. */
@Component({
  selector: 'app-exercise-library',
  imports: [
    MatButtonModule,
    MatCardModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatIconModule,
    MatProgressBarModule,
    EmptyState,
    ErrorState,
    ExerciseCard,
    PlanCaution,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './exercise-library.html',
  styleUrl: './exercise-library.scss',
})
export class ExerciseLibrary {
  private readonly api = inject(PlansApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);

  protected readonly filters = exerciseFilters();
  protected readonly exercises = rxResource({ params: () => this.filters.query(), stream: ({ params }) => this.api.exercises(params) });
  protected readonly rows = computed(() => (this.exercises.hasValue() ? this.exercises.value() : []));
  protected readonly regions = EXERCISE_REGIONS;
  protected readonly regionLabels = EXERCISE_REGION_LABELS;
  protected readonly kinds = LOADING_KINDS;
  protected readonly kindLabels = LOADING_KIND_LABELS;
  protected readonly errorMessage = errorMessage;

  protected edit(exercise?: Exercise): void {
    this.dialog
      .open<ExerciseDialog, { exercise?: Exercise }, Exercise>(ExerciseDialog, {
        data: { exercise },
        width: '720px',
        maxWidth: '95vw',
        autoFocus: 'first-tabbable',
      })
      .afterClosed()
      .subscribe((saved) => {
        if (!saved) return;
        this.exercises.reload();
        this.snackBar.open(exercise ? 'Exercise saved' : `“${saved.name}” added to the library`, 'OK', { duration: 3000 });
      });
  }

  /** Opens the demonstration pictures of an exercise (add, caption, order, remove). */
  protected editPictures(exercise: Exercise): void {
    this.dialog.open<DemoEditorDialog, { exercise: Exercise }>(DemoEditorDialog, {
      data: { exercise },
      width: '720px',
      maxWidth: '95vw',
      autoFocus: 'first-tabbable',
    });
  }

  protected archive(exercise: Exercise): void {
    this.dialog
      .open<ConfirmDialog, ConfirmDialogData, boolean>(ConfirmDialog, {
        data: {
          title: `Archive “${exercise.name}”?`,
          message: 'It leaves the library; plans that already use it keep it as it is.',
          confirmLabel: 'Archive',
        },
        width: '440px',
        maxWidth: '95vw',
      })
      .afterClosed()
      .subscribe((yes) => {
        if (!yes) return;
        this.api.archiveExercise(exercise.id).subscribe(() => {
          this.exercises.reload();
          this.snackBar.open('Exercise archived', 'OK', { duration: 3000 });
        });
      });
  }
}
