import { DestroyRef, inject, signal } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { MatDialog } from '@angular/material/dialog';
import { Observable, firstValueFrom } from 'rxjs';
import { errorMessage } from '../../core/api-error';
import { ConfirmDialog, type ConfirmDialogData } from '../confirm-dialog/confirm-dialog';

/**
 * The actions under way on the cards of a shared list (publish, unpublish, delete, try again), by
 * key: which keys wait for an answer (their buttons are disabled) and what went wrong with the last
 * action of a key (shown on its card). Also asks for confirmation. Create it in an injection
 * context with {@link actionTracker}; the work ends with the component.
 */
export class ActionTracker<K extends string | number> {
  /** Keys with a request on the way. */
  readonly pending = signal<ReadonlySet<K>>(new Set());
  /** The last action's error message per key, until the key's next action. */
  readonly problems = signal<Readonly<Partial<Record<K, string>>>>({} as Partial<Record<K, string>>);

  constructor(
    private readonly destroyRef: DestroyRef,
    private readonly dialog: MatDialog,
  ) {}

  /** Whether `key` has a request on the way. */
  isPending(key: K): boolean {
    return this.pending().has(key);
  }

  /** Runs `work` for `key`: its result, or null when it failed (the problem then says why). */
  async run<T>(key: K, work: Observable<T>): Promise<T | null> {
    this.pending.update((s) => new Set(s).add(key));
    this.problems.update((p) => {
      const rest = { ...p };
      delete rest[key];
      return rest;
    });
    try {
      return await firstValueFrom(work.pipe(takeUntilDestroyed(this.destroyRef)));
    } catch (err) {
      this.problems.update((p) => ({ ...p, [key]: errorMessage(err) }));
      return null;
    } finally {
      this.pending.update((s) => {
        const next = new Set(s);
        next.delete(key);
        return next;
      });
    }
  }

  /** Asks with the shared confirmation dialog; whether the user confirmed. */
  confirm(data: ConfirmDialogData): Promise<boolean> {
    return firstValueFrom(
      this.dialog.open<ConfirmDialog, ConfirmDialogData, boolean>(ConfirmDialog, { data, width: '480px', maxWidth: '95vw' }).afterClosed(),
    ).then((ok) => !!ok);
  }
}

/** An {@link ActionTracker} for the component being created (call in an injection context). */
export function actionTracker<K extends string | number>(): ActionTracker<K> {
  return new ActionTracker<K>(inject(DestroyRef), inject(MatDialog));
}
