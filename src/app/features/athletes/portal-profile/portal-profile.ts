import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, signal, untracked, viewChild } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { firstValueFrom, throwError } from 'rxjs';
import type { AthleteDetail } from '../../../../contracts/api';
import { LIMITS } from '../../../../contracts/intake';
import { errorMessage, errorStatus, fieldProblems } from '../../../core/api-error';
import { AuthStore } from '../../../core/auth-store';
import { LeaveGuarded, LeaveWarning, UNSAVED_CHANGES_WARNING, warnBeforeUnload } from '../../../core/leave-guard';
import { ageOn } from '../../../shared/dates';
import { errorText } from '../../../shared/forms/error-text';
import { applyServerErrors } from '../../../shared/forms/server-errors';
import { requiredTrimmed } from '../../../shared/forms/validators';
import { ErrorState } from '../../../shared/states/error-state';
import { AthletesApi } from '../../../core/data/athletes-api';
import { IntakeForm } from '../intake-form/intake-form';

/** `/portal/profile`: the athlete's own names and intake. */
import { DataExportCard } from '../../../shared/data-export/data-export-card';
@Component({
  selector: 'app-portal-profile',
  imports: [
    DatePipe,
    ReactiveFormsModule,
    MatCardModule,
    MatFormFieldModule,
    MatInputModule,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
    ErrorState,
    IntakeForm,
    DataExportCard,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './portal-profile.html',
  styleUrl: './portal-profile.scss',
  host: { '(window:beforeunload)': 'onBeforeUnload($event)' },
})
export class PortalProfile implements LeaveGuarded {
  private readonly api = inject(AthletesApi);
  private readonly auth = inject(AuthStore);
  private readonly snackBar = inject(MatSnackBar);

  protected readonly athlete = rxResource({
    params: () => this.auth.user()?.athleteId ?? null,
    stream: ({ params }) =>
      params !== null
        ? this.api.get(params)
        : throwError(() => new Error('Your account is not linked to an athlete record. Ask your clinic to check it.')),
  });
  protected readonly detail = computed(() => (this.athlete.hasValue() ? this.athlete.value() : null));
  protected readonly age = computed(() => ageOn(this.detail()?.dateOfBirth, new Date()));

  protected readonly nameForm = inject(NonNullableFormBuilder).group({
    firstName: ['', [requiredTrimmed, Validators.maxLength(LIMITS.name)]],
    lastName: ['', [requiredTrimmed, Validators.maxLength(LIMITS.name)]],
  });
  protected readonly savingName = signal(false);
  protected readonly nameProblem = signal<string | null>(null);
  protected readonly errorText = errorText;
  protected readonly errorMessage = errorMessage;
  private readonly intakeForm = viewChild(IntakeForm);

  constructor() {
    effect(() => {
      const a = this.detail();
      untracked(() => {
        if (a && !this.nameForm.dirty) {
          this.nameForm.setValue({ firstName: a.firstName, lastName: a.lastName });
        }
      });
    });
  }

  leaveWarning(): LeaveWarning | null {
    return this.nameForm.dirty || this.intakeForm()?.dirty() ? UNSAVED_CHANGES_WARNING : null;
  }

  protected onBeforeUnload(event: BeforeUnloadEvent): void {
    warnBeforeUnload(event, this.leaveWarning());
  }

  protected async saveName(): Promise<void> {
    const current = this.detail();
    if (!current || this.savingName()) return;
    if (this.nameForm.invalid) {
      this.nameForm.markAllAsTouched();
      return;
    }
    this.savingName.set(true);
    this.nameProblem.set(null);
    const { firstName, lastName } = this.nameForm.getRawValue();
    try {
      const updated = await firstValueFrom(this.api.update(current.id, { firstName: firstName.trim(), lastName: lastName.trim() }));
      this.nameForm.markAsPristine();
      this.athlete.set(updated);
      this.snackBar.open('Name saved', 'OK', { duration: 3000 });
    } catch (err) {
      if (errorStatus(err) === 422) {
        const rest = applyServerErrors(this.nameForm, fieldProblems(err));
        this.nameProblem.set(rest.length ? rest.join(' ') : null);
      }
    } finally {
      this.savingName.set(false);
    }
  }

  protected onIntakeSaved(saved: AthleteDetail): void {
    this.athlete.set(saved);
  }
}
