import { DestroyRef, inject, signal } from '@angular/core';
import type { ExerciseQuery, ExerciseRegion, LoadingKind } from '../../../contracts/plans';

/**
 * Search text, region and kind of the library search as signals. The text reaches `query` a
 * quarter second after the last keystroke, so typing does not send a request per letter.
 */
export function exerciseFilters(initial: ExerciseQuery = {}) {
  const text = signal(initial.q ?? '');
  const debounced = signal(initial.q ?? '');
  const region = signal<ExerciseRegion | null>(initial.region ?? null);
  const kind = signal<LoadingKind | null>(initial.kind ?? null);
  let timer: ReturnType<typeof setTimeout> | null = null;
  inject(DestroyRef).onDestroy(() => timer && clearTimeout(timer));
  return {
    text,
    region,
    kind,
    /** The query to send (text debounced). */
    query: (): ExerciseQuery => ({ q: debounced() || undefined, region: region() ?? undefined, kind: kind() ?? undefined }),
    setText(value: string): void {
      text.set(value);
      if (timer) clearTimeout(timer);
      timer = setTimeout(() => debounced.set(value.trim()), 250);
    },
    clear(): void {
      text.set('');
      debounced.set('');
      region.set(null);
      kind.set(null);
    },
    active: () => !!(text() || region() || kind()),
  };
}
