/**
 * What the resumable upload client makes of the server's answers: which failures are retried from
 * the server's offset, and the failure as the `HttpErrorResponse` the rest of the app reads.
 */
import { HttpErrorResponse } from '@angular/common/http';

/** The failure as tus-js-client reports it (`DetailedError`): the answer, when one came. */
export type UploadFailure = { message: string } & { originalResponse?: { getStatus(): number; getBody(): string } | null };

/** A lost connection, a server error or a busy upload is retried; a refusal (4xx) is final. */
export function shouldRetry(err: UploadFailure): boolean {
  const status = err.originalResponse?.getStatus() ?? 0;
  if (status === 0 || status >= 500 || status === 423) return true;
  // The server holds another offset than the client thought: ask and continue.
  return status === 409 && errorCode(err.originalResponse?.getBody()) === 'upload_offset_mismatch';
}

/** A JSON answer body, or null when there is none or it is not JSON. */
export function parseBody(body: string | undefined): unknown {
  try {
    return body ? JSON.parse(body) : null;
  } catch {
    return null;
  }
}

/**
 * The clip an upload became, when the server answers HEAD that it is complete: an earlier PATCH
 * made it and its answer was lost (header `Trailframe-Clip-Id`); null when the answer names none.
 */
export function madeClipId(res: { getHeader(name: string): string | undefined }): number | null {
  const id = Number(res.getHeader('Trailframe-Clip-Id'));
  return Number.isSafeInteger(id) && id > 0 ? id : null;
}

function errorCode(body: string | undefined): string | null {
  const parsed = parseBody(body) as { error?: { code?: unknown } } | null;
  return typeof parsed?.error?.code === 'string' ? parsed.error.code : null;
}

/** The upload's failure as the `HttpErrorResponse` the rest of the app reads (status 0: no answer). */
export function uploadHttpError(err: UploadFailure): HttpErrorResponse {
  const res = err.originalResponse ?? null;
  if (!res) return new HttpErrorResponse({ status: 0, statusText: err.message, error: null });
  return new HttpErrorResponse({ status: res.getStatus(), error: parseBody(res.getBody()) });
}
