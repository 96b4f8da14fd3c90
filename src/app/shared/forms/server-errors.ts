import { AbstractControl } from '@angular/forms';
import { errorMessage, errorStatus, fieldProblems, type FieldProblem } from '../../core/api-error';

/**
 * Puts a 422 answer's field problems onto the form as `{ server: message }` errors, marks those
 * controls touched so their `<mat-error>` shows, and leaves every value as the user typed it.
 * The error clears by itself when the user edits the field (validators run again).
 *
 * `prefix` is dropped from the start of each path when present (e.g. a body nested under a key).
 * Returns the messages that matched no control, for a summary above the form.
 */
export function applyServerErrors(
  form: AbstractControl,
  problems: readonly FieldProblem[],
  prefix: readonly (string | number)[] = [],
): string[] {
  const unmatched: string[] = [];
  for (const problem of problems) {
    let path = [...problem.path];
    if (prefix.length && prefix.every((p, i) => path[i] === p)) path = path.slice(prefix.length);
    const control = path.length ? form.get(path) : null;
    if (control) {
      control.setErrors({ ...(control.errors ?? {}), server: problem.message });
      control.markAsTouched();
      // Group- or list-level problems have no field to show them under: list them as well.
      if ('controls' in control) unmatched.push(problem.message);
    } else {
      const where = problem.path.length ? `${problem.path.join('.')}: ` : '';
      unmatched.push(`${where}${problem.message}`);
    }
  }
  return unmatched;
}

/**
 * What to say above a form after a failed save: a 422's field problems go onto the form (see
 * {@link applyServerErrors}) and only those that matched no field are returned as text (null when
 * all did); any other failure is its message.
 */
export function saveProblem(form: AbstractControl, err: unknown): string | null {
  if (errorStatus(err) !== 422) return errorMessage(err);
  const rest = applyServerErrors(form, fieldProblems(err));
  return rest.length ? rest.join(' ') : null;
}
