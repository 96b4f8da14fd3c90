import { FormArray, FormControl, FormGroup } from '@angular/forms';
import { HttpErrorResponse } from '@angular/common/http';
import { applyServerErrors, saveProblem } from './server-errors';

function form() {
  return new FormGroup({
    goalEvent: new FormControl('10 km'),
    injuries: new FormArray([new FormGroup({ when: new FormControl('2024-13'), notes: new FormControl('sore') })]),
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

describe('saveProblem', () => {
  const answer = (status: number, error: unknown) => new HttpErrorResponse({ status, error });

  it('puts a 422 on its fields and returns only what matched no field', () => {
    const f = form();
    const err = answer(422, {
      error: {
        code: 'validation_failed',
        message: 'Check.',
        details: [
          { path: ['goalEvent'], message: 'Too long' },
          { path: ['logo'], message: 'Unknown field' },
        ],
      },
    });
    expect(saveProblem(f, err)).toBe('logo: Unknown field');
    expect(f.controls.goalEvent.errors).toEqual({ server: 'Too long' });
    expect(
      saveProblem(
        form(),
        answer(422, { error: { code: 'validation_failed', message: 'Check.', details: [{ path: ['goalEvent'], message: 'Too long' }] } }),
      ),
    ).toBeNull();
  });

  it('returns the message of any other failure, and leaves the fields alone', () => {
    const f = form();
    expect(
      saveProblem(f, answer(409, { error: { code: 'invalid_transition', message: 'The invoice changed meanwhile; reload it.' } })),
    ).toBe('The invoice changed meanwhile; reload it.');
    expect(f.controls.goalEvent.errors).toBeNull();
  });
});
