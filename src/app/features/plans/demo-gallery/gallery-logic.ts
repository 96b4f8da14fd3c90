/**
 * Pure helpers of the demonstration gallery: its slides (the pictures with the clip in its place),
 * which slide a scroll position shows, where a step goes, and the words of its position ("Picture 2 of 3").
 */
import type { DemoClip, DemoPicture } from '../../../../contracts/demonstrations';

/** One slide of the gallery. */
export type DemoSlide = { kind: 'picture'; id: number; picture: DemoPicture } | { kind: 'clip'; id: number; clip: DemoClip };

/** The pictures in order with a ready clip before picture `clip.position` (after the last when larger). */
export function demoSlides(pictures: readonly DemoPicture[], clip: DemoClip | null): DemoSlide[] {
  const slides: DemoSlide[] = pictures.map((p) => ({ kind: 'picture', id: p.id, picture: p }));
  if (clip?.status === 'ready') slides.splice(Math.min(Math.max(0, clip.position), slides.length), 0, { kind: 'clip', id: -clip.id, clip });
  return slides;
}

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

/** "Picture 2 of 3", or "Clip 1 of 3" on the clip (1-based for people). */
export function positionLabel(index: number, count: number, kind: DemoSlide['kind'] = 'picture'): string {
  return `${kind === 'clip' ? 'Clip' : 'Picture'} ${index + 1} of ${count}`;
}
