import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { map, type Observable } from 'rxjs';
import type {
  AthleteDataOverview,
  ClipErasureResult,
  DataExport,
  ErasureResult,
  RetentionSettings,
} from '../../../contracts/privacy';
import { skipErrorSnackbar } from '../http-context';

/** HTTP for athlete data: exports (owner and athlete), erasure (owner), clip retention (owner). */
@Injectable({ providedIn: 'root' })
export class PrivacyApi {
  private readonly http = inject(HttpClient);

  overview(athleteId: number): Observable<AthleteDataOverview> {
    return this.http.get<AthleteDataOverview>(`/api/athletes/${athleteId}/data`);
  }

  exports(athleteId: number): Observable<DataExport[]> {
    return this.http.get<{ exports: DataExport[] }>(`/api/athletes/${athleteId}/data-exports`).pipe(map((r) => r.exports));
  }

  startExport(athleteId: number): Observable<DataExport> {
    return this.http.post<DataExport>(`/api/athletes/${athleteId}/data-exports`, null, { context: skipErrorSnackbar(409) });
  }

  /** Erases the athlete; a wrong name answers 422 (shown in the dialog). */
  erase(athleteId: number, confirmName: string): Observable<ErasureResult> {
    return this.http.post<ErasureResult>(`/api/athletes/${athleteId}/erasure`, { confirmName }, { context: skipErrorSnackbar(422) });
  }

  /** Erases the athlete's clips; a failure is shown on the Data tab. */
  eraseClips(athleteId: number): Observable<ClipErasureResult> {
    return this.http.post<ClipErasureResult>(`/api/athletes/${athleteId}/clips/erasure`, { confirm: true }, { context: skipErrorSnackbar() });
  }

  retention(): Observable<RetentionSettings> {
    return this.http.get<RetentionSettings>('/api/clinic/retention');
  }

  /** The retention changes below show their failures on the retention card. */
  setRetention(months: number | null): Observable<RetentionSettings> {
    return this.http.put<RetentionSettings>('/api/clinic/retention', { months }, { context: skipErrorSnackbar() });
  }

  checkRetention(): Observable<RetentionSettings> {
    return this.http.post<RetentionSettings>('/api/clinic/retention/reviews', null, { context: skipErrorSnackbar() });
  }

  confirmRetention(reviewId: number): Observable<RetentionSettings> {
    return this.http.post<RetentionSettings>(`/api/clinic/retention/reviews/${reviewId}/confirm`, null, { context: skipErrorSnackbar() });
  }
}
