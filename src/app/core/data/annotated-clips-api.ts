import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, map } from 'rxjs';
import type { AnnotatedClip, AnnotatedClipCreate, SideBySideClipCreate } from '../../../contracts/annotated-clips';
import { skipErrorSnackbar } from '../http-context';

/**
 * HTTP for annotated clips: slow-motion videos with the overlay, made from the review (a frame
 * range) or the Re-test comparison (side by side), rendered on the server, published to the athlete.
 */
@Injectable({ providedIn: 'root' })
export class AnnotatedClipsApi {
  private readonly http = inject(HttpClient);

  /** The athlete's annotated clips, newest first (staff: all; athlete: published only). */
  clipsOf(athleteId: number): Observable<AnnotatedClip[]> {
    return this.http
      .get<{ clips: AnnotatedClip[] }>(`/api/athletes/${athleteId}/annotated-clips`, { context: skipErrorSnackbar() })
      .pipe(map((r) => r.clips));
  }

  /** One annotated clip (after its render moved on the progress stream). */
  get(id: number): Observable<AnnotatedClip> {
    return this.http.get<AnnotatedClip>(`/api/annotated-clips/${id}`, { context: skipErrorSnackbar() });
  }

  /** Starts rendering a frame range of `clipId`; answers at once with the clip `rendering`. */
  create(clipId: number, body: AnnotatedClipCreate): Observable<AnnotatedClip> {
    return this.http.post<AnnotatedClip>(`/api/clips/${clipId}/annotated-clips`, body, { context: skipErrorSnackbar() });
  }

  /** Starts rendering Baseline and Re-test side by side, lined up at each initial contact. */
  createSideBySide(athleteId: number, body: SideBySideClipCreate): Observable<AnnotatedClip> {
    return this.http.post<AnnotatedClip>(`/api/athletes/${athleteId}/side-by-side-clips`, body, { context: skipErrorSnackbar() });
  }

  publish(id: number, publish: boolean): Observable<AnnotatedClip> {
    return this.http.post<AnnotatedClip>(`/api/annotated-clips/${id}/${publish ? 'publish' : 'unpublish'}`, {}, { context: skipErrorSnackbar() });
  }

  delete(id: number): Observable<void> {
    return this.http.delete<void>(`/api/annotated-clips/${id}`, { context: skipErrorSnackbar() });
  }
}
