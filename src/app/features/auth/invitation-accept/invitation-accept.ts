import { ChangeDetectionStrategy, Component, DestroyRef, computed, effect, inject, input, signal, untracked } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Router, RouterLink } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import { LIMITS } from '../../../../contracts/intake';
import { errorStatus, fieldProblems } from '../../../core/api-error';
import { AuthApi } from '../../../core/auth-api';
import { AuthStore } from '../../../core/auth-store';
import { ROLE_LABELS, homePathFor } from '../../../core/roles';
import { errorText } from '../../../shared/forms/error-text';
import { applyServerErrors } from '../../../shared/forms/server-errors';
import { requiredTrimmed } from '../../../shared/forms/validators';
import { PublicCard } from '../../../shared/public-card/public-card';
import { passwordControls } from '../password-fields';
import { tokenProblem } from '../token-problem';

/** `/invitation/:token`: join a clinic by choosing a name and password; signs in on success. */
@Component({
  selector: 'app-invitation-accept',
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
  templateUrl: './invitation-accept.html',
  styleUrl: '../auth-pages.scss',
})
export class InvitationAccept {
  private readonly api = inject(AuthApi);
  private readonly router = inject(Router);
  protected readonly auth = inject(AuthStore);

  /** Route parameter. */
  readonly token = input.required<string>();

  protected readonly preview = rxResource({
    params: () => this.token(),
    stream: ({ params }) => this.api.previewInvitation(params),
  });
  protected readonly roleLabel = computed(() => (this.preview.hasValue() ? ROLE_LABELS[this.preview.value().role].toLowerCase() : ''));
  private readonly fb = inject(NonNullableFormBuilder);
  protected readonly form = this.fb.group({
    name: ['', [requiredTrimmed, Validators.maxLength(LIMITS.name)]],
    ...passwordControls(this.fb, inject(DestroyRef)),
  });
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly minLength = LIMITS.passwordMin;
  protected readonly errorText = errorText;
  protected readonly tokenProblem = tokenProblem;

  constructor() {
    // Start from the name the clinic entered; the invitee may correct it.
    effect(() => {
      const name = this.preview.hasValue() ? this.preview.value().name : '';
      untracked(() => {
        if (name && !this.form.controls.name.dirty) this.form.controls.name.setValue(name);
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
    const { name, password } = this.form.getRawValue();
    try {
      const user = await firstValueFrom(this.api.acceptInvitation(this.token(), { name: name.trim(), password }));
      await this.auth.setUser(user);
      await this.router.navigateByUrl(homePathFor(user.role));
    } catch (err) {
      if (errorStatus(err) === 422) {
        const rest = applyServerErrors(this.form, fieldProblems(err));
        this.problem.set(rest.length ? rest.join(' ') : null);
      } else {
        this.problem.set(tokenProblem(err, 'invitation'));
      }
    } finally {
      this.busy.set(false);
    }
  }
}
