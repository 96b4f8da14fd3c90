import { ChangeDetectionStrategy, Component } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { DecimalInput, parseDecimal } from './decimal-input';

describe('parseDecimal', () => {
  it('reads a decimal point or a decimal comma, signs, and empty as none', () => {
    expect(parseDecimal('12.5')).toBe(12.5);
    expect(parseDecimal('12,5')).toBe(12.5);
    expect(parseDecimal(' -0,8 ')).toBe(-0.8);
    expect(parseDecimal('\u22123')).toBe(-3);
    expect(parseDecimal('7.')).toBe(7);
    expect(parseDecimal(',5')).toBe(0.5);
    expect(parseDecimal('')).toBeNull();
    expect(parseDecimal('   ')).toBeNull();
  });

  it('gives NaN for what is not one number, so a validator refuses it', () => {
    for (const t of ['12,5,0', '1.250,00', 'ten', '12 5', '1e5', '--3', '.', '12.5°']) expect(parseDecimal(t)).toBeNaN();
  });
});

@Component({
  imports: [ReactiveFormsModule, DecimalInput],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `<input appDecimalInput [formControl]="control" />`,
})
class Host {
  readonly control = new FormControl<number | null>(13.8);
}

describe('DecimalInput', () => {
  it('shows the number, hands "12,5" to the control as 12.5 (not 125), and keeps what was typed', () => {
    const fixture = TestBed.createComponent(Host);
    fixture.detectChanges();
    const input = fixture.nativeElement.querySelector('input') as HTMLInputElement;
    expect(input.value).toBe('13.8');
    expect(input.getAttribute('inputmode')).toBe('decimal');

    input.value = '12,5';
    input.dispatchEvent(new Event('input'));
    expect(fixture.componentInstance.control.value).toBe(12.5);
    fixture.componentInstance.control.setValue(12.5);
    expect(input.value).toBe('12,5');

    input.value = '12;5';
    input.dispatchEvent(new Event('input'));
    expect(fixture.componentInstance.control.value).toBeNaN();
    expect(input.value).toBe('12;5');

    fixture.componentInstance.control.setValue(null);
    expect(input.value).toBe('');
    fixture.componentInstance.control.setValue(21.8);
    expect(input.value).toBe('21.8');
  });
});
