import { FormControl, Validators } from '@angular/forms';
import { errorText } from './error-text';

function controlWith(value: unknown, ...validators: Parameters<typeof Validators.compose>[0]) {
  const control = new FormControl(value, Validators.compose(validators));
  return control;
}

describe('errorText', () => {
  it('is empty for a valid control', () => {
    expect(errorText(new FormControl('ok'), 'Name')).toBe('');
  });

  it('names the field in generic messages', () => {
    expect(errorText(controlWith('', Validators.required), 'First name')).toBe('First name is required');
    expect(errorText(controlWith(250, Validators.max(230)), 'Height')).toBe('Height must be at most 230');
    expect(errorText(controlWith('abc', Validators.minLength(10)), 'Password')).toBe('Password must be at least 10 characters');
    expect(errorText(controlWith('x', Validators.email), 'E-mail')).toBe('Enter a valid e-mail address');
  });

  it('uses overrides and prefers server messages', () => {
    expect(errorText(controlWith(-1, Validators.min(0)), 'Distance', { min: 'Distance cannot be negative' })).toBe(
      'Distance cannot be negative',
    );
    const control = new FormControl('x');
    control.setErrors({ required: true, server: 'Already taken' });
    expect(errorText(control, 'E-mail')).toBe('Already taken');
  });
});
