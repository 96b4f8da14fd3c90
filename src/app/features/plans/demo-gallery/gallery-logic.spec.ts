import type { DemoClip, DemoPicture } from '../../../../contracts/demonstrations';
import { demoSlides, positionLabel, shownIndex, steppedIndex } from './gallery-logic';

const picture = (id: number) => ({ id }) as DemoPicture;
const clip = (position: number, status: DemoClip['status'] = 'ready') => ({ id: 5, position, status }) as DemoClip;

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
    expect(positionLabel(0, 3, 'clip')).toBe('Clip 1 of 3');
  });

  it('puts a ready clip before the picture of its place, after the last when the place is past them, and leaves out one not ready', () => {
    const kinds = (c: DemoClip | null) => demoSlides([picture(1), picture(2)], c).map((s) => (s.kind === 'clip' ? 'clip' : s.id));
    expect(kinds(clip(0))).toEqual(['clip', 1, 2]);
    expect(kinds(clip(1))).toEqual([1, 'clip', 2]);
    expect(kinds(clip(4))).toEqual([1, 2, 'clip']);
    expect(kinds(clip(0, 'processing'))).toEqual([1, 2]);
    expect(kinds(null)).toEqual([1, 2]);
    expect(demoSlides([], clip(2)).map((s) => s.kind)).toEqual(['clip']);
  });
});
