import type { Provider } from '@angular/core';
import type { ProcessingEvent } from '../../contracts/processing';
import { EVENT_SOURCE_FACTORY } from './processing-events';

/** Stands in for the browser's EventSource in specs of pages that follow the progress stream. */
export class FakeEventSource {
  static instances: FakeEventSource[] = [];
  readyState = 0;
  onopen: (() => void) | null = null;
  onerror: (() => void) | null = null;
  private readonly listeners = new Map<string, (e: Event) => void>();
  constructor(readonly url: string) {
    FakeEventSource.instances.push(this);
  }
  addEventListener(type: string, fn: (e: Event) => void) {
    this.listeners.set(type, fn);
  }
  removeEventListener(type: string) {
    this.listeners.delete(type);
  }
  close() {
    this.readyState = 2;
  }
  open() {
    this.readyState = 1;
    this.onopen?.();
  }
  /** Sends one progress event (a clip's frames unless `subject` says otherwise). */
  send(event: Partial<ProcessingEvent> & Pick<ProcessingEvent, 'id' | 'state'>) {
    const full: ProcessingEvent = { subject: 'clip', kind: 'extract_frames', progress: null, error: null, ...event };
    this.listeners.get('item')?.(new MessageEvent('item', { data: JSON.stringify(full) }));
  }
}

/** Provides {@link FakeEventSource} as the page's EventSource (and forgets earlier instances). */
export function provideFakeEventSource(): Provider {
  FakeEventSource.instances = [];
  return { provide: EVENT_SOURCE_FACTORY, useValue: (url: string) => new FakeEventSource(url) as unknown as EventSource };
}
