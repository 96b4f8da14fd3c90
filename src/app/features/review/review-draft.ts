/**
 * Marks not saved yet, kept in the tab's session storage until the server has them, so a reload,
 * an ended session (sign in again in the same tab) or a server that was down loses nothing: when
 * the clip opens again, they are put back on top of the server's copy and saved. Session storage
 * is the tab's own and goes when the tab closes. Pure apart from the storage passed in.
 */
import type { AnnotationState } from './annotation-changes';
import { mergeOnto } from './annotation-changes';

/** What the review keeps of unsaved marks. */
export interface ReviewDraft {
  clipId: number;
  /** Who made them (a draft is never put back for someone else signed in in the same tab). */
  userId: number | null;
  /** The server's copy the edits started from. */
  base: AnnotationState;
  /** The marks as shown. */
  local: AnnotationState;
}

/** Said when unsaved marks were put back on opening a clip. */
export const DRAFT_RESTORED = 'Marks you had not saved on this clip yet were put back and are being saved now.';

export function draftKey(clipId: number): string {
  return `tf.review-draft.${clipId}`;
}

function isState(v: unknown): v is AnnotationState {
  const s = v as AnnotationState | null;
  return !!s && typeof s === 'object' && Array.isArray(s.landmarks) && Array.isArray(s.events) && Array.isArray(s.gauges);
}

/** The draft kept for this clip and user, or null (none, someone else's, or unreadable). */
export function readDraft(storage: Storage | null, clipId: number, userId: number | null): ReviewDraft | null {
  try {
    const text = storage?.getItem(draftKey(clipId));
    if (!text) return null;
    const d = JSON.parse(text) as ReviewDraft;
    if (d.clipId !== clipId || d.userId !== userId || !isState(d.base) || !isState(d.local)) return null;
    return d;
  } catch {
    return null;
  }
}

/** Keeps the draft (quietly does nothing when storage is full or off). */
export function writeDraft(storage: Storage | null, draft: ReviewDraft): void {
  try {
    storage?.setItem(draftKey(draft.clipId), JSON.stringify(draft));
  } catch {
    // Storage full or disabled: the page still holds the marks and keeps saving them.
  }
}

export function clearDraft(storage: Storage | null, clipId: number): void {
  try {
    storage?.removeItem(draftKey(clipId));
  } catch {
    // Nothing kept.
  }
}

/** The draft's edits put on top of the server's copy as loaded now; `applied` = how many. */
export function restoreDraft(draft: ReviewDraft, loaded: AnnotationState): { state: AnnotationState; applied: number } {
  const { merged, applied } = mergeOnto(draft.base, draft.local, loaded);
  return { state: merged, applied };
}

/** The tab's session storage, or null where there is none. */
export function tabStorage(): Storage | null {
  try {
    return globalThis.sessionStorage ?? null;
  } catch {
    return null;
  }
}
