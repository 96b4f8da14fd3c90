import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';
import type { AssessmentComparison, MeasureKey, MeasureTrends } from '../../../contracts/measures';
import { skipErrorSnackbar } from '../../core/http-context';

/** HTTP for the re-test comparison; the page shows failures in its own error states. */
@Injectable({ providedIn: 'root' })
export class CompareApi {
  private readonly http = inject(HttpClient);

  /** Baseline against re-test; without ids the server takes the latest Re-test and Baseline. */
  comparison(athleteId: number, baseline: number | null, retest: number | null): Observable<AssessmentComparison> {
    let params = new HttpParams();
    if (baseline !== null) params = params.set('baseline', baseline);
    if (retest !== null) params = params.set('retest', retest);
    return this.http.get<AssessmentComparison>(`/api/athletes/${athleteId}/comparison`, { params, context: skipErrorSnackbar() });
  }

  trends(athleteId: number, keys: MeasureKey[]): Observable<MeasureTrends> {
    return this.http.get<MeasureTrends>(`/api/athletes/${athleteId}/measure-trends`, {
      params: { keys: keys.join(',') },
      context: skipErrorSnackbar(),
    });
  }
}
