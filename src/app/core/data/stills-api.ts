import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, map } from 'rxjs';
import type { PortalShared, Still, StillCreate, StillUpdate, VisitSummary, VisitSummaryCreate } from '../../../contracts/sharing';
import { skipErrorSnackbar } from '../http-context';

/**
 * HTTP for what a coach shares with an athlete: stills (rendered on the server with the review's
 * overlay) and visit summaries (PDF). Lists report failures in the page's error state; the dialogs
 * show 422 problems inline and keep what the user typed.
 */
@Injectable({ providedIn: 'root' })
export class StillsApi {
  private readonly http = inject(HttpClient);

  // ── Stills ──

  /** The athlete's stills, newest first (staff: all; athlete: published only). */
  stillsOf(athleteId: number): Observable<Still[]> {
    return this.http
      .get<Still[] | { stills: Still[] }>(`/api/athletes/${athleteId}/stills`, { context: skipErrorSnackbar() })
      .pipe(map((r) => listOf(r, 'stills')));
  }

  getStill(id: number): Observable<Still> {
    return this.http.get<Still>(`/api/stills/${id}`, { context: skipErrorSnackbar() });
  }

  /** Saves a still of `clipId`'s frame (or a pair); answers at once with the still `rendering`. */
  createStill(clipId: number, body: StillCreate): Observable<Still> {
    return this.http.post<Still>(`/api/clips/${clipId}/stills`, body, { context: skipErrorSnackbar() });
  }

  updateStill(id: number, body: StillUpdate): Observable<Still> {
    return this.http.patch<Still>(`/api/stills/${id}`, body, { context: skipErrorSnackbar() });
  }

  publishStill(id: number, publish: boolean): Observable<Still> {
    return this.http.post<Still>(`/api/stills/${id}/${publish ? 'publish' : 'unpublish'}`, {}, { context: skipErrorSnackbar() });
  }

  deleteStill(id: number): Observable<void> {
    return this.http.delete<void>(`/api/stills/${id}`, { context: skipErrorSnackbar() });
  }

  // ── Visit summaries ──

  summariesOf(athleteId: number): Observable<VisitSummary[]> {
    return this.http
      .get<VisitSummary[] | { summaries: VisitSummary[] }>(`/api/athletes/${athleteId}/summaries`, { context: skipErrorSnackbar() })
      .pipe(map((r) => listOf(r, 'summaries')));
  }

  getSummary(id: number): Observable<VisitSummary> {
    return this.http.get<VisitSummary>(`/api/summaries/${id}`, { context: skipErrorSnackbar() });
  }

  /** Starts rendering a visit summary of the assessment (compared with a baseline when given). */
  createSummary(assessmentId: number, body: VisitSummaryCreate): Observable<VisitSummary> {
    return this.http.post<VisitSummary>(`/api/assessments/${assessmentId}/summaries`, body, { context: skipErrorSnackbar() });
  }

  publishSummary(id: number, publish: boolean): Observable<VisitSummary> {
    return this.http.post<VisitSummary>(`/api/summaries/${id}/${publish ? 'publish' : 'unpublish'}`, {}, { context: skipErrorSnackbar() });
  }

  deleteSummary(id: number): Observable<void> {
    return this.http.delete<void>(`/api/summaries/${id}`, { context: skipErrorSnackbar() });
  }

  // ── Athlete portal ──

  /** The signed-in athlete's published stills and summaries, newest first. */
  portalShared(): Observable<PortalShared> {
    return this.http.get<PortalShared>('/api/portal/shared', { context: skipErrorSnackbar() });
  }
}

/** A list answer, bare or wrapped as `{ stills }` / `{ summaries }`. */
function listOf<T, K extends string>(answer: T[] | Record<K, T[]>, key: K): T[] {
  return Array.isArray(answer) ? answer : (answer?.[key] ?? []);
}
