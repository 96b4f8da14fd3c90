import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import { LIMITS } from '../../../../contracts/intake';
import { errorMessage } from '../../../core/api-error';
import { AuthApi } from '../../../core/auth-api';
import { errorText } from '../../../shared/forms/error-text';
import { PublicCard } from '../../../shared/public-card/public-card';
import { DemoInboxNote } from '../../../shared/demo-inbox-note/demo-inbox-note';

/**
 * `/forgot-password`: asks for a reset link. The answer never says whether the account exists.
 */
@Component({
  selector: 'app-forgot-password',
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
  templateUrl: './forgot-password.html',
  styleUrl: '../auth-pages.scss',
})
export class ForgotPassword {
  private readonly api = inject(AuthApi);

  protected readonly form = inject(NonNullableFormBuilder).group({
    email: ['', [Validators.required, Validators.email, Validators.maxLength(LIMITS.email)]],
  });
  protected readonly busy = signal(false);
  protected readonly sent = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly errorText = errorText;

  protected async submit(): Promise<void> {
    if (this.busy()) return;
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.problem.set(null);
    try {
      await firstValueFrom(this.api.requestPasswordReset(this.form.getRawValue().email.trim()));
      this.sent.set(true);
    } catch (err) {
      this.problem.set(errorMessage(err));
    } finally {
      this.busy.set(false);
    }
  }
}
