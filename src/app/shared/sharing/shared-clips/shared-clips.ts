import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, input } from '@angular/core';
import { rxResource, takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog, MatDialogModule } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatTooltipModule } from '@angular/material/tooltip';
import { switchMap } from 'rxjs';
import type { AnnotatedClip } from '../../../../contracts/annotated-clips';
import { errorMessage, errorStatus } from '../../../core/api-error';
import { ProcessingEvents } from '../../../core/processing-events';
import { AnnotatedClipsApi } from '../../../core/data/annotated-clips-api';
import { EmptyState } from '../../states/empty-state';
import { ErrorState } from '../../states/error-state';
import { ClipPreviewDialog } from './clip-preview-dialog';
import { followRenders } from '../follow-renders';
import { actionTracker } from '../action-tracker';
import { clipFactsText, clipTitle } from '../clip-logic';
import { progressPercent, publishButton, publishConfirmText, sharedListStep, type SharedListStep } from '../sharing-logic';

/**
 * The Shared tab's annotated clips (staff): each with its rendering progress, preview in the
 * app, publish / unpublish (with the e-mail notice confirmation) and delete. Renders are followed on
 * the athlete's progress stream (`ProcessingEvents`, the connection the stills and summaries share).
 */
@Component({
  selector: 'app-shared-clips',
  imports: [DatePipe, MatButtonModule, MatDialogModule, MatIconModule, MatProgressBarModule, MatTooltipModule, EmptyState, ErrorState],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './shared-clips.html',
  styleUrl: './shared-clips.scss',
})
export class SharedClips {
  private readonly api = inject(AnnotatedClipsApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly destroyRef = inject(DestroyRef);
  private readonly progress = inject(ProcessingEvents);

  readonly athleteId = input.required<number>();
  readonly athleteName = input('');
  /** Whether the athlete has an account (the publish confirmation says what happens without). */
  readonly hasAccount = input(true);

  protected readonly clips = rxResource({ params: () => this.athleteId(), stream: ({ params }) => this.api.clipsOf(params) });
  protected readonly list = computed<AnnotatedClip[]>(() => (this.clips.hasValue() ? this.clips.value() : []));
  /** Publish / delete requests on the way and their problems, by clip id. */
  protected readonly actions = actionTracker<number>();

  protected readonly publishButton = publishButton;
  protected readonly progressPercent = progressPercent;
  protected readonly clipTitle = clipTitle;
  protected readonly clipFactsText = clipFactsText;
  protected readonly errorMessage = errorMessage;

  constructor() {
    followRenders(this.progress, this.athleteId, {
      // What finished while the connection was down, or before it first opened, comes with a reload.
      connected: (again) => {
        if (again || this.list().some((c) => c.status === 'rendering')) this.reload();
      },
      item: (event) => this.follow(sharedListStep(event, { clips: this.list() })),
    })
      .pipe(takeUntilDestroyed())
      .subscribe();
  }

  /** Carries out one step of following the renders. */
  private follow(step: SharedListStep): void {
    if (step.kind === 'ignore') return;
    if (step.kind === 'drop') {
      this.clips.update((list) => list?.filter((c) => c.id !== step.id));
      return;
    }
    if (step.kind === 'progress') {
      const progress = step.progress;
      this.clips.update((list) => list?.map((c) => (c.id === step.id ? { ...c, progress } : c)));
      return;
    }
    this.api
      .get(step.id)
      .pipe(takeUntilDestroyed(this.destroyRef))
      .subscribe({
        next: (clip) => {
          if (clip.athleteId !== this.athleteId()) return;
          this.clips.update((list) =>
            list?.some((c) => c.id === clip.id) ? list.map((c) => (c.id === clip.id ? clip : c)) : [clip, ...(list ?? [])],
          );
        },
        error: (err: unknown) => {
          if (errorStatus(err) === 404) this.follow({ ...step, kind: 'drop' });
        },
      });
  }

  protected preview(clip: AnnotatedClip): void {
    this.dialog.open(ClipPreviewDialog, { data: clip, width: '960px', maxWidth: '96vw', autoFocus: 'first-tabbable', restoreFocus: true });
  }

  protected async togglePublish(clip: AnnotatedClip): Promise<void> {
    const button = publishButton(clip);
    if (button.disabled) return;
    if (button.action === 'publish' && !(await this.actions.confirm(publishConfirmText('clip', this.athleteName(), this.hasAccount()))))
      return;
    const saved = await this.actions.run(clip.id, this.api.publish(clip.id, button.action === 'publish'));
    if (!saved) return;
    this.clips.update((list) => list?.map((c) => (c.id === saved.id ? saved : c)));
    this.snackBar.open(saved.publishedAt ? 'Clip published — the athlete gets an e-mail notice' : 'Clip unpublished', undefined, {
      duration: 3000,
    });
  }

  protected async remove(clip: AnnotatedClip): Promise<void> {
    const ok = await this.actions.confirm({
      title: 'Delete this annotated clip?',
      message: clip.publishedAt ? 'The athlete will no longer see it. The video is removed for good.' : 'The video is removed for good.',
      confirmLabel: 'Delete clip',
    });
    if (!ok) return;
    const done = await this.actions.run(clip.id, this.api.delete(clip.id).pipe(switchMap(() => [true])));
    if (!done) return;
    this.clips.update((list) => list?.filter((c) => c.id !== clip.id));
    this.snackBar.open('Annotated clip deleted', undefined, { duration: 3000 });
  }

  /** Reloads the list (after a clip was made elsewhere). */
  reload(): void {
    this.clips.reload();
  }
}
