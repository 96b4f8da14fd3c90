import { FocusMonitor, FocusOrigin } from '@angular/cdk/a11y';
import { DestroyRef, ElementRef, inject } from '@angular/core';
import type { FocusTarget } from './key-routing';

/** The focused element as the key routing sees it (`focusVisible` from how it got the focus). */
export function focusTargetOf(el: EventTarget | null, origin: FocusOrigin): FocusTarget | null {
  if (!(el instanceof HTMLElement)) return null;
  return {
    tagName: el.tagName,
    type: (el as HTMLInputElement).type,
    isContentEditable: el.isContentEditable,
    role: el.getAttribute('role'),
    focusVisible: origin === 'keyboard',
  };
}

/**
 * Hears every key press on the page before any control does (window, capture phase), for as long
 * as the calling component lives, with the focused element described for `pageTakesKey`. A
 * handler that handles a frame key should `preventDefault()` and `stopPropagation()` so that a
 * focused tab or toggle does not act on it too. Call in an injection context.
 */
export function listenToPageKeys(handler: (event: KeyboardEvent, target: FocusTarget | null) => void): void {
  const host = inject<ElementRef<HTMLElement>>(ElementRef);
  const focusMonitor = inject(FocusMonitor);
  let origin: FocusOrigin = null;
  const sub = focusMonitor.monitor(host, true).subscribe((o) => (origin = o));
  const listener = (e: KeyboardEvent) => handler(e, focusTargetOf(e.target, origin));
  globalThis.addEventListener?.('keydown', listener, { capture: true });
  inject(DestroyRef).onDestroy(() => {
    globalThis.removeEventListener?.('keydown', listener, { capture: true });
    sub.unsubscribe();
    focusMonitor.stopMonitoring(host);
  });
}
