import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, map } from 'rxjs';
import type { AthleteCreate, AthleteDetail, AthleteIntake, AthleteSummary, AthleteUpdate, PendingInvitation } from '../../../contracts/api';
import { skipErrorSnackbar } from '../http-context';

/** An entry of the coach picker (`GET /api/coaches`). */
export interface CoachOption {
  id: number;
  name: string;
}

/**
 * HTTP for athletes. Loads report failures through the page's error state (no snackbar);
 * saves show 422 validation problems inline on their form, other failures as a snackbar.
 */
@Injectable({ providedIn: 'root' })
export class AthletesApi {
  private readonly http = inject(HttpClient);

  /** The clinic's roster. */
  list(): Observable<AthleteSummary[]> {
    return this.http.get<{ athletes: AthleteSummary[] }>('/api/athletes', { context: skipErrorSnackbar() }).pipe(map((r) => r.athletes));
  }

  /** One athlete with intake, injuries, pain and consents (staff, or the athlete themself). */
  get(id: number): Observable<AthleteDetail> {
    return this.http.get<AthleteDetail>(`/api/athletes/${id}`, { context: skipErrorSnackbar() });
  }

  /** A new athlete; `key` (see RetryKeys) makes a resend after a lost answer find the athlete already made. */
  create(body: AthleteCreate, key?: string): Observable<AthleteDetail> {
    return this.http.post<AthleteDetail>('/api/athletes', body, {
      context: skipErrorSnackbar(422),
      headers: key ? { 'Idempotency-Key': key } : {},
    });
  }

  /** Changes details; an athlete may change only their own names. */
  update(id: number, body: AthleteUpdate): Observable<AthleteDetail> {
    return this.http.patch<AthleteDetail>(`/api/athletes/${id}`, body, {
      context: skipErrorSnackbar(422),
    });
  }

  /** Replaces the whole intake (injuries, pain and consents included) in one go. */
  saveIntake(id: number, body: AthleteIntake): Observable<AthleteDetail> {
    return this.http.put<AthleteDetail>(`/api/athletes/${id}/intake`, body, {
      context: skipErrorSnackbar(422),
    });
  }

  /** E-mails the athlete a sign-up link (again, when one is pending). */
  invite(id: number): Observable<PendingInvitation> {
    return this.http.post<PendingInvitation>(`/api/athletes/${id}/invitation`, null);
  }

  /** Coaches of the clinic for assignment pickers. */
  coaches(): Observable<CoachOption[]> {
    return this.http.get<{ coaches: CoachOption[] }>('/api/coaches', { context: skipErrorSnackbar() }).pipe(map((r) => r.coaches));
  }
}
