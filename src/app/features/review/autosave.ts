/**
 * Words and timing of the annotation autosave. Pure; the sync service runs the timers.
 */

/** What the save indicator shows. */
export type SaveState = 'saved' | 'saving' | 'unsaved' | 'offline' | 'failed';

export const SAVE_STATE_LABELS: Record<SaveState, string> = {
  saved: 'Saved',
  saving: 'Saving…',
  unsaved: 'Unsaved changes',
  offline: 'Offline, retrying',
  failed: 'Not saved',
};

export const SAVE_STATE_ICONS: Record<SaveState, string> = {
  saved: 'cloud_done',
  saving: 'cloud_upload',
  unsaved: 'edit_note',
  offline: 'cloud_off',
  failed: 'error',
};

/** Quiet time after the last edit before a save starts. */
export const SAVE_DEBOUNCE_MS = 800;

/** Wait before retry `attempt` (1, 2, 3…): 1 s, 2 s, 4 s … up to 30 s, with up to 20 % jitter. */
export function retryDelayMs(attempt: number, random: () => number = Math.random): number {
  const base = Math.min(30_000, 1000 * 2 ** Math.max(0, attempt - 1));
  return Math.round(base * (1 + 0.2 * random()));
}

/** Whether a failed save is worth retrying by itself: no answer, rate limited, or a server fault. */
export function isRetryableStatus(status: number | null): boolean {
  return status === null || status === 0 || status === 408 || status === 429 || status >= 500;
}

/** What to tell the coach after their edits were put on top of someone else's save. */
export function conflictMessage(savedBy: string | null, applied: number, conflicts: number, byYou = false): string {
  const who = byYou
    ? 'You saved this clip in another tab or window'
    : savedBy
      ? `${savedBy} saved this clip`
      : 'This clip was saved elsewhere';
  if (applied === 0) return `${who} meanwhile; ${byYou ? 'those' : 'their'} marks are shown now.`;
  const edits = applied === 1 ? 'your edit was' : `your ${applied} edits were`;
  const they = byYou ? 'that save' : 'they';
  const overlap =
    conflicts === 0
      ? ''
      : conflicts === 1
        ? ` One of them replaced a mark ${they} changed too.`
        : ` ${conflicts} of them replaced marks ${they} changed too.`;
  return `${who} meanwhile; ${edits} put on top of ${byYou ? 'that save' : 'theirs'}.${overlap}`;
}
