import { DestroyRef } from '@angular/core';
import { FormControl, NonNullableFormBuilder, Validators } from '@angular/forms';
import { LIMITS } from '../../../contracts/intake';
import { sameAs } from '../../shared/forms/validators';

/** New password + confirmation controls with the shared length rules and a match check. */
export function passwordControls(
  fb: NonNullableFormBuilder,
  destroyRef: DestroyRef,
): { password: FormControl<string>; confirm: FormControl<string> } {
  const password = fb.control('', [
    Validators.required,
    Validators.minLength(LIMITS.passwordMin),
    Validators.maxLength(LIMITS.passwordMax),
  ]);
  const confirm = fb.control('', [Validators.required, sameAs('password')]);
  // The confirmation depends on the password: check it again whenever the password changes.
  const sub = password.valueChanges.subscribe(() => {
    if (confirm.value) confirm.updateValueAndValidity();
  });
  destroyRef.onDestroy(() => sub.unsubscribe());
  return { password, confirm };
}
