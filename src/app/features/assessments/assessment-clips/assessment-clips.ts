import { ChangeDetectionStrategy, Component, computed, inject, input, linkedSignal, signal, viewChild } from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink, UrlTree } from '@angular/router';
import { EMPTY, catchError, combineLatest, switchMap, tap } from 'rxjs';
import { ProcessingEvents } from '../../../core/processing-events';
import { errorStatus } from '../../../core/api-error';
import type { AssessmentDetail, Clip } from '../../../../contracts/api';
import { AuthStore } from '../../../core/auth-store';
import { LeaveWarning } from '../../../core/leave-guard';
import { EmptyState } from '../../../shared/states/empty-state';
import { AssessmentsApi } from '../../../core/data/assessments-api';
import { CameraGuide } from '../camera-guide/camera-guide';
import { ClipCard } from '../clip-card/clip-card';
import { ClipUploader } from '../clip-uploader/clip-uploader';
import { clipListStep } from '../clip-events';

/** What leaving a page with uploads still running asks. */
export const UPLOADS_RUNNING_WARNING: LeaveWarning = {
  title: 'Stop uploading?',
  message:
    'Clips are still uploading. Leaving this page stops the uploads that have not finished. What was sent is kept: choose the same file here again to continue where it stopped.',
  confirmLabel: 'Leave and stop uploads',
};

/** Clips in the order they were added. */
export function sortClips(clips: readonly Clip[]): Clip[] {
  return [...clips].sort((a, b) => (a.createdAt < b.createdAt ? -1 : a.createdAt > b.createdAt ? 1 : a.id - b.id));
}

/** `clips` with `clip` added or replaced (by id), kept in order. */
export function upsertClip(clips: readonly Clip[], clip: Clip): Clip[] {
  return sortClips([...clips.filter((c) => c.id !== clip.id), clip]);
}

/**
 * The clip half of an assessment page, for staff and athletes alike: camera guidance, the upload
 * zone (or a notice when video consent is not in force) and the clips with live processing state
 * from the athlete's progress stream (`ProcessingEvents`). After a reconnection the clips are
 * reloaded, so nothing that happened while disconnected is missed.
 */
@Component({
  selector: 'app-assessment-clips',
  imports: [RouterLink, MatButtonModule, MatIconModule, EmptyState, CameraGuide, ClipCard, ClipUploader],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './assessment-clips.html',
  styleUrl: './assessment-clips.scss',
})
export class AssessmentClips {
  private readonly api = inject(AssessmentsApi);
  private readonly progress = inject(ProcessingEvents);
  private readonly auth = inject(AuthStore);

  readonly assessment = input.required<AssessmentDetail>();
  /** Staff manage every clip; athletes may delete only what they uploaded. */
  readonly audience = input<'staff' | 'athlete'>('staff');
  /** Where video consent is recorded (the intake). */
  readonly consentLink = input.required<string | UrlTree>();

  /** Live list; reset only when a different assessment is shown. */
  protected readonly clips = linkedSignal<AssessmentDetail, Clip[]>({
    source: this.assessment,
    computation: (a, previous) => (previous && previous.source.id === a.id ? previous.value : sortClips(a.clips)),
  });
  protected readonly videoConsent = linkedSignal(() => this.assessment().videoConsent);
  /** The guide starts open while the assessment has no clips. */
  protected readonly guideOpen = linkedSignal<AssessmentDetail, boolean>({
    source: this.assessment,
    computation: (a, previous) => (previous && previous.source.id === a.id ? previous.value : a.clips.length === 0),
  });
  protected readonly live = signal<'connecting' | 'live' | 'stopped'>('connecting');
  private readonly restart = signal(0);
  private readonly uploader = viewChild(ClipUploader);

  /** Whether uploads are still waiting or running. */
  readonly uploading = computed(() => this.uploader()?.busy() ?? false);

  constructor() {
    const shown = computed(() => ({ id: this.assessment().id, athleteId: this.assessment().athleteId }), {
      equal: (a, b) => a.id === b.id && a.athleteId === b.athleteId,
    });
    combineLatest([toObservable(shown), toObservable(this.restart)])
      .pipe(
        switchMap(([{ id, athleteId }]) => {
          this.live.set('connecting');
          let connections = 0;
          return this.progress.follow(athleteId).pipe(
            tap((message) => {
              if (message.type === 'connected') {
                this.live.set('live');
                // The server sends unfinished items on connecting; a reload also brings what
                // finished or was deleted while the connection was down.
                if (connections++ > 0) this.reload(id);
                return;
              }
              const step = clipListStep(this.clips(), message.event);
              if (step.kind === 'patch') this.clips.update((list) => upsertClip(list, step.clip));
              else if (step.kind === 'drop') this.onDeleted(step.id);
              else if (step.kind === 'fetch') this.refetch(id, step.id);
            }),
            catchError(() => {
              this.live.set('stopped');
              return EMPTY;
            }),
          );
        }),
        takeUntilDestroyed(),
      )
      .subscribe();
  }

  /** Brings one clip's state after a change (shown only when it belongs to this assessment). */
  private refetch(assessmentId: number, clipId: number): void {
    this.api.getClip(clipId).subscribe({
      next: (clip) => {
        if (clip.assessmentId === assessmentId && clip.assessmentId === this.assessment().id)
          this.clips.update((list) => upsertClip(list, clip));
      },
      error: (err: unknown) => {
        // Gone (deleted meanwhile); any other failure keeps what is shown until the next change.
        if (errorStatus(err) === 404) this.onDeleted(clipId);
      },
    });
  }

  protected canDelete(clip: Clip): boolean {
    if (this.audience() === 'staff') return true;
    // The API names the uploader but gives no id; an athlete's own uploads carry their name.
    return clip.uploadedById === this.auth.user()?.id;
  }

  /** The review workspace of a clip, for staff. */
  protected reviewLink(clip: Clip): (string | number)[] | null {
    if (this.audience() !== 'staff') return null;
    return ['/athletes', clip.athleteId, 'assessments', clip.assessmentId, 'clips', clip.id, 'review'];
  }

  protected onUploaded(clip: Clip): void {
    this.clips.update((list) => upsertClip(list, clip));
  }

  protected onChanged(clip: Clip): void {
    this.clips.update((list) => upsertClip(list, clip));
  }

  protected onDeleted(id: number): void {
    this.clips.update((list) => list.filter((c) => c.id !== id));
  }

  protected reconnect(): void {
    this.restart.update((n) => n + 1);
  }

  private reload(id: number): void {
    this.api.get(id).subscribe({
      next: (detail) => {
        if (detail.id !== this.assessment().id) return;
        this.clips.set(sortClips(detail.clips));
        this.videoConsent.set(detail.videoConsent);
      },
      error: () => {
        // Keep what is shown; the next change or reconnection tries again.
      },
    });
  }
}
