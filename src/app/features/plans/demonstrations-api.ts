import { HttpClient, HttpEventType } from '@angular/common/http';
import { Injectable, inject, signal } from '@angular/core';
import { Observable, map, tap } from 'rxjs';
import type { DemoClip, DemoClipUpdate, DemoPicture, DemoPictureUpdate, ExerciseDemonstrations } from '../../../contracts/demonstrations';
import { skipErrorSnackbar } from '../../core/http-context';

/** Progress of an upload: sent bytes (0–1), then the server's checks, then what it made. */
export type UploadEvent<T> = { kind: 'sending'; fraction: number } | { kind: 'processing' } | { kind: 'done'; item: T };
/** Progress of a picture upload: sent bytes (0–1), then the server's processing, then the picture. */
export type PictureUploadEvent = { kind: 'sending'; fraction: number } | { kind: 'processing' } | { kind: 'done'; picture: DemoPicture };

/** HTTP for the demonstration pictures of exercises (staff edit them; athletes see those of their plan). */
@Injectable({ providedIn: 'root' })
export class DemonstrationsApi {
  private readonly http = inject(HttpClient);
  /** Bumped after every change, so galleries on the page load again. */
  readonly changes = signal(0);

  /** The exercise's pictures and clip. */
  of(exerciseId: number): Observable<ExerciseDemonstrations> {
    return this.http.get<ExerciseDemonstrations>(`/api/exercises/${exerciseId}/demonstrations`, { context: skipErrorSnackbar() });
  }

  /** Uploads one picture; refusals (4xx) are shown by the caller beside the file. */
  add(exerciseId: number, file: File, caption: string): Observable<PictureUploadEvent> {
    return this.upload<DemoPicture>(`/api/exercises/${exerciseId}/demo-pictures`, file, caption).pipe(
      map((e) => (e.kind === 'done' ? { kind: 'done' as const, picture: e.item } : e)),
    );
  }

  /** Uploads the exercise's clip (≤ 30 s); it is then made phone-ready on the server (progress on the clinic stream). */
  addClip(exerciseId: number, file: File, caption: string): Observable<UploadEvent<DemoClip>> {
    return this.upload<DemoClip>(`/api/exercises/${exerciseId}/demo-clip`, file, caption);
  }

  updateClip(id: number, change: DemoClipUpdate): Observable<DemoClip> {
    return this.http
      .patch<DemoClip>(`/api/demo-clips/${id}`, change, { context: skipErrorSnackbar(422) })
      .pipe(tap(() => this.changes.update((n) => n + 1)));
  }

  removeClip(id: number): Observable<void> {
    return this.http.delete<void>(`/api/demo-clips/${id}`).pipe(tap(() => this.changes.update((n) => n + 1)));
  }

  /** Asks the galleries on the page to load again (a clip became ready). */
  refresh(): void {
    this.changes.update((n) => n + 1);
  }

  private upload<T>(url: string, file: File, caption: string): Observable<UploadEvent<T>> {
    const body = new FormData();
    body.append('caption', caption);
    body.append('file', file, file.name);
    return this.http
      .post<T>(url, body, {
        reportProgress: true,
        observe: 'events',
        context: skipErrorSnackbar(),
      })
      .pipe(
        map((e): UploadEvent<T> | null => {
          if (e.type === HttpEventType.UploadProgress) {
            const fraction = e.total ? e.loaded / e.total : 0;
            return fraction >= 1 ? { kind: 'processing' } : { kind: 'sending', fraction };
          }
          if (e.type === HttpEventType.Response && e.body) return { kind: 'done', item: e.body };
          return null;
        }),
        map((e) => e ?? ({ kind: 'processing' } as const)),
        tap((e) => {
          if (e.kind === 'done') this.changes.update((n) => n + 1);
        }),
      );
  }

  update(id: number, change: DemoPictureUpdate): Observable<DemoPicture> {
    return this.http
      .patch<DemoPicture>(`/api/demo-pictures/${id}`, change, { context: skipErrorSnackbar(422) })
      .pipe(tap(() => this.changes.update((n) => n + 1)));
  }

  remove(id: number): Observable<void> {
    return this.http.delete<void>(`/api/demo-pictures/${id}`).pipe(tap(() => this.changes.update((n) => n + 1)));
  }
}
