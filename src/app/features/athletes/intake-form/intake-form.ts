import { DatePipe } from '@angular/common';
import {
  ChangeDetectionStrategy,
  Component,
  ElementRef,
  Injector,
  afterNextRender,
  computed,
  effect,
  inject,
  input,
  output,
  signal,
  untracked,
} from '@angular/core';
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { AbstractControl, FormGroupDirective, NgForm, NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatChipsModule } from '@angular/material/chips';
import { ErrorStateMatcher } from '@angular/material/core';
import { MatDatepickerModule } from '@angular/material/datepicker';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatSliderModule } from '@angular/material/slider';
import { MatSnackBar } from '@angular/material/snack-bar';
import { firstValueFrom, map, startWith } from 'rxjs';
import type { AthleteDetail } from '../../../../contracts/api';
import {
  BODY_REGIONS,
  BODY_REGION_LABELS,
  BODY_SIDES,
  BODY_SIDE_LABELS,
  BodyRegion,
  DistanceUnit,
  INJURY_STATUSES,
  INJURY_STATUS_LABELS,
  LIMITS,
  PAIN_MAX,
  PAIN_MIN,
  SURFACES,
  SURFACE_LABELS,
} from '../../../../contracts/intake';
import { errorStatus, fieldProblems } from '../../../core/api-error';
import { PAIN_CAUTION } from '../../../shared/caution';
import { CautionNote } from '../../../shared/caution-note/caution-note';
import { toIsoMonth } from '../../../shared/dates';
import { errorText } from '../../../shared/forms/error-text';
import { applyServerErrors } from '../../../shared/forms/server-errors';
import { AthletesApi } from '../../../core/data/athletes-api';
import {
  createInjuryRow,
  createIntakeForm,
  convertDistance,
  createPainRow,
  detailToFormValue,
  distanceMax,
  formValueToIntake,
  setIntakeFormValue,
} from './intake-form-model';

/** Shows a pain row's region as invalid while it repeats another row's region. */
class DuplicateRegionMatcher implements ErrorStateMatcher {
  constructor(private readonly list: AbstractControl) {}
  isErrorState(control: AbstractControl | null, form: FormGroupDirective | NgForm | null): boolean {
    const dupes = (this.list.errors?.['duplicateRegions'] ?? []) as BodyRegion[];
    const touched = !!control && (control.touched || !!form?.submitted);
    return !!control && ((control.invalid && touched) || dupes.includes(control.value as BodyRegion));
  }
}

/**
 * The athlete intake: running background, injury history, current pain and consents.
 * Used by staff on the athlete's profile and by athletes on their own profile. Saves with
 * `PUT /api/athletes/:id/intake`; server validation problems appear on the matching fields and
 * nothing the user typed is lost.
 */
@Component({
  selector: 'app-intake-form',
  imports: [
    DatePipe,
    ReactiveFormsModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatDatepickerModule,
    MatButtonModule,
    MatButtonToggleModule,
    MatCheckboxModule,
    MatChipsModule,
    MatIconModule,
    MatSliderModule,
    MatProgressBarModule,
    CautionNote,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './intake-form.html',
  styleUrl: './intake-form.scss',
})
export class IntakeForm {
  private readonly api = inject(AthletesApi);
  private readonly snackBar = inject(MatSnackBar);
  private readonly fb = inject(NonNullableFormBuilder);
  private readonly host = inject<ElementRef<HTMLElement>>(ElementRef);
  private readonly injector = inject(Injector);

  /** The athlete whose intake this is. */
  readonly athlete = input.required<AthleteDetail>();
  /** Beside the current-pain scores. */
  protected readonly painCaution = PAIN_CAUTION;
  /** Staff see "Consents to…"; athletes see "I consent to…". */
  readonly audience = input<'staff' | 'athlete'>('staff');
  /** Emits the athlete as saved by the server. */
  readonly saved = output<AthleteDetail>();

  protected readonly form = createIntakeForm(this.fb);
  protected readonly saving = signal(false);
  protected readonly problems = signal<string[]>([]);
  protected readonly painMatcher = new DuplicateRegionMatcher(this.form.controls.pain);
  private loadedId: number | null = null;
  /** The unit the distance fields currently hold their numbers in. */
  private unitShown: DistanceUnit = 'km';
  /** True while `load` fills the form (a loaded unit is not a switch to convert). */
  private loading = false;

  /** Re-read on every form event (value, status, pristine, touched) so the template stays current. */
  private readonly snapshot = toSignal(
    this.form.events.pipe(
      startWith(null),
      map(() => ({ value: this.form.getRawValue(), dirty: this.form.dirty })),
    ),
    { requireSync: true },
  );
  protected readonly formValue = computed(() => this.snapshot().value);
  protected readonly unit = computed(() => this.formValue().distanceUnit);
  protected readonly weeklyMax = computed(() => distanceMax(LIMITS.weeklyKm, this.unit()));
  protected readonly longestMax = computed(() => distanceMax(LIMITS.longestRunKm, this.unit()));
  protected readonly usedPainRegions = computed(() => new Set(this.formValue().pain.map((p) => p.region)));
  /** Whether the form holds edits not saved yet (pages use it to warn before leaving). */
  readonly dirty = computed(() => this.snapshot().dirty);

  protected readonly today = new Date();
  protected readonly thisMonth = toIsoMonth(this.today);
  /**
   * Where the browser has a month picker the field shows the month in words ("March 2024"); where
   * it has none, a text field takes `03/2024`, `Mar 2024` or `2024-03` (the hint says so).
   */
  protected readonly monthHint = monthHint(monthInputSupported());
  protected readonly earliest = new Date(1900, 0, 1);
  protected readonly limits = LIMITS;
  protected readonly painMin = PAIN_MIN;
  protected readonly painMax = PAIN_MAX;
  protected readonly regions = BODY_REGIONS;
  protected readonly regionLabels = BODY_REGION_LABELS;
  protected readonly sides = BODY_SIDES;
  protected readonly sideLabels = BODY_SIDE_LABELS;
  protected readonly statuses = INJURY_STATUSES;
  protected readonly statusLabels = INJURY_STATUS_LABELS;
  protected readonly surfaces = SURFACES;
  protected readonly surfaceLabels = SURFACE_LABELS;
  protected readonly errorText = errorText;

  constructor() {
    // Load the athlete into the form when it is a different athlete, or when nothing is unsaved
    // (so a parent refreshing the record never wipes edits in progress).
    effect(() => {
      const athlete = this.athlete();
      untracked(() => {
        if (athlete.id !== this.loadedId || !this.form.dirty) this.load(athlete);
      });
    });
    // Switching km ↔ mi converts what is already typed (loading a record sets both at once and
    // is not a switch); the distance limits depend on the unit either way.
    this.form.controls.distanceUnit.valueChanges.pipe(takeUntilDestroyed()).subscribe((unit) => {
      const from = this.unitShown;
      this.unitShown = unit;
      const { weeklyDistance, longestRecentRun } = this.form.controls;
      if (!this.loading && from !== unit) {
        weeklyDistance.setValue(convertDistance(weeklyDistance.value, from, unit));
        longestRecentRun.setValue(convertDistance(longestRecentRun.value, from, unit));
      } else {
        weeklyDistance.updateValueAndValidity();
        longestRecentRun.updateValueAndValidity();
      }
    });
  }

  protected get injuries() {
    return this.form.controls.injuries;
  }

  protected get pain() {
    return this.form.controls.pain;
  }

  protected addInjury(): void {
    if (this.injuries.length >= LIMITS.injuries) return;
    this.injuries.push(createInjuryRow(this.fb));
    this.injuries.markAsDirty();
    this.focusLast('.injury-row');
  }

  protected removeInjury(index: number): void {
    this.injuries.removeAt(index);
    this.injuries.markAsDirty();
  }

  protected addPain(): void {
    if (this.pain.length >= BODY_REGIONS.length) return;
    this.pain.push(createPainRow(this.fb));
    this.pain.markAsDirty();
    this.focusLast('.pain-row');
  }

  protected removePain(index: number): void {
    this.pain.removeAt(index);
    this.pain.markAsDirty();
  }

  protected isDuplicatePain(index: number): boolean {
    const dupes = (this.pain.errors?.['duplicateRegions'] ?? []) as BodyRegion[];
    const region = this.pain.at(index).controls.region.value;
    return region !== null && dupes.includes(region);
  }

  protected consentLabel(kind: 'video' | 'stills'): string {
    const self = this.audience() === 'athlete';
    if (kind === 'video') {
      return self
        ? 'I consent to video recording of my running for gait analysis'
        : 'Consents to video recording of running for gait analysis';
    }
    return self
      ? 'I consent to sharing annotated stills with me through Trailframe'
      : 'Consents to sharing annotated stills with them through Trailframe';
  }

  /** Puts the saved state back, dropping unsaved edits. */
  protected discard(): void {
    this.load(this.athlete());
  }

  protected async save(): Promise<void> {
    if (this.saving()) return;
    this.problems.set([]);
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      this.problems.set(['Some fields need attention. They are highlighted below.']);
      this.focusFirstInvalid();
      return;
    }
    this.saving.set(true);
    const id = this.athlete().id;
    try {
      const saved = await firstValueFrom(this.api.saveIntake(id, formValueToIntake(this.form.getRawValue())));
      this.form.markAsPristine();
      this.load(saved);
      this.saved.emit(saved);
      this.snackBar.open('Intake saved', 'OK', { duration: 3000 });
    } catch (err) {
      if (errorStatus(err) === 422) {
        const rest = applyServerErrors(this.form, fieldProblems(err));
        this.problems.set(['The server did not accept some answers. They are highlighted below.', ...rest]);
        this.focusFirstInvalid();
      }
      // Other failures are reported by the error snackbar; the form keeps what was typed.
    } finally {
      this.saving.set(false);
    }
  }

  private load(athlete: AthleteDetail): void {
    this.loadedId = athlete.id;
    this.loading = true;
    try {
      setIntakeFormValue(this.form, this.fb, detailToFormValue(athlete));
    } finally {
      this.loading = false;
    }
    this.unitShown = this.form.controls.distanceUnit.value;
    this.problems.set([]);
  }

  private focusLast(rowSelector: string): void {
    afterNextRender(
      () => {
        const rows = this.host.nativeElement.querySelectorAll<HTMLElement>(rowSelector);
        rows[rows.length - 1]?.querySelector<HTMLElement>('mat-select, input')?.focus();
      },
      { injector: this.injector },
    );
  }

  private focusFirstInvalid(): void {
    afterNextRender(
      () => {
        const field = this.host.nativeElement.querySelector<HTMLElement>(
          '.mat-form-field-invalid input, .mat-form-field-invalid mat-select, .mat-form-field-invalid textarea',
        );
        field?.focus();
      },
      { injector: this.injector },
    );
  }
}

/** Whether this browser has its own month picker for `<input type="month">` (otherwise: plain text). */
export function monthInputSupported(doc: Document = document): boolean {
  const input = doc.createElement('input');
  input.setAttribute('type', 'month');
  return input.type === 'month';
}

/** The hint under a month field: no format to learn beside a picker, an example for typing. */
export function monthHint(picker: boolean): string {
  return picker ? 'Month and year' : 'Month and year, e.g. 03/2024 or Mar 2024';
}
