import { ChangeDetectionStrategy, Component, computed, effect, inject, signal, untracked } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatDatepickerModule } from '@angular/material/datepicker';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router, RouterLink } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import { errorStatus, fieldProblems } from '../../../core/api-error';
import { AuthStore } from '../../../core/auth-store';
import { toIsoDate } from '../../../shared/dates';
import { errorText } from '../../../shared/forms/error-text';
import { applyServerErrors } from '../../../shared/forms/server-errors';
import { notFutureDate } from '../../../shared/forms/validators';
import { athleteIdentityControls, identityPayload } from '../athlete-form-fields';
import { RetryKeys } from '../../../shared/retry-keys';
import { AthletesApi } from '../../../core/data/athletes-api';

/** `/athletes/new`: adds an athlete to the roster and opens their profile. */
@Component({
  selector: 'app-athlete-new',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    MatCardModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatDatepickerModule,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './athlete-new.html',
  styleUrl: './athlete-new.scss',
})
export class AthleteNew {
  private readonly api = inject(AthletesApi);
  private readonly router = inject(Router);
  private readonly snackBar = inject(MatSnackBar);
  private readonly auth = inject(AuthStore);
  private readonly fb = inject(NonNullableFormBuilder);

  protected readonly coaches = rxResource({ stream: () => this.api.coaches() });
  protected readonly coachOptions = computed(() => (this.coaches.hasValue() ? this.coaches.value() : []));
  protected readonly form = this.fb.group({
    ...athleteIdentityControls(this.fb),
    dateOfBirth: this.fb.control<Date | null>(null, notFutureDate()),
  });
  protected readonly today = new Date();
  protected readonly earliest = new Date(1900, 0, 1);
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly errorText = errorText;
  /** Saving the same athlete again after a lost answer (or a second click) makes one. */
  private readonly keys = new RetryKeys();

  constructor() {
    // A coach adding an athlete is usually their coach: preselect them when they are listed.
    effect(() => {
      const me = this.auth.user();
      const options = this.coachOptions();
      untracked(() => {
        const control = this.form.controls.coachId;
        if (me?.role === 'coach' && control.pristine && control.value === null) {
          if (options.some((c) => c.id === me.id)) control.setValue(me.id);
        }
      });
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
    try {
      const body = { ...identityPayload(value), dateOfBirth: toIsoDate(value.dateOfBirth) };
      const created = await firstValueFrom(this.api.create(body, this.keys.for(body)));
      this.snackBar.open(`${created.firstName} ${created.lastName} added to the roster`, 'OK', {
        duration: 4000,
      });
      await this.router.navigate(['/athletes', created.id]);
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
