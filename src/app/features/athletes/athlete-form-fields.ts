import { NonNullableFormBuilder, Validators } from '@angular/forms';
import type { AthleteCreate } from '../../../contracts/api';
import { LIMITS } from '../../../contracts/intake';
import { requiredTrimmed } from '../../shared/forms/validators';

/** First name, last name and optional e-mail with the shared limits. */
export function athleteIdentityControls(fb: NonNullableFormBuilder) {
  return {
    firstName: fb.control('', [requiredTrimmed, Validators.maxLength(LIMITS.name)]),
    lastName: fb.control('', [requiredTrimmed, Validators.maxLength(LIMITS.name)]),
    email: fb.control('', [Validators.email, Validators.maxLength(LIMITS.email)]),
    coachId: fb.control<number | null>(null),
  };
}

/** Trims text and turns an empty e-mail into null, the way the API stores "no e-mail". */
export function identityPayload(value: {
  firstName: string;
  lastName: string;
  email: string;
  coachId: number | null;
}): Required<Pick<AthleteCreate, 'firstName' | 'lastName' | 'email' | 'coachId'>> {
  const email = value.email.trim();
  return {
    firstName: value.firstName.trim(),
    lastName: value.lastName.trim(),
    email: email === '' ? null : email,
    coachId: value.coachId,
  };
}
