import type { TestRequest } from '@angular/common/http/testing';

const STATUS_TEXT: Record<number, string> = { 404: 'Not Found', 409: 'Conflict', 422: 'Unprocessable Entity', 503: 'Service Unavailable' };

/** Answers a pending test request as the API answers a failure: `{ error: { code, message, details? } }` with `status`. */
export function flushApiError(
  req: TestRequest,
  status: number,
  message: string,
  more: { code?: string; details?: { path: (string | number)[]; message: string }[] } = {},
): void {
  req.flush(
    { error: { code: more.code ?? 'failed', message, ...(more.details ? { details: more.details } : {}) } },
    { status, statusText: STATUS_TEXT[status] ?? 'Error' },
  );
}

/** The first button under `root` whose text contains `text`. */
export function buttonWithText(root: HTMLElement, text: string): HTMLButtonElement {
  const found = [...root.querySelectorAll('button')].find((b) => b.textContent?.includes(text));
  if (!found) throw new Error(`No button with "${text}"`);
  return found;
}
