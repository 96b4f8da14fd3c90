import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, signal, viewChild } from '@angular/core';
import { FormGroupDirective, NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { firstValueFrom } from 'rxjs';
import { LIMITS } from '../../../../contracts/intake';
import { errorMessage, errorStatus, fieldProblems } from '../../../core/api-error';
import { AuthApi } from '../../../core/auth-api';
import { AuthStore } from '../../../core/auth-store';
import { ROLE_LABELS } from '../../../core/roles';
import { errorText } from '../../../shared/forms/error-text';
import { applyServerErrors } from '../../../shared/forms/server-errors';
import { passwordControls } from '../password-fields';

/** The form's password fields. */
type Field = 'currentPassword' | 'password' | 'confirm';
/** Which password fields show their text. */
type Shown = Record<Field, boolean>;

/** The three fields in order: label, what the show/hide button names, what password managers are told. */
const FIELDS: readonly { name: Field; label: string; spoken: string; autocomplete: string }[] = [
  { name: 'currentPassword', label: 'Current password', spoken: 'current password', autocomplete: 'current-password' },
  { name: 'password', label: 'New password', spoken: 'new password', autocomplete: 'new-password' },
  { name: 'confirm', label: 'Repeat new password', spoken: 'repeated password', autocomplete: 'new-password' },
];

/**
 * `/account` (every role): who is signed in, and changing one's own password with the current one.
 * A refusal keeps everything typed and says what is wrong beside the field; after a change this
 * browser stays signed in and every other one is signed out.
 */
@Component({
  selector: 'app-account-page',
  imports: [ReactiveFormsModule, MatCardModule, MatFormFieldModule, MatInputModule, MatButtonModule, MatIconModule, MatProgressBarModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './account-page.html',
  styleUrls: ['../auth-pages.scss', './account-page.scss'],
})
export class AccountPage {
  private readonly api = inject(AuthApi);
  protected readonly auth = inject(AuthStore);
  private readonly fb = inject(NonNullableFormBuilder);

  protected readonly form = this.fb.group({
    currentPassword: this.fb.control('', [Validators.required, Validators.maxLength(LIMITS.passwordMax)]),
    ...passwordControls(this.fb, inject(DestroyRef)),
  });
  /** The form's directive: resetting it also forgets that it was submitted (no "required" errors after a change). */
  private readonly formDirective = viewChild(FormGroupDirective);
  protected readonly shown = signal<Shown>({ currentPassword: false, password: false, confirm: false });
  protected readonly busy = signal(false);
  /** A refusal that belongs to no field (too many attempts, no connection…). */
  protected readonly problem = signal<string | null>(null);
  /** Whether the last change went through (cleared by the next attempt). */
  protected readonly changed = signal(false);
  protected readonly fields = FIELDS;
  protected readonly minLength = LIMITS.passwordMin;
  protected readonly errorText = errorText;
  protected readonly roleLabel = computed(() => {
    const role = this.auth.role();
    return role ? ROLE_LABELS[role] : '';
  });

  protected toggle(field: keyof Shown): void {
    this.shown.update((s) => ({ ...s, [field]: !s[field] }));
  }

  protected async submit(): Promise<void> {
    if (this.busy()) return;
    this.changed.set(false);
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.problem.set(null);
    const { currentPassword, password } = this.form.getRawValue();
    try {
      const user = await firstValueFrom(this.api.changePassword(currentPassword, password));
      await this.auth.setUser(user);
      if (this.formDirective()) this.formDirective()!.resetForm();
      else this.form.reset();
      this.shown.set({ currentPassword: false, password: false, confirm: false });
      this.changed.set(true);
    } catch (err) {
      if (errorStatus(err) === 401) return; // The session ended: the app is on its way to the sign-in page.
      if (errorStatus(err) === 422) {
        // The server names the new password `newPassword`; its field here is `password`.
        const problems = fieldProblems(err).map((p) => (p.path[0] === 'newPassword' ? { ...p, path: ['password'] } : p));
        const rest = applyServerErrors(this.form, problems);
        this.problem.set(rest.length ? rest.join(' ') : null);
      } else {
        this.problem.set(errorMessage(err));
      }
    } finally {
      this.busy.set(false);
    }
  }
}
