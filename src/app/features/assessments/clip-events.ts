/**
 * What a change on the progress stream means for a list of clips. Pure: the clip list applies it.
 */
import type { Clip } from '../../../contracts/api';
import type { ProcessingEvent } from '../../../contracts/processing';

/** How the list follows one event: patch a clip in place, fetch it again, drop it, or ignore the event. */
export type ClipListStep =
  { kind: 'patch'; clip: Clip } | { kind: 'fetch'; id: number } | { kind: 'drop'; id: number } | { kind: 'ignore' };

/**
 * Progress of a clip the list shows is patched in place (frames extracted so far); any other
 * change — queued, ready, failed, or a clip the list does not know yet (uploaded elsewhere) —
 * fetches the clip again; a cancelled item means its clip is being deleted.
 */
export function clipListStep(clips: readonly Clip[], event: ProcessingEvent): ClipListStep {
  if (event.subject !== 'clip') return { kind: 'ignore' };
  if (event.state === 'cancelled') return { kind: 'drop', id: event.id };
  const known = clips.find((c) => c.id === event.id);
  if (known && event.state === 'running' && event.progress && known.status !== 'ready') {
    return { kind: 'patch', clip: { ...known, status: 'extracting', progress: event.progress, error: null } };
  }
  return { kind: 'fetch', id: event.id };
}
