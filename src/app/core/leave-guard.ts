import { inject } from '@angular/core';
import { MatDialog } from '@angular/material/dialog';
import { CanDeactivateFn } from '@angular/router';
import { Observable, map } from 'rxjs';
import { ConfirmDialog, ConfirmDialogData } from '../shared/confirm-dialog/confirm-dialog';

/** What to ask before leaving a page that holds work not yet saved (or still uploading). */
export type LeaveWarning = ConfirmDialogData;

/** A routed page that can say whether leaving it now would lose something. */
export interface LeaveGuarded {
  /** The question to ask before leaving, or null when leaving loses nothing. */
  leaveWarning(): LeaveWarning | null;
}

/** The usual question for a form with unsaved edits. */
export const UNSAVED_CHANGES_WARNING: LeaveWarning = {
  title: 'Leave without saving?',
  message: 'You have changes that are not saved yet. If you leave this page now, they are lost.',
  confirmLabel: 'Leave and discard',
};

/**
 * The guard's decision: leave at once when nothing would be lost, otherwise whatever `ask`
 * answers (true = leave). Pure apart from `ask`, so it is tested on its own.
 */
export function leaveDecision(
  page: Partial<LeaveGuarded> | null | undefined,
  ask: (warning: LeaveWarning) => Observable<boolean>,
): true | Observable<boolean> {
  const warning = page?.leaveWarning?.() ?? null;
  return warning ? ask(warning) : true;
}

/**
 * `canDeactivate` for pages implementing `LeaveGuarded`: asks with the confirm dialog before
 * leaving a page whose work would be lost. Closing the dialog any other way means "stay".
 */
export const leaveGuard: CanDeactivateFn<Partial<LeaveGuarded>> = (page) => {
  const dialog = inject(MatDialog);
  return leaveDecision(page, (warning) =>
    dialog
      .open<ConfirmDialog, ConfirmDialogData, boolean>(ConfirmDialog, { data: warning, maxWidth: '95vw', width: '440px' })
      .afterClosed()
      .pipe(map((answer) => answer === true)),
  );
};

/**
 * For `(window:beforeunload)`: asks the browser to confirm closing or reloading the tab while
 * `warning` is set (browsers show their own wording).
 */
export function warnBeforeUnload(event: BeforeUnloadEvent, warning: LeaveWarning | null): void {
  if (!warning) return;
  event.preventDefault();
  // Older browsers need returnValue set as well.
  event.returnValue = '';
}
