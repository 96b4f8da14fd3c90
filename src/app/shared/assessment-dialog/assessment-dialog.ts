import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatDatepickerModule } from '@angular/material/datepicker';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { firstValueFrom, map, pairwise, startWith } from 'rxjs';
import type { Assessment } from '../../../contracts/api';
import {
  ASSESSMENT_KINDS,
  ASSESSMENT_KIND_LABELS,
  AssessmentKind,
  FILM_SURFACES,
  FILM_SURFACE_LABELS,
  INCLINE_LIMITS,
  SPEED_UNITS,
  SPEED_UNIT_LABELS,
  SpeedUnit,
} from '../../../contracts/assessment';
import type { DistanceUnit } from '../../../contracts/intake';
import { errorStatus, fieldProblems } from '../../core/api-error';
import { parseIsoDate } from '../dates';
import { errorText } from '../forms/error-text';
import { applyServerErrors } from '../forms/server-errors';
import {
  ASSESSMENT_TEXT_LIMITS,
  EARLIEST_ASSESSMENT_DATE,
  assessmentToFormValue,
  convertSpeedText,
  createAssessmentForm,
  formValueToWrite,
  isPaceUnit,
  newAssessmentValue,
  speedErrorText,
  speedLimitsText,
  syncIncline,
} from '../assessment-form-model';
import { RetryKeys } from '../retry-keys';
import { AssessmentsApi } from '../../core/data/assessments-api';

/** What the dialog edits: a new assessment of `athleteId`, or `assessment`. */
export interface AssessmentDialogData {
  athleteId: number;
  /** The assessment to edit; absent for a new one. */
  assessment?: Assessment;
  /** Kind a new assessment starts with (Re-test once a Baseline exists). */
  kind?: AssessmentKind;
  /** The athlete's distance unit: a new assessment's speed starts in km/h or mph to match. */
  distanceUnit?: DistanceUnit;
}

/** "New assessment" / "Edit assessment". Closes with the assessment as the server saved it. */
@Component({
  selector: 'app-assessment-dialog',
  imports: [
    ReactiveFormsModule,
    MatDialogModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatDatepickerModule,
    MatButtonModule,
    MatButtonToggleModule,
    MatIconModule,
    MatProgressBarModule,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './assessment-dialog.html',
  styleUrl: './assessment-dialog.scss',
})
export class AssessmentDialog {
  private readonly api = inject(AssessmentsApi);
  private readonly dialogRef = inject<MatDialogRef<AssessmentDialog, Assessment>>(MatDialogRef);
  protected readonly data = inject<AssessmentDialogData>(MAT_DIALOG_DATA);

  protected readonly editing = !!this.data.assessment;
  protected readonly form = createAssessmentForm(
    inject(NonNullableFormBuilder),
    this.data.assessment
      ? assessmentToFormValue(this.data.assessment)
      : newAssessmentValue(this.data.kind ?? 'baseline', this.data.distanceUnit ?? 'km'),
  );
  protected readonly value = toSignal(
    this.form.valueChanges.pipe(
      startWith(null),
      map(() => this.form.getRawValue()),
    ),
    { requireSync: true },
  );
  protected readonly unit = computed(() => this.value().speed.unit);
  protected readonly pace = computed(() => isPaceUnit(this.unit()));
  protected readonly speedRange = computed(() => speedLimitsText(this.unit()));
  protected readonly treadmill = computed(() => this.value().surface === 'treadmill');
  /** Adding the same visit again after a lost answer (or a second click) adds one. */
  private readonly createKeys = new RetryKeys();
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);

  protected readonly earliest = parseIsoDate(EARLIEST_ASSESSMENT_DATE);
  protected readonly kinds = ASSESSMENT_KINDS;
  protected readonly kindLabels = ASSESSMENT_KIND_LABELS;
  protected readonly surfaces = FILM_SURFACES;
  protected readonly surfaceLabels = FILM_SURFACE_LABELS;
  protected readonly units = SPEED_UNITS;
  protected readonly unitLabels = SPEED_UNIT_LABELS;
  protected readonly inclineLimits = INCLINE_LIMITS;
  protected readonly textLimits = ASSESSMENT_TEXT_LIMITS;
  protected readonly errorText = errorText;
  protected readonly speedErrorText = speedErrorText;

  constructor() {
    const { surface, speed } = this.form.controls;
    surface.valueChanges.pipe(takeUntilDestroyed()).subscribe(() => syncIncline(this.form));
    // Changing the unit converts a speed already typed (12 km/h → 7.5 mph → 8:03 min/mile).
    speed.controls.unit.valueChanges
      .pipe(startWith(speed.controls.unit.value), pairwise(), takeUntilDestroyed())
      .subscribe(([from, to]: [SpeedUnit, SpeedUnit]) => {
        speed.controls.value.setValue(convertSpeedText(speed.controls.value.value, from, to));
      });
  }

  protected async submit(): Promise<void> {
    if (this.busy()) return;
    this.problem.set(null);
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    const body = formValueToWrite(this.form.getRawValue());
    const existing = this.data.assessment;
    try {
      const saved = await firstValueFrom(
        existing ? this.api.update(existing.id, body) : this.api.create(this.data.athleteId, body, this.createKeys.for(body)),
      );
      this.dialogRef.close(saved);
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
