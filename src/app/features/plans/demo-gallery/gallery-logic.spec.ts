import { positionLabel, shownIndex, steppedIndex } from './gallery-logic';

describe('gallery logic', () => {
  it('reads the shown picture from the scroll offset, rounding to the nearest and staying in range', () => {
    expect(shownIndex(0, 390, 3)).toBe(0);
    expect(shownIndex(390, 390, 3)).toBe(1);
    expect(shownIndex(590, 390, 3)).toBe(2); // more than half-way to the third
    expect(shownIndex(5000, 390, 3)).toBe(2);
    expect(shownIndex(-20, 390, 3)).toBe(0);
    expect(shownIndex(100, 0, 3)).toBe(0);
  });

  it('steps without wrapping', () => {
    expect(steppedIndex(0, -1, 3)).toBe(0);
    expect(steppedIndex(0, 1, 3)).toBe(1);
    expect(steppedIndex(2, 1, 3)).toBe(2);
    expect(steppedIndex(0, 1, 0)).toBe(0);
  });

  it('says the position for people', () => {
    expect(positionLabel(1, 3)).toBe('Picture 2 of 3');
  });
});
