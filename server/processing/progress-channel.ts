import { EventEmitter } from 'node:events';
import type { ProcessingEvent } from '../../src/contracts/processing';

/** A change of a processed item, addressed to the athlete its subject belongs to (null: the clinic's own subject, for its staff). */
export interface ProgressNotice {
  event: ProcessingEvent;
  athleteId: number | null;
  clinicId: number;
  /** Whether the athlete themself may see it (their clips: yes; renders of what is not yet shared: no). */
  athleteSees: boolean;
}

/**
 * The one progress channel: every kind's state changes and progress go through `publish`, and
 * every stream to a browser listens through `subscribe`. In-process now
 * ({@link inProcessProgressChannel}); workers in other processes reach it through the database
 * relay (`progress-relay.ts`). A cross-process implementation (PostgreSQL LISTEN/NOTIFY) would
 * publish with NOTIFY and subscribe with LISTEN behind the same two calls.
 */
export interface ProgressChannel {
  publish(notice: ProgressNotice): void;
  /** Calls `listener` with every notice about the athlete's subjects until the returned function is called. */
  subscribe(athleteId: number, listener: (notice: ProgressNotice) => void): () => void;
  /** Calls `listener` with every notice about the clinic's own subjects (no athlete) until the returned function is called. */
  subscribeClinic(clinicId: number, listener: (notice: ProgressNotice) => void): () => void;
}

/** {@link ProgressChannel} within one process (an event emitter keyed by athlete, or by clinic for its own subjects). */
export function inProcessProgressChannel(): ProgressChannel {
  const bus = new EventEmitter();
  bus.setMaxListeners(0);
  return {
    publish(notice) {
      try {
        bus.emit(notice.athleteId === null ? `c${notice.clinicId}` : `a${notice.athleteId}`, notice);
      } catch {
        // A listener's failure is its own; the change is committed either way.
      }
    },
    subscribe(athleteId, listener) {
      bus.on(`a${athleteId}`, listener);
      return () => bus.off(`a${athleteId}`, listener);
    },
    subscribeClinic(clinicId, listener) {
      bus.on(`c${clinicId}`, listener);
      return () => bus.off(`c${clinicId}`, listener);
    },
  };
}
