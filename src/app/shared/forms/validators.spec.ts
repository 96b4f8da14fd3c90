import { FormControl, FormGroup } from '@angular/forms';
import { notFutureDate, pastMonth, requiredTrimmed, sameAs } from './validators';

const today = () => new Date(2025, 5, 15); // 15 June 2025

describe('sameAs', () => {
  it('flags a confirmation that differs from the password', () => {
    const group = new FormGroup({
      password: new FormControl('correct horse battery'),
      confirm: new FormControl('', sameAs('password')),
    });
    group.controls.confirm.setValue('something else');
    expect(group.controls.confirm.errors).toEqual({ mismatch: true });
    group.controls.confirm.setValue('correct horse battery');
    expect(group.controls.confirm.errors).toBeNull();
  });

  it('leaves an empty confirmation to the required validator', () => {
    const group = new FormGroup({ password: new FormControl('x'), confirm: new FormControl('', sameAs('password')) });
    group.controls.confirm.updateValueAndValidity();
    expect(group.controls.confirm.errors).toBeNull();
  });
});

describe('notFutureDate', () => {
  const validate = (value: Date | null) => notFutureDate(today)(new FormControl(value));

  it('accepts today and earlier, refuses tomorrow', () => {
    expect(validate(new Date(2025, 5, 15, 23, 59))).toBeNull();
    expect(validate(new Date(1980, 0, 1))).toBeNull();
    expect(validate(new Date(2025, 5, 16))).toEqual({ futureDate: true });
    expect(validate(null)).toBeNull();
  });
});

describe('pastMonth', () => {
  const validate = (value: string) => pastMonth(today)(new FormControl(value));

  it('accepts YYYY-MM (a month picker) and typed months (03/2024, Mar 2024) up to this month', () => {
    expect(validate('2025-06')).toBeNull();
    expect(validate('06/2025')).toBeNull();
    expect(validate('Jun 2025')).toBeNull();
    expect(validate('November 2019')).toBeNull();
    expect(validate('2019-11')).toBeNull();
    expect(validate('')).toBeNull();
  });

  it('refuses later months and other shapes', () => {
    expect(validate('2025-07')).toEqual({ futureMonth: true });
    expect(validate('2025-13')).toMatchObject({ pattern: expect.anything() });
    expect(validate('07/2025')).toEqual({ futureMonth: true });
    expect(validate('00/2025')).toMatchObject({ pattern: expect.anything() });
    expect(validate('Ju 2025')).toMatchObject({ pattern: expect.anything() });
    expect(validate('2025-6')).toMatchObject({ pattern: expect.anything() });
  });
});

describe('requiredTrimmed', () => {
  it('treats spaces as empty', () => {
    expect(requiredTrimmed(new FormControl('   '))).toEqual({ required: true });
    expect(requiredTrimmed(new FormControl(' Ana '))).toBeNull();
  });
});
