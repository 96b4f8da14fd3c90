import { ChangeDetectionStrategy, Component, DestroyRef, inject, input, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router, RouterLink } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import { LIMITS } from '../../../../contracts/intake';
import { errorStatus, fieldProblems } from '../../../core/api-error';
import { AuthApi } from '../../../core/auth-api';
import { AuthStore } from '../../../core/auth-store';
import { errorText } from '../../../shared/forms/error-text';
import { applyServerErrors } from '../../../shared/forms/server-errors';
import { PublicCard } from '../../../shared/public-card/public-card';
import { passwordControls } from '../password-fields';
import { tokenProblem } from '../token-problem';

/** `/reset-password/:token`: shows whose password is being reset, then sets a new one. */
@Component({
  selector: 'app-reset-password',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    MatFormFieldModule,
    MatInputModule,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
    PublicCard,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './reset-password.html',
  styleUrl: '../auth-pages.scss',
})
export class ResetPassword {
  private readonly api = inject(AuthApi);
  private readonly router = inject(Router);
  private readonly auth = inject(AuthStore);
  private readonly snackBar = inject(MatSnackBar);

  /** Route parameter. */
  readonly token = input.required<string>();

  protected readonly preview = rxResource({
    params: () => this.token(),
    stream: ({ params }) => this.api.previewPasswordReset(params),
  });
  protected readonly form = inject(NonNullableFormBuilder).group(passwordControls(inject(NonNullableFormBuilder), inject(DestroyRef)));
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly minLength = LIMITS.passwordMin;
  protected readonly errorText = errorText;
  protected readonly tokenProblem = tokenProblem;

  protected async submit(): Promise<void> {
    if (this.busy()) return;
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.problem.set(null);
    try {
      await firstValueFrom(this.api.resetPassword(this.token(), this.form.getRawValue().password));
      // The reset ended every session of the account, perhaps this browser's: ask who is signed in now,
      // so the sign-in page opens with this message rather than "Your session has ended".
      await this.auth.refresh();
      this.snackBar.open('Password changed. Sign in with your new password.', 'OK', {
        duration: 6000,
      });
      await this.router.navigateByUrl('/sign-in');
    } catch (err) {
      if (errorStatus(err) === 422) {
        const rest = applyServerErrors(this.form, fieldProblems(err));
        this.problem.set(rest.length ? rest.join(' ') : null);
      } else {
        this.problem.set(tokenProblem(err, 'reset'));
      }
    } finally {
      this.busy.set(false);
    }
  }
}
