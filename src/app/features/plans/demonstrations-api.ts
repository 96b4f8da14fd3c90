import { HttpClient, HttpEventType } from '@angular/common/http';
import { Injectable, inject, signal } from '@angular/core';
import { Observable, map, tap } from 'rxjs';
import type { DemoPicture, DemoPictureUpdate, ExerciseDemonstrations } from '../../../contracts/demonstrations';
import { skipErrorSnackbar } from '../../core/http-context';

/** Progress of a picture upload: sent bytes (0–1), then the server's processing, then the picture. */
export type PictureUploadEvent = { kind: 'sending'; fraction: number } | { kind: 'processing' } | { kind: 'done'; picture: DemoPicture };

/** HTTP for the demonstration pictures of exercises (staff edit them; athletes see those of their plan). */
@Injectable({ providedIn: 'root' })
export class DemonstrationsApi {
  private readonly http = inject(HttpClient);
  /** Bumped after every change, so galleries on the page load again. */
  readonly changes = signal(0);

  of(exerciseId: number): Observable<DemoPicture[]> {
    return this.http
      .get<ExerciseDemonstrations>(`/api/exercises/${exerciseId}/demonstrations`, { context: skipErrorSnackbar() })
      .pipe(map((r) => r.pictures));
  }

  /** Uploads one picture; refusals (4xx) are shown by the caller beside the file. */
  add(exerciseId: number, file: File, caption: string): Observable<PictureUploadEvent> {
    const body = new FormData();
    body.append('caption', caption);
    body.append('file', file, file.name);
    return this.http
      .post<DemoPicture>(`/api/exercises/${exerciseId}/demo-pictures`, body, {
        reportProgress: true,
        observe: 'events',
        context: skipErrorSnackbar(),
      })
      .pipe(
        map((e): PictureUploadEvent | null => {
          if (e.type === HttpEventType.UploadProgress) {
            const fraction = e.total ? e.loaded / e.total : 0;
            return fraction >= 1 ? { kind: 'processing' } : { kind: 'sending', fraction };
          }
          if (e.type === HttpEventType.Response && e.body) return { kind: 'done', picture: e.body };
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
