/**
 * Pure helpers of the demonstration gallery: which picture a scroll position shows, where a step
 * goes, and the words of its position ("Picture 2 of 3").
 */

/** The index of the picture a scroll track shows, from its scroll offset and width. */
export function shownIndex(scrollLeft: number, width: number, count: number): number {
  if (count <= 0 || width <= 0) return 0;
  return Math.min(count - 1, Math.max(0, Math.round(scrollLeft / width)));
}

/** The picture a step (±1) leads to, staying within the list (no wrap: the ends are felt). */
export function steppedIndex(current: number, step: number, count: number): number {
  if (count <= 0) return 0;
  return Math.min(count - 1, Math.max(0, current + step));
}

/** "Picture 2 of 3" (1-based for people). */
export function positionLabel(index: number, count: number): string {
  return `Picture ${index + 1} of ${count}`;
}
