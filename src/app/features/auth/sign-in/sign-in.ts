import { ChangeDetectionStrategy, Component, inject, input, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Router, RouterLink } from '@angular/router';
import { LIMITS } from '../../../../contracts/intake';
import { errorMessage, errorStatus, fieldProblems } from '../../../core/api-error';
import { AuthStore } from '../../../core/auth-store';
import { ConfigStore } from '../../../core/config-store';
import { homePathFor, safeReturnUrl } from '../../../core/roles';
import { applyServerErrors } from '../../../shared/forms/server-errors';
import { errorText } from '../../../shared/forms/error-text';
import { PublicCard } from '../../../shared/public-card/public-card';
import { DemoInboxNote } from '../../../shared/demo-inbox-note/demo-inbox-note';

/** `/sign-in`: e-mail and password; wrong details and rate limits are reported inline. */
@Component({
  selector: 'app-sign-in',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    MatFormFieldModule,
    MatInputModule,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
    PublicCard,
    DemoInboxNote,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './sign-in.html',
  styleUrl: '../auth-pages.scss',
})
export class SignIn {
  private readonly auth = inject(AuthStore);
  private readonly router = inject(Router);
  protected readonly config = inject(ConfigStore);

  /** Where to go after signing in (query parameter, bound by the router). */
  readonly returnUrl = input<string>();

  protected readonly form = inject(NonNullableFormBuilder).group({
    email: ['', [Validators.required, Validators.email, Validators.maxLength(LIMITS.email)]],
    password: ['', [Validators.required, Validators.maxLength(LIMITS.passwordMax)]],
  });
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly showPassword = signal(false);
  protected readonly errorText = errorText;

  protected async submit(): Promise<void> {
    if (this.busy()) return;
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.problem.set(null);
    const { email, password } = this.form.getRawValue();
    try {
      const user = await this.auth.signIn(email.trim(), password);
      await this.router.navigateByUrl(safeReturnUrl(this.returnUrl(), homePathFor(user.role)));
    } catch (err) {
      if (errorStatus(err) === 422) {
        const rest = applyServerErrors(this.form, fieldProblems(err));
        this.problem.set(rest.length ? rest.join(' ') : null);
      } else {
        this.problem.set(errorMessage(err));
      }
    } finally {
      this.busy.set(false);
    }
  }
}
