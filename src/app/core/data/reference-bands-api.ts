import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, map } from 'rxjs';
import type { MeasureKey, ReferenceBand } from '../../../contracts/measures';
import { skipErrorSnackbar } from '../http-context';

/** Body of `PUT /api/reference-bands/:key`. */
export type ReferenceBandWrite = Omit<ReferenceBand, 'key'>;

/** HTTP for the clinic's reference bands (read by staff, changed by the owner). */
@Injectable({ providedIn: 'root' })
export class ReferenceBandsApi {
  private readonly http = inject(HttpClient);

  /** The clinic's bands, with the defaults for measures the clinic has not changed. */
  list(): Observable<ReferenceBand[]> {
    return this.http.get<{ bands: ReferenceBand[] }>('/api/reference-bands', { context: skipErrorSnackbar() }).pipe(map((r) => r.bands));
  }

  /** Sets the clinic's own band for a measure (owner). 422 problems are shown on the form. */
  save(key: MeasureKey, body: ReferenceBandWrite): Observable<ReferenceBand> {
    return this.http.put<ReferenceBand>(`/api/reference-bands/${key}`, body, { context: skipErrorSnackbar(422) });
  }

  /** Drops the clinic's own band, so the default applies again (owner). */
  reset(key: MeasureKey): Observable<void> {
    return this.http.delete<void>(`/api/reference-bands/${key}`).pipe(map(() => undefined));
  }
}
