import { Injectable, InjectionToken, inject } from '@angular/core';
import { Observable, defer, share, startWith } from 'rxjs';
import { PROCESSING_EVENT, type ProcessingEvent } from '../../contracts/processing';

/** What the progress stream reports: it (re)connected, or an item changed. */
export type ProcessingMessage = { type: 'connected' } | { type: 'item'; event: ProcessingEvent };

/** `EventSource.CLOSED` (spelled out so tests without `EventSource` can load this file). */
const EVENT_SOURCE_CLOSED = 2;

/** Makes the `EventSource` behind {@link ProcessingEvents} (tests swap in a fake). */
export const EVENT_SOURCE_FACTORY = new InjectionToken<(url: string) => EventSource>('EVENT_SOURCE_FACTORY', {
  providedIn: 'root',
  factory: () => (url: string) => new EventSource(url),
});

/**
 * The one progress stream of an athlete's processed items (clips' frames, stills, visit
 * summaries), followed the same way by every page that shows them: one server-sent-events
 * connection per athlete, shared by every subscriber on the page and closed when the last one
 * leaves. Emits `connected` on every (re)connection: the server then sends every unfinished item
 * once, but not what finished while the connection was down, so subscribers reload their lists
 * after a reconnection. The browser reconnects by itself; the stream errors only when the server
 * refuses it for good.
 */
@Injectable({ providedIn: 'root' })
export class ProcessingEvents {
  private readonly eventSource = inject(EVENT_SOURCE_FACTORY);
  private readonly streams = new Map<string, Observable<ProcessingMessage>>();

  follow(athleteId: number): Observable<ProcessingMessage> {
    return this.stream(`/api/athletes/${athleteId}/processing-events`);
  }

  /** The same stream for the clinic's own items, about no athlete (exercises' demonstration clips; staff). */
  followClinic(): Observable<ProcessingMessage> {
    return this.stream('/api/clinic/processing-events');
  }

  private stream(url: string): Observable<ProcessingMessage> {
    let stream = this.streams.get(url);
    if (!stream) {
      const state = { open: false };
      const shared = this.open(url, state).pipe(share());
      // A subscriber joining an open connection hears `connected` too (as its first connection).
      stream = defer(() => (state.open ? shared.pipe(startWith<ProcessingMessage>({ type: 'connected' })) : shared));
      this.streams.set(url, stream);
    }
    return stream;
  }

  private open(url: string, state: { open: boolean }): Observable<ProcessingMessage> {
    return new Observable<ProcessingMessage>((subscriber) => {
      const source = this.eventSource(url);
      const onItem = (message: Event) => {
        try {
          subscriber.next({ type: 'item', event: JSON.parse((message as MessageEvent<string>).data) as ProcessingEvent });
        } catch {
          // A malformed message is skipped; the next change or reconnection brings the truth.
        }
      };
      source.addEventListener(PROCESSING_EVENT, onItem);
      source.onopen = () => {
        state.open = true;
        subscriber.next({ type: 'connected' });
      };
      source.onerror = () => {
        state.open = false;
        // CONNECTING: the browser is retrying. CLOSED: it gave up (e.g. a 401/404 answer).
        if (source.readyState === EVENT_SOURCE_CLOSED) {
          subscriber.error(new Error('Live updates stopped. Reload the page to see the latest state.'));
        }
      };
      return () => {
        state.open = false;
        source.removeEventListener(PROCESSING_EVENT, onItem);
        source.onopen = null;
        source.onerror = null;
        source.close();
      };
    });
  }
}
