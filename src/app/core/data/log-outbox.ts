import { DestroyRef, Injectable, InjectionToken, computed, effect, inject, signal, untracked } from '@angular/core';
import { Subject, firstValueFrom } from 'rxjs';
import type { LogEntry, LogWrite } from '../../../contracts/plans';
import { errorMessage, errorStatus } from '../api-error';
import { AuthStore } from '../auth-store';
import {
  OutboxItem,
  dueNow,
  enqueue,
  isRetryable,
  logItem,
  morningItem,
  nextDue,
  nextWake,
  parseStored,
  refuse,
  remove,
  resend,
  retryLater,
} from './log-outbox-queue';
import { PlansApi } from './plans-api';

/** Where the outbox keeps unsent submissions (localStorage; tests pass their own). */
export const OUTBOX_STORAGE = new InjectionToken<Pick<Storage, 'getItem' | 'setItem'> | null>('OUTBOX_STORAGE', {
  providedIn: 'root',
  factory: () => {
    try {
      return typeof localStorage === 'undefined' ? null : localStorage;
    } catch {
      return null; // storage blocked: the queue still works for this page's lifetime
    }
  },
});

/** Milliseconds since the epoch (tests move it). */
export const OUTBOX_CLOCK = new InjectionToken<() => number>('OUTBOX_CLOCK', { providedIn: 'root', factory: () => () => Date.now() });

const storageKey = (userId: number) => `trailframe.log-outbox.v1.${userId}`;

/**
 * The athlete's log outbox: sessions and morning checks are saved in localStorage first, then
 * sent one at a time; a failed try is repeated with back-off (1 s … 60 s), at once when the
 * browser comes back online, and when the page opens again later. Each session carries its
 * idempotency key, so a retry after a lost answer never makes a second entry.
 */
@Injectable({ providedIn: 'root' })
export class LogOutbox {
  private readonly api = inject(PlansApi);
  private readonly auth = inject(AuthStore);
  private readonly storage = inject(OUTBOX_STORAGE);
  private readonly now = inject(OUTBOX_CLOCK);
  private readonly state = signal<OutboxItem[]>([]);
  private loadedFor: number | null = null;
  private timer: ReturnType<typeof setTimeout> | null = null;
  private busy = false;

  /** Everything not yet accepted, in order. */
  readonly items = this.state.asReadonly();
  /** Items still being tried. */
  readonly pending = computed(() => this.items().filter((i) => !i.refused));
  /** Items the server refused (kept until the athlete discards them). */
  readonly refused = computed(() => this.items().filter((i) => i.refused));
  /** Each submission the server accepted, with its answer. */
  readonly delivered = new Subject<{ item: OutboxItem; entry: LogEntry }>();
  /** Each submission the server refused (kept, marked, with the reason): the plan may have moved on meanwhile. */
  readonly refusals = new Subject<OutboxItem>();

  constructor() {
    // Load the signed-in athlete's queue now, and again whenever someone else signs in.
    effect(() => {
      this.auth.user();
      untracked(() => this.ensureLoaded());
    });
    this.ensureLoaded();
    if (typeof window !== 'undefined') {
      const online = () => this.sendNow();
      window.addEventListener('online', online);
      inject(DestroyRef).onDestroy(() => {
        window.removeEventListener('online', online);
        if (this.timer) clearTimeout(this.timer);
      });
    }
  }

  /** Queues a session and starts sending. */
  submitLog(planId: number, body: LogWrite): void {
    this.update(enqueue(this.current(), logItem(planId, body, this.now())));
    void this.flush();
  }

  /** Queues the morning check of the session with `key` (after that session, if it is unsent). */
  submitMorning(planId: number, key: string, pain: number, sessionDate: string): void {
    this.update(enqueue(this.current(), morningItem(planId, key, pain, sessionDate, this.now())));
    void this.flush();
  }

  /** Tries everything pending now (back online, or the athlete asked). */
  sendNow(): void {
    this.update(dueNow(this.current(), this.now()));
    void this.flush();
  }

  /** Sends a refused session again, fixed by the athlete (e.g. for today's stage), with its key. */
  resend(id: string, body: LogWrite): void {
    this.update(resend(this.current(), id, body, this.now()));
    void this.flush();
  }

  /** Drops an item the server refused (after the athlete has read why). */
  discard(id: string): void {
    const item = this.current().find((i) => i.id === id);
    let items = remove(this.current(), id);
    // A session that is dropped takes its morning check with it.
    if (item?.kind === 'log') items = remove(items, `${item.key}:morning`);
    this.update(items);
  }

  /** Sends due items one at a time until none is due, then sleeps until the next one is. */
  async flush(): Promise<void> {
    if (this.busy) return;
    this.busy = true;
    try {
      for (let item = nextDue(this.current(), this.now()); item; item = nextDue(this.current(), this.now())) {
        try {
          const entry = await firstValueFrom(
            item.kind === 'log' ? this.api.addLog(item.planId, item.body) : this.api.morningCheck(item.planId, item.key, item.pain),
          );
          this.update(remove(this.current(), item.id));
          this.delivered.next({ item, entry });
        } catch (err) {
          const status = errorStatus(err) ?? 0;
          if (isRetryable(status)) {
            const why =
              status === 0
                ? 'No connection. It will be sent when you are back online.'
                : status === 401
                  ? 'You were signed out. It will be sent once you sign in again.'
                  : errorMessage(err);
            this.update(retryLater(this.current(), item.id, why, this.now()));
          } else {
            this.update(refuse(this.current(), item.id, errorMessage(err)));
            this.refusals.next(item);
          }
        }
      }
    } finally {
      this.busy = false;
      this.schedule();
    }
  }

  private schedule(): void {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    const wake = nextWake(this.current());
    if (wake === null) return;
    this.timer = setTimeout(() => void this.flush(), Math.max(0, wake - this.now()));
  }

  private current(): OutboxItem[] {
    this.ensureLoaded();
    return this.state();
  }

  /** Loads the signed-in athlete's stored queue (again when someone else signs in). */
  private ensureLoaded(): void {
    const userId = this.auth.user()?.id ?? null;
    if (userId === this.loadedFor) return;
    this.loadedFor = userId;
    this.state.set(userId === null ? [] : parseStored(this.read(userId)));
    if (userId !== null && this.state().length) queueMicrotask(() => void this.flush());
  }

  private read(userId: number): string | null {
    try {
      return this.storage?.getItem(storageKey(userId)) ?? null;
    } catch {
      return null;
    }
  }

  private update(items: OutboxItem[]): void {
    this.state.set(items);
    if (this.loadedFor === null) return;
    try {
      this.storage?.setItem(storageKey(this.loadedFor), JSON.stringify(items));
    } catch {
      // Storage full or blocked: the queue still lives in memory for this page.
    }
  }
}
