import { HttpClient, HttpEventType, HttpRequest, HttpResponse } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, filter, map } from 'rxjs';
import type { Assessment, AssessmentDetail, AssessmentWrite, Clip, ClipUpdate } from '../../../contracts/api';
import { skipErrorSnackbar } from '../http-context';

/** What an upload reports: bytes sent so far, then the clip the server created. */
export type UploadEvent = { type: 'progress'; loaded: number; total: number } | { type: 'done'; clip: Clip };

/**
 * HTTP for assessments and clips. Loads report failures through the page's error state, forms
 * show 422 problems inline, and uploads show every failure on their own row (no snackbar).
 */
@Injectable({ providedIn: 'root' })
export class AssessmentsApi {
  private readonly http = inject(HttpClient);

  /** The athlete's assessments, newest first. */
  list(athleteId: number): Observable<Assessment[]> {
    return this.http
      .get<{ assessments: Assessment[] }>(`/api/athletes/${athleteId}/assessments`, { context: skipErrorSnackbar() })
      .pipe(map((r) => r.assessments));
  }

  create(athleteId: number, body: AssessmentWrite): Observable<Assessment> {
    return this.http.post<Assessment>(`/api/athletes/${athleteId}/assessments`, body, {
      context: skipErrorSnackbar(422),
    });
  }

  /** One assessment with its clips and whether the athlete's video consent is in force. */
  get(id: number): Observable<AssessmentDetail> {
    return this.http.get<AssessmentDetail>(`/api/assessments/${id}`, { context: skipErrorSnackbar() });
  }

  update(id: number, body: Partial<AssessmentWrite>): Observable<Assessment> {
    return this.http.patch<Assessment>(`/api/assessments/${id}`, body, { context: skipErrorSnackbar(422) });
  }

  /** Deletes the assessment with its clips and their files. */
  delete(id: number): Observable<void> {
    return this.http.delete<void>(`/api/assessments/${id}`);
  }

  /**
   * Uploads one file as a clip of the assessment (multipart, field `file`). Emits upload
   * progress, then the created clip, then completes. Unsubscribing cancels the upload. Errors
   * (409 no consent, 413 too large, 422 not a video…) come out as the `HttpErrorResponse`.
   */
  uploadClip(assessmentId: number, file: File): Observable<UploadEvent> {
    const body = new FormData();
    body.append('file', file, file.name);
    const request = new HttpRequest('POST', `/api/assessments/${assessmentId}/clips`, body, {
      reportProgress: true,
      context: skipErrorSnackbar(),
    });
    return this.http.request<Clip>(request).pipe(
      filter((e) => e.type === HttpEventType.UploadProgress || e.type === HttpEventType.Response),
      map((e): UploadEvent => {
        if (e.type === HttpEventType.UploadProgress) {
          return { type: 'progress', loaded: e.loaded, total: e.total ?? file.size };
        }
        return { type: 'done', clip: (e as HttpResponse<Clip>).body as Clip };
      }),
    );
  }

  getClip(id: number): Observable<Clip> {
    return this.http.get<Clip>(`/api/clips/${id}`, { context: skipErrorSnackbar() });
  }

  /** Changes a clip's near side, running direction or capture frame rate. */
  updateClip(id: number, body: ClipUpdate): Observable<Clip> {
    return this.http.patch<Clip>(`/api/clips/${id}`, body, { context: skipErrorSnackbar() });
  }

  deleteClip(id: number): Observable<void> {
    return this.http.delete<void>(`/api/clips/${id}`);
  }

  /** Queues a failed clip for processing again. */
  retryClip(id: number): Observable<Clip> {
    return this.http.post<Clip>(`/api/clips/${id}/retry`, null);
  }
}

/** Addresses of a clip's media (same origin, so the session cookie goes along with `<img>`). */
export const clipMedia = {
  poster: (clipId: number) => `/api/clips/${clipId}/poster`,
  thumb: (clipId: number, n: number) => `/api/clips/${clipId}/thumbs/${n}`,
  original: (clipId: number) => `/api/clips/${clipId}/original`,
};
