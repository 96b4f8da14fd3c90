import { DestroyRef, Injectable, computed, inject, signal } from '@angular/core';
import type { ClipAnnotations } from '../../../contracts/annotations';
import { asHttpError, errorCode, errorMessage, errorStatus } from '../../core/api-error';
import { AuthStore } from '../../core/auth-store';
import { AnnotationState, mergeOnto, sameState, stateOf } from './annotation-changes';
import { SAVE_DEBOUNCE_MS, SaveState, conflictMessage, isRetryableStatus, retryDelayMs } from './autosave';
import { ReviewApi } from '../../core/data/review-api';
import { DRAFT_RESTORED, clearDraft, readDraft, restoreDraft, tabStorage, writeDraft } from './review-draft';

/** What the sync needs from the page holding the edits. */
export interface SyncHost {
  /** The annotations as shown now. */
  local(): AnnotationState;
  /** Replaces what is shown after a save conflict (merged edits), with a message for the coach. */
  replaceLocal(state: AnnotationState, message: string): void;
}

/**
 * Autosave of a clip's annotations: edits wait `SAVE_DEBOUNCE_MS` of quiet, then go out as one PUT
 * naming the revision they started from. Network failures, rate limits and server faults are
 * retried with back-off ("Offline, retrying"); a 409 brings the server's newer copy, the local
 * edits are re-applied on top of it (three-way merge) and saved again; other refusals stop with
 * the server's message until the coach retries. Provided by the review page.
 */
@Injectable()
export class AnnotationSync {
  private readonly api = inject(ReviewApi);
  private readonly auth = inject(AuthStore);

  private readonly state$ = signal<SaveState>('saved');
  private readonly problem$ = signal<string | null>(null);
  private readonly base$ = signal<ClipAnnotations | null>(null);

  /** Saved · Saving… · Unsaved changes · Offline, retrying · Not saved. */
  readonly state = this.state$.asReadonly();
  /** Why the last save was refused (state `failed`), or null. */
  readonly problem = this.problem$.asReadonly();
  /** The server's copy the edits are based on. */
  readonly base = this.base$.asReadonly();
  /** Whether leaving now would lose edits. */
  readonly hasUnsaved = computed(() => this.state$() !== 'saved');
  /**
   * Whether the last save was refused because the session ended: the unsaved marks are kept in the
   * tab (see `review-draft.ts`) and come back when the clip opens after signing in again.
   */
  readonly sessionEnded = computed(() => this.state$() === 'failed' && this.failedStatus$() === 401);
  private readonly failedStatus$ = signal<number | null>(null);

  private clipId = 0;
  private host: SyncHost | null = null;
  private timer: ReturnType<typeof setTimeout> | null = null;
  private saving = false;
  private attempt = 0;
  private readonly onOnline = () => {
    if (this.state$() === 'offline') this.schedule(0);
  };

  constructor() {
    globalThis.addEventListener?.('online', this.onOnline);
    inject(DestroyRef).onDestroy(() => this.stop());
  }

  /**
   * Starts syncing a clip from the annotations just loaded. Marks this tab had not saved on the clip
   * (kept in session storage, see `review-draft.ts`) are put back on top and saved.
   */
  start(clipId: number, loaded: ClipAnnotations, host: SyncHost): void {
    this.clearTimer();
    this.clipId = clipId;
    this.host = host;
    this.base$.set(loaded);
    this.attempt = 0;
    this.problem$.set(null);
    this.state$.set('saved');
    const draft = readDraft(tabStorage(), clipId, this.userId());
    if (!draft) return;
    const { state, applied } = restoreDraft(draft, stateOf(loaded));
    if (applied && !sameState(state, stateOf(loaded))) {
      host.replaceLocal(state, DRAFT_RESTORED);
      this.state$.set('unsaved');
      this.keepDraft();
      this.schedule(0);
    } else {
      clearDraft(tabStorage(), clipId);
    }
  }

  /** Call after every edit (and undo/redo). */
  edited(): void {
    if (!this.host) return;
    if (this.saving) return; // The answer decides what happens next.
    if (this.isClean()) {
      this.clearTimer();
      this.state$.set('saved');
      this.keepDraft();
      return;
    }
    this.keepDraft();
    if (this.state$() === 'offline') return; // The retry timer sends the latest edits.
    this.state$.set('unsaved');
    this.problem$.set(null);
    this.schedule(SAVE_DEBOUNCE_MS);
  }

  /** Saves now (the "Save now" / "Try again" button). */
  saveNow(): void {
    this.attempt = 0;
    this.schedule(0);
  }

  /**
   * Takes a copy the server saved by itself (e.g. proposed events) as the new base. Call only when
   * nothing is unsaved; the page then shows that copy (the edit is clean, nothing is sent).
   */
  adopt(saved: ClipAnnotations): void {
    this.base$.set(saved);
    this.problem$.set(null);
  }

  /**
   * Stops timers (page left). Leaving inside the app with unsaved marks means the coach chose to
   * discard them, unless the session ended (then they wait in the tab for the next sign-in).
   */
  stop(): void {
    if (this.host && this.state$() !== 'saved' && !this.sessionEnded()) clearDraft(tabStorage(), this.clipId);
    this.clearTimer();
    globalThis.removeEventListener?.('online', this.onOnline);
    this.host = null;
  }

  private isClean(): boolean {
    const base = this.base$();
    return !!base && !!this.host && sameState(stateOf(base), this.host.local());
  }

  private schedule(ms: number): void {
    this.clearTimer();
    this.timer = setTimeout(() => {
      this.timer = null;
      this.flush();
    }, ms);
  }

  private clearTimer(): void {
    if (this.timer !== null) clearTimeout(this.timer);
    this.timer = null;
  }

  private flush(): void {
    const host = this.host;
    const base = this.base$();
    if (!host || !base || this.saving) return;
    if (this.isClean()) {
      this.state$.set('saved');
      return;
    }
    const sent = host.local();
    this.saving = true;
    if (this.state$() !== 'offline') this.state$.set('saving');
    this.api.saveAnnotations(this.clipId, { baseRevision: base.revision, ...stateOf(sent) }).subscribe({
      next: (saved) => {
        this.saving = false;
        this.attempt = 0;
        this.problem$.set(null);
        this.base$.set(saved);
        this.afterSave();
      },
      error: (err: unknown) => {
        this.saving = false;
        this.onError(err);
      },
    });
  }

  /** After a save: done if nothing changed meanwhile, otherwise save the newer edits soon. */
  private afterSave(): void {
    if (!this.host) return;
    if (this.isClean()) {
      this.state$.set('saved');
    } else {
      this.state$.set('unsaved');
      this.schedule(SAVE_DEBOUNCE_MS);
    }
    this.keepDraft();
  }

  /** Keeps unsaved marks in the tab's session storage, or forgets them once the server has them. */
  private keepDraft(): void {
    const base = this.base$();
    if (!this.host || !base) return;
    if (this.isClean()) clearDraft(tabStorage(), this.clipId);
    else writeDraft(tabStorage(), { clipId: this.clipId, userId: this.userId(), base: stateOf(base), local: this.host.local() });
  }

  private userId(): number | null {
    return this.auth.user()?.id ?? null;
  }

  private onError(err: unknown): void {
    if (!this.host) return;
    const status = errorStatus(err);
    if (status === 409 && errorCode(err) === 'stale_revision') {
      const current = currentFromConflict(err);
      if (current) {
        this.rebase(current);
        return;
      }
      // No copy in the answer: fetch it, then merge.
      this.api.annotations(this.clipId).subscribe({
        next: (fresh) => this.rebase(fresh),
        error: (e: unknown) => this.onError(e),
      });
      return;
    }
    if (isRetryableStatus(status)) {
      this.attempt += 1;
      this.state$.set('offline');
      this.schedule(retryDelayMs(this.attempt));
      return;
    }
    this.failedStatus$.set(status);
    this.state$.set('failed');
    this.problem$.set(errorMessage(err));
  }

  /** Puts the local edits on top of the server's newer copy and saves the result. */
  private rebase(current: ClipAnnotations): void {
    const host = this.host;
    const base = this.base$();
    if (!host || !base) return;
    const { merged, applied, conflicts } = mergeOnto(stateOf(base), host.local(), stateOf(current));
    this.base$.set(current);
    const byYou = !!current.updatedByName && current.updatedByName === this.auth.user()?.name;
    host.replaceLocal(merged, conflictMessage(current.updatedByName, applied, conflicts, byYou));
    this.attempt = 0;
    this.keepDraft();
    if (this.isClean()) {
      this.state$.set('saved');
    } else {
      this.state$.set('unsaved');
      this.schedule(0);
    }
  }
}

/** The server's current annotations from a 409 `stale_revision` answer, when it sent them. */
export function currentFromConflict(err: unknown): ClipAnnotations | null {
  const body = asHttpError(err)?.error as { error?: { details?: { current?: unknown } } } | null;
  const current = body?.error?.details?.current as ClipAnnotations | undefined;
  return current && typeof current === 'object' && Array.isArray(current.landmarks) && typeof current.revision === 'number'
    ? current
    : null;
}
