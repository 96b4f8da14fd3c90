import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, map } from 'rxjs';
import type {
  AthletePlanAlerts,
  Exercise,
  ExerciseQuery,
  ExerciseWrite,
  LogEntry,
  LogWrite,
  PainRule,
  PlanAction,
  PlanDetail,
  PlanProgress,
  PlanReplace,
  PlanSummary,
  PlanWrite,
} from '../../../contracts/plans';
import { skipErrorSnackbar } from '../http-context';

/**
 * HTTP for the exercise library, plans, progress and the athlete's log. Loads report failures
 * through the page's error state; forms show 422 problems inline; log submissions go through the
 * outbox ({@link LogOutbox}), which reports on its own rows (no snackbar).
 */
@Injectable({ providedIn: 'root' })
export class PlansApi {
  private readonly http = inject(HttpClient);

  exercises(query: ExerciseQuery = {}): Observable<Exercise[]> {
    let params = new HttpParams();
    if (query.q?.trim()) params = params.set('q', query.q.trim());
    if (query.region) params = params.set('region', query.region);
    if (query.kind) params = params.set('kind', query.kind);
    return this.http
      .get<{ exercises: Exercise[] }>('/api/exercises', { params, context: skipErrorSnackbar() })
      .pipe(map((r) => r.exercises));
  }

  /** A new library exercise; `key` (see RetryKeys) makes a resend after a lost answer find the exercise already made. */
  createExercise(body: ExerciseWrite, key?: string): Observable<Exercise> {
    const headers: Record<string, string> = key ? { 'Idempotency-Key': key } : {};
    return this.http.post<Exercise>('/api/exercises', body, { context: skipErrorSnackbar(422), headers });
  }

  updateExercise(id: number, body: Partial<ExerciseWrite>): Observable<Exercise> {
    return this.http.patch<Exercise>(`/api/exercises/${id}`, body, { context: skipErrorSnackbar(422) });
  }

  /** Takes the exercise out of the library (plans that use it keep it). */
  archiveExercise(id: number): Observable<void> {
    return this.http.delete<void>(`/api/exercises/${id}`);
  }

  plansOf(athleteId: number): Observable<PlanSummary[]> {
    return this.http
      .get<{ plans: PlanSummary[] }>(`/api/athletes/${athleteId}/plans`, { context: skipErrorSnackbar() })
      .pipe(map((r) => r.plans));
  }

  /** A new draft plan; `key` (see RetryKeys) makes a resend after a lost answer find the plan already made. */
  createPlan(athleteId: number, body: PlanWrite, key?: string): Observable<PlanDetail> {
    const headers: Record<string, string> = key ? { 'Idempotency-Key': key } : {};
    return this.http.post<PlanDetail>(`/api/athletes/${athleteId}/plans`, body, { context: skipErrorSnackbar(422), headers });
  }

  plan(id: number): Observable<PlanDetail> {
    return this.http.get<PlanDetail>(`/api/plans/${id}`, { context: skipErrorSnackbar() });
  }

  /** Saves an edit; 409 `stale_revision` (the stored plan in `details.current`) when someone saved since `body.baseRevision`. */
  replacePlan(id: number, body: PlanReplace): Observable<PlanDetail> {
    // The editor says what went wrong itself (409: the colleague's save and the choices; 422: by the fields).
    return this.http.put<PlanDetail>(`/api/plans/${id}`, body, { context: skipErrorSnackbar(409, 422) });
  }

  deletePlan(id: number): Observable<void> {
    return this.http.delete<void>(`/api/plans/${id}`);
  }

  transition(id: number, action: PlanAction): Observable<PlanDetail> {
    return this.http.post<PlanDetail>(`/api/plans/${id}/transitions`, { action });
  }

  putPainRule(id: number, rule: PainRule): Observable<PlanDetail> {
    return this.http.put<PlanDetail>(`/api/plans/${id}/pain-rule`, rule, { context: skipErrorSnackbar(422) });
  }

  progress(id: number): Observable<PlanProgress> {
    return this.http.get<PlanProgress>(`/api/plans/${id}/progress`, { context: skipErrorSnackbar() });
  }

  logs(planId: number): Observable<LogEntry[]> {
    return this.http.get<{ logs: LogEntry[] }>(`/api/plans/${planId}/logs`, { context: skipErrorSnackbar() }).pipe(map((r) => r.logs));
  }

  /** One submission of a session; the outbox retries it with the same key. */
  addLog(planId: number, body: LogWrite): Observable<LogEntry> {
    return this.http.post<LogEntry>(`/api/plans/${planId}/logs`, body, { context: skipErrorSnackbar() });
  }

  morningCheck(planId: number, key: string, pain: number): Observable<LogEntry> {
    return this.http.put<LogEntry>(
      `/api/plans/${planId}/logs/${encodeURIComponent(key)}/morning`,
      { pain },
      { context: skipErrorSnackbar() },
    );
  }

  /** Alerts of the clinic's running plans, for the roster. */
  alerts(): Observable<AthletePlanAlerts[]> {
    return this.http.get<{ alerts: AthletePlanAlerts[] }>('/api/plan-alerts', { context: skipErrorSnackbar() }).pipe(map((r) => r.alerts));
  }
}
