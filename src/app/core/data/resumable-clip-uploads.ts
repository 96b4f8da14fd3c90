import { HttpErrorResponse, HttpXsrfTokenExtractor } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';
import { Upload } from 'tus-js-client';
import type { Clip } from '../../../contracts/api';
import { UPLOAD } from '../../../contracts/assessment';
import { AssessmentsApi } from './assessments-api';
import { madeClipId, parseBody, shouldRetry, uploadHttpError } from './tus-answers';

/**
 * What an upload reports: bytes sent so far, a lost connection being retried and the server
 * answering again, that it continues an upload begun earlier, then the clip the server created.
 */
export type UploadEvent =
  | { type: 'progress'; loaded: number; total: number }
  | { type: 'reconnecting' }
  | { type: 'reconnected' }
  | { type: 'resumed' }
  | { type: 'done'; clip: Clip };

/** Waits before each retry after a lost connection, ms (about two minutes in all, then it fails). */
export const RETRY_DELAYS_MS = [0, 1000, 3000, 5000, 10_000, 20_000, 30_000, 60_000];

/** An upload in flight: its events, and how to give it up for good. */
export interface ResumableUpload {
  /**
   * Progress, reconnecting, resumed, then the created clip; errors come out as an
   * `HttpErrorResponse` (with the server's body when it sent one). Unsubscribing stops sending but
   * keeps what the server holds, so choosing the same file again (even after a reload) continues.
   */
  readonly events: Observable<UploadEvent>;
  /** Stops sending and has the server drop what it holds (the user cancelled). */
  discard(): void;
}

/**
 * Resumable clip uploads over the tus protocol (tus-js-client) to
 * `/api/assessments/:id/clip-uploads`. A dropped connection is retried from the offset the server
 * holds; the browser remembers each file's upload (by name, type, size, date and assessment), so
 * the same file chosen again after a reload continues where it stopped. Every request carries the
 * session's CSRF header.
 */
@Injectable({ providedIn: 'root' })
export class ResumableClipUploads {
  private readonly xsrf = inject(HttpXsrfTokenExtractor);
  private readonly api = inject(AssessmentsApi);

  upload(assessmentId: number, file: File): ResumableUpload {
    let current: Upload | null = null;
    let discarded = false;
    const events = new Observable<UploadEvent>((subscriber) => {
      let stopped = false;
      let lost = false;
      const upload = new Upload(file, {
        endpoint: `/api/assessments/${assessmentId}/clip-uploads`,
        metadata: { filename: file.name, filetype: file.type || 'application/octet-stream' },
        chunkSize: UPLOAD.chunkBytes,
        retryDelays: RETRY_DELAYS_MS,
        removeFingerprintOnSuccess: true,
        onBeforeRequest: (req) => {
          const token = this.xsrf.getToken();
          if (token) req.setHeader('X-XSRF-TOKEN', token);
        },
        onProgress: (loaded, total) => subscriber.next({ type: 'progress', loaded, total }),
        onShouldRetry: (err) => {
          const retry = shouldRetry(err);
          if (retry) {
            lost = true;
            subscriber.next({ type: 'reconnecting' });
          }
          return retry;
        },
        // Connected again once the server answers (the retry's HEAD tells the offset it holds).
        onAfterResponse: (_req, res) => {
          if (lost && res.getStatus() > 0 && res.getStatus() < 500) {
            lost = false;
            subscriber.next({ type: 'reconnected' });
          }
        },
        onSuccess: ({ lastResponse }) => {
          const clip = parseBody(lastResponse.getBody()) as Clip | null;
          const madeId = madeClipId(lastResponse);
          if (clip && typeof clip.id === 'number') {
            subscriber.next({ type: 'done', clip });
            subscriber.complete();
          } else if (madeId !== null) {
            // Made by an earlier request whose answer was lost (the server's HEAD names the clip): done.
            this.api.getClip(madeId).subscribe({
              next: (made) => {
                subscriber.next({ type: 'done', clip: made });
                subscriber.complete();
              },
              error: (err: unknown) => subscriber.error(err),
            });
          } else {
            // Finished earlier (the answer was lost): the clip is already in the list.
            subscriber.error(new HttpErrorResponse({ status: 409, error: { error: { message: ALREADY_SENT } } }));
          }
        },
        onError: (err) => subscriber.error(uploadHttpError(err)),
      });
      current = upload;
      void upload.findPreviousUploads().then((previous) => {
        if (stopped) return;
        const earlier = previous[0];
        if (earlier) {
          upload.resumeFromPreviousUpload(earlier);
          subscriber.next({ type: 'resumed' });
        }
        upload.start();
      });
      return () => {
        stopped = true;
        if (!discarded) void upload.abort(false);
      };
    });
    return {
      events,
      discard: () => {
        discarded = true;
        void current?.abort(true).catch(() => undefined);
      },
    };
  }
}

const ALREADY_SENT = 'This file was already uploaded. Its clip is in the list below.';
