import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';
import type {
  ClipAnnotations,
  ClipAnnotationsWrite,
  EventProposalsResult,
  FollowMarkersRequest,
  FollowMarkersStarted,
} from '../../../contracts/annotations';
import type { ClipMeasures } from '../../../contracts/measures';
import type { FrameManifest } from '../../../contracts/api';
import { skipErrorSnackbar } from '../http-context';

/** The frame manifest as `GET /api/clips/:id/manifest` sends it (shape shared with the server). */
export type ClipManifest = FrameManifest;

/**
 * HTTP for the review workspace: frames, manifest, annotations and the server's measures. Pages
 * show load failures in their own error states; saves report through the save indicator, so none
 * of these raise the error snackbar.
 */
@Injectable({ providedIn: 'root' })
export class ReviewApi {
  private readonly http = inject(HttpClient);

  manifest(clipId: number): Observable<ClipManifest> {
    return this.http.get<ClipManifest>(`/api/clips/${clipId}/manifest`, { context: skipErrorSnackbar() });
  }

  /** One working frame as JPEG (0-based). Unsubscribing aborts the request. */
  frame(clipId: number, n: number): Observable<Blob> {
    return this.http.get(`/api/clips/${clipId}/frames/${n}`, { responseType: 'blob', context: skipErrorSnackbar() });
  }

  annotations(clipId: number): Observable<ClipAnnotations> {
    return this.http.get<ClipAnnotations>(`/api/clips/${clipId}/annotations`, { context: skipErrorSnackbar() });
  }

  /**
   * Saves everything marked on the clip. Answers the new revision; 409 `stale_revision` (with
   * `details.current`) when someone saved since `baseRevision`; 422 with details when invalid.
   */
  saveAnnotations(clipId: number, body: ClipAnnotationsWrite): Observable<ClipAnnotations> {
    return this.http.put<ClipAnnotations>(`/api/clips/${clipId}/annotations`, body, { context: skipErrorSnackbar() });
  }

  /**
   * Asks the server to propose gait events from the clip's landmarks and save them as proposals
   * (placed and accepted events stay). 409 `stale_revision` when someone saved since
   * `baseRevision`; 422 `too_few_landmarked_frames` / `no_events_found` with the reason.
   */
  proposeEvents(clipId: number, baseRevision: number): Observable<EventProposalsResult> {
    return this.http.post<EventProposalsResult>(`/api/clips/${clipId}/events/proposals`, { baseRevision }, { context: skipErrorSnackbar() });
  }

  /** Queues following the markers of one frame through the clip (progress on the athlete's stream). */
  followMarkers(clipId: number, body: FollowMarkersRequest): Observable<FollowMarkersStarted> {
    return this.http.post<FollowMarkersStarted>(`/api/clips/${clipId}/follow`, body, { context: skipErrorSnackbar() });
  }

  /** Stops the clip's queued or running follow; nothing it followed is kept. */
  cancelFollow(clipId: number): Observable<{ cancelled: number }> {
    return this.http.post<{ cancelled: number }>(`/api/clips/${clipId}/follow/cancel`, {}, { context: skipErrorSnackbar() });
  }

  /** The measures the server stored when the annotations last changed. */
  measures(clipId: number): Observable<ClipMeasures> {
    return this.http.get<ClipMeasures>(`/api/clips/${clipId}/measures`, { context: skipErrorSnackbar() });
  }
}
