import type { Signal } from '@angular/core';
import { toObservable } from '@angular/core/rxjs-interop';
import { EMPTY, Observable, catchError, switchMap, tap } from 'rxjs';
import type { ProcessingEvent } from '../../../contracts/processing';
import type { ProcessingEvents } from '../../core/processing-events';

/** What a shared list does as it follows the athlete's progress stream. */
export interface RenderFollower {
  /** The stream (re)connected; `again` after the first connection (what finished meanwhile sent nothing). */
  connected(again: boolean): void;
  /** An item changed (the list decides with `sharedListStep` whether it is its own). */
  item(event: ProcessingEvent): void;
}

/**
 * Follows the progress stream of the athlete in `athleteId` (switching with it) for a list of
 * shared items (stills and summaries, annotated clips): every list on the page shares the one
 * connection. When live updates stop for good the list stays as it is (a reload of the page
 * brings the rest). Call in an injection context; subscribe with `takeUntilDestroyed()`.
 */
export function followRenders(events: ProcessingEvents, athleteId: Signal<number>, on: RenderFollower): Observable<unknown> {
  return toObservable(athleteId).pipe(
    switchMap((id) => {
      let connections = 0;
      return events.follow(id).pipe(
        tap((message) => (message.type === 'connected' ? on.connected(connections++ > 0) : on.item(message.event))),
        catchError(() => EMPTY),
      );
    }),
  );
}
