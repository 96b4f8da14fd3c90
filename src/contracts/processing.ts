/**
 * The one progress stream: what the server produces in the background (a clip's frames, a still,
 * a visit summary…) reports its state and progress here, the same way for every kind.
 * `GET /api/athletes/:id/processing-events` (server-sent events) sends one `event: item` per
 * change, `data:` a {@link ProcessingEvent}; every unfinished item of the athlete once on
 * connecting. Types only.
 */

/** State of a processed item: queued → running (with progress) → ready | failed; cancelled when its subject goes. */
export type ProcessingState = 'queued' | 'running' | 'ready' | 'failed' | 'cancelled';

/** What is being produced about: the subject's type. */
export type ProcessingSubject = 'clip' | 'still' | 'summary' | 'annotated_clip' | 'data_export' | 'demo_clip';

/** One change of a processed item. */
export interface ProcessingEvent {
  /** The subject the item is about (`clip` 12: its frames; `still` 5: its image). */
  subject: ProcessingSubject;
  /** The subject's id. */
  id: number;
  /** The item's kind, e.g. `extract_frames`, `render_still`, `render_summary`. */
  kind: string;
  state: ProcessingState;
  /**
   * Work done of total while running. For a clip's frames, `done` frames (0 … done − 1) are
   * extracted and can be shown; for renders, hundredths.
   */
  progress: { done: number; total: number } | null;
  /** Why it failed, in words for the user (null otherwise). */
  error: string | null;
}

/** The event name of {@link ProcessingEvent} messages on the stream. */
export const PROCESSING_EVENT = 'item';
