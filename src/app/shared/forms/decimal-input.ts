import { Directive, ElementRef, forwardRef, inject } from '@angular/core';
import { ControlValueAccessor, NG_VALUE_ACCESSOR } from '@angular/forms';

/**
 * A number as a person types it: "12.5" or "12,5" (a decimal comma), "-0.8", "−3"; empty is null.
 * Anything else is NaN (not a number), so a validator can refuse it instead of it being dropped.
 */
export function parseDecimal(text: string): number | null {
  const t = text.trim().replace(/^\u2212/, '-');
  if (t === '') return null;
  if (!/^[-+]?(\d+([.,]\d*)?|[.,]\d+)$/.test(t)) return Number.NaN;
  return Number(t.replace(',', '.'));
}

/**
 * `<input appDecimalInput formControlName="…">`: a text field (with the phone's decimal keypad)
 * holding a number or null in its control. Unlike `type="number"`, which silently drops a comma
 * ("12,5" became 125), a decimal comma is read as the decimal mark and other text stays visible
 * and reaches the control as NaN for its validator to refuse.
 */
@Directive({
  selector: 'input[appDecimalInput]',
  host: { inputmode: 'decimal', autocomplete: 'off', '(input)': 'onInput()', '(blur)': 'onTouched()' },
  providers: [{ provide: NG_VALUE_ACCESSOR, useExisting: forwardRef(() => DecimalInput), multi: true }],
})
export class DecimalInput implements ControlValueAccessor {
  private readonly input = inject<ElementRef<HTMLInputElement>>(ElementRef).nativeElement;
  private onChange: (value: number | null) => void = () => undefined;
  protected onTouched: () => void = () => undefined;

  writeValue(value: number | null | undefined): void {
    // Keep what the person typed while it means the same number ("12,50" stays, not "12.5").
    if (value !== null && value !== undefined && Object.is(parseDecimal(this.input.value), value)) return;
    this.input.value = value === null || value === undefined || Number.isNaN(value) ? '' : String(value);
  }

  registerOnChange(fn: (value: number | null) => void): void {
    this.onChange = fn;
  }

  registerOnTouched(fn: () => void): void {
    this.onTouched = fn;
  }

  setDisabledState(disabled: boolean): void {
    this.input.disabled = disabled;
  }

  protected onInput(): void {
    this.onChange(parseDecimal(this.input.value));
  }
}
