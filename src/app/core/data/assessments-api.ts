import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, map } from 'rxjs';
import type { Assessment, AssessmentDetail, AssessmentWrite, Clip, ClipUpdate } from '../../../contracts/api';
import { skipErrorSnackbar } from '../http-context';

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

  /** A new visit; `key` (see RetryKeys) makes a resend after a lost answer find the visit already made. */
  create(athleteId: number, body: AssessmentWrite, key?: string): Observable<Assessment> {
    return this.http.post<Assessment>(`/api/athletes/${athleteId}/assessments`, body, {
      context: skipErrorSnackbar(422),
      headers: key ? { 'Idempotency-Key': key } : {},
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
