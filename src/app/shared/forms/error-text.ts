import { AbstractControl } from '@angular/forms';

/** Messages for a control's errors; `{0}` and `{1}` are filled from the error's numbers. */
type Overrides = Partial<Record<string, string>>;

/**
 * The message to show in a field's `<mat-error>` for the control's first error.
 * `label` names the field in generic messages ("Height must be at most 230"); `overrides` replace
 * the message for a given error key. A server error (`{ server: message }`) always wins.
 */
export function errorText(control: AbstractControl | null | undefined, label: string, overrides: Overrides = {}): string {
  const errors = control?.errors;
  if (!errors) return '';
  if (typeof errors['server'] === 'string') return errors['server'];
  const key = 'required' in errors ? 'required' : Object.keys(errors)[0];
  const detail = errors[key] as Record<string, unknown> | boolean;
  const override = overrides[key];
  if (override) return override;
  const n = (name: string) => (typeof detail === 'object' && detail ? detail[name] : undefined);
  switch (key) {
    case 'required':
      return `${label} is required`;
    case 'email':
      return 'Enter a valid e-mail address';
    case 'minlength':
      return `${label} must be at least ${n('requiredLength')} characters`;
    case 'maxlength':
      return `${label} must be at most ${n('requiredLength')} characters`;
    case 'min':
      return `${label} must be at least ${n('min')}`;
    case 'max':
      return `${label} must be at most ${n('max')}`;
    case 'pattern':
      return `${label} is not in the expected format`;
    case 'mismatch':
      return 'The passwords do not match';
    case 'futureDate':
      return `${label} cannot be in the future`;
    case 'futureMonth':
      return `${label} cannot be after this month`;
    case 'wholeNumber':
      return `${label} must be a whole number`;
    case 'matDatepickerParse':
      return 'Enter a real date as day/month/year, e.g. 14/03/2024 (or 14 Mar 2024)';
    case 'matDatepickerMin':
      return `${label} is too early`;
    case 'matDatepickerMax':
      return `${label} is too late`;
    default:
      return `${label} is not valid`;
  }
}
