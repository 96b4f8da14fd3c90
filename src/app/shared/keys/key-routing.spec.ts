import { isPressable, isTextField, pageTakesKey } from './key-routing';

const FRAME_KEYS = new Set(['ArrowLeft', 'ArrowRight', 'Home', 'End', '[', ']', ' ']);
const take = (key: string, target: Parameters<typeof pageTakesKey>[1]) => pageTakesKey(key, target, FRAME_KEYS);

describe('isTextField', () => {
  it('is true for fields that take typing, including a Material select (combobox)', () => {
    expect(isTextField({ tagName: 'INPUT', type: 'text' })).toBe(true);
    expect(isTextField({ tagName: 'INPUT', type: 'number' })).toBe(true);
    expect(isTextField({ tagName: 'input' })).toBe(true);
    expect(isTextField({ tagName: 'TEXTAREA' })).toBe(true);
    expect(isTextField({ tagName: 'SELECT' })).toBe(true);
    expect(isTextField({ tagName: 'DIV', isContentEditable: true })).toBe(true);
    expect(isTextField({ tagName: 'MAT-SELECT', role: 'combobox' })).toBe(true);
  });

  it('is false for buttons, toggles, tabs, sliders and the canvas', () => {
    for (const t of [
      { tagName: 'BUTTON' },
      { tagName: 'BUTTON', role: 'radio' },
      { tagName: 'DIV', role: 'tab' },
      { tagName: 'INPUT', type: 'range' },
      { tagName: 'CANVAS', role: 'img' },
      { tagName: 'INPUT', type: 'checkbox' },
    ]) {
      expect(isTextField(t)).toBe(false);
    }
    expect(isTextField(null)).toBe(false);
  });
});

describe('pageTakesKey', () => {
  it('gives frame keys to the page after a click on a speed toggle, a side tab, a button or the frame slider', () => {
    const clicked = [
      { tagName: 'BUTTON', role: 'radio' }, // mat-button-toggle (speed)
      { tagName: 'DIV', role: 'tab' }, // mat-tab (side panel)
      { tagName: 'BUTTON' }, // icon button
      { tagName: 'INPUT', type: 'range' }, // the frame slider
      { tagName: 'BUTTON', role: 'checkbox' }, // multi-select toggle (chart series)
      { tagName: 'SUMMARY' },
    ];
    for (const target of clicked) {
      for (const key of ['ArrowLeft', 'ArrowRight', 'Home', 'End', '[', ']', ' '])
        expect(take(key, { ...target, focusVisible: false }), `${key} on ${JSON.stringify(target)}`).toBe(true);
    }
  });

  it('gives the arrows to the page even when a tab or toggle was reached with the keyboard', () => {
    expect(take('ArrowLeft', { tagName: 'DIV', role: 'tab', focusVisible: true })).toBe(true);
    expect(take('ArrowRight', { tagName: 'BUTTON', role: 'radio', focusVisible: true })).toBe(true);
  });

  it('leaves Space and Enter to a button reached with the keyboard, so it can still be pressed', () => {
    expect(take(' ', { tagName: 'BUTTON', focusVisible: true })).toBe(false);
    expect(take(' ', { tagName: 'DIV', role: 'tab', focusVisible: true })).toBe(false);
    expect(take('Enter', { tagName: 'BUTTON', focusVisible: false })).toBe(false);
    expect(take(' ', { tagName: 'CANVAS', role: 'img', focusVisible: true })).toBe(true);
  });

  it('leaves every key to a text field', () => {
    for (const key of ['ArrowLeft', 'ArrowRight', 'Home', '[', ' ', 'i']) {
      expect(take(key, { tagName: 'INPUT', type: 'text' })).toBe(false);
      expect(take(key, { tagName: 'MAT-SELECT', role: 'combobox' })).toBe(false);
    }
  });

  it('leaves Up and Down to tabs, toggle groups and sliders (they move between options there)', () => {
    expect(take('ArrowDown', { tagName: 'DIV', role: 'tab' })).toBe(false);
    expect(take('ArrowUp', { tagName: 'BUTTON', role: 'radio' })).toBe(false);
    expect(take('ArrowUp', { tagName: 'INPUT', type: 'range' })).toBe(false);
  });

  it('gives other keys to the page unless the control uses them', () => {
    expect(take('i', { tagName: 'BUTTON', role: 'radio' })).toBe(true);
    expect(take('i', { tagName: 'INPUT', type: 'range' })).toBe(true);
    expect(take('m', { tagName: 'BUTTON' })).toBe(true);
    expect(take('x', null)).toBe(true);
  });

  it('knows what Space presses', () => {
    expect(isPressable({ tagName: 'A' })).toBe(true);
    expect(isPressable({ tagName: 'INPUT', type: 'checkbox' })).toBe(true);
    expect(isPressable({ tagName: 'DIV', role: 'switch' })).toBe(true);
    expect(isPressable({ tagName: 'CANVAS', role: 'img' })).toBe(false);
  });
});
