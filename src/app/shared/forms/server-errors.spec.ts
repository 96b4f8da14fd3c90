import { FormArray, FormControl, FormGroup } from '@angular/forms';
import { applyServerErrors } from './server-errors';

function form() {
  return new FormGroup({
    goalEvent: new FormControl('10 km'),
    injuries: new FormArray([
      new FormGroup({ when: new FormControl('2024-13'), notes: new FormControl('sore') }),
    ]),
  });
}

describe('applyServerErrors', () => {
  it('puts each message on the control its path names and keeps the values', () => {
    const f = form();
    const rest = applyServerErrors(f, [
      { path: ['injuries', 0, 'when'], message: 'Month must be YYYY-MM' },
      { path: ['goalEvent'], message: 'Too long' },
    ]);
    expect(rest).toEqual([]);
    const when = f.get(['injuries', 0, 'when'])!;
    expect(when.errors).toEqual({ server: 'Month must be YYYY-MM' });
    expect(when.touched).toBe(true);
    expect(when.value).toBe('2024-13');
    expect(f.controls.goalEvent.errors).toEqual({ server: 'Too long' });
    expect(f.invalid).toBe(true);
  });

  it('returns the messages that match no field', () => {
    const rest = applyServerErrors(form(), [
      { path: ['unknownField'], message: 'Nope' },
      { path: [], message: 'General problem' },
    ]);
    expect(rest).toEqual(['unknownField: Nope', 'General problem']);
  });

  it('also lists problems about a whole list or group', () => {
    const rest = applyServerErrors(form(), [{ path: ['injuries'], message: 'Too many injuries' }]);
    expect(rest).toEqual(['Too many injuries']);
  });

  it('drops a leading prefix from paths', () => {
    const f = form();
    applyServerErrors(f, [{ path: ['body', 'goalEvent'], message: 'Bad' }], ['body']);
    expect(f.controls.goalEvent.errors).toEqual({ server: 'Bad' });
  });

  it('clears once the user edits the field', () => {
    const f = form();
    applyServerErrors(f, [{ path: ['goalEvent'], message: 'Bad' }]);
    f.controls.goalEvent.setValue('Half marathon');
    expect(f.controls.goalEvent.errors).toBeNull();
  });
});
