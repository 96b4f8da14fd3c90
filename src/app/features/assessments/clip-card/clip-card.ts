import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input, linkedSignal, output, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatCardModule } from '@angular/material/card';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { filter, firstValueFrom } from 'rxjs';
import type { Clip, ClipUpdate } from '../../../../contracts/api';
import { CAPTURE_FPS_LIMITS, DIRECTIONS, DIRECTION_LABELS, Direction, SIDES, Side } from '../../../../contracts/assessment';
import { errorMessage } from '../../../core/api-error';
import { ConfirmDialog, ConfirmDialogData } from '../../../shared/confirm-dialog/confirm-dialog';
import { AssessmentsApi, clipMedia } from '../../../core/data/assessments-api';
import { clipFacts, clipStatusView, imageBox, isProcessing, isReviewable, readCaptureFps } from '../../../shared/clip-status';

const SIDE_LABELS: Record<Side, string> = { left: 'Left', right: 'Right' };

/**
 * One clip: poster, live processing state, per-clip settings (near side, running direction,
 * capture frame rate), facts and a strip of thumbnails. Settings save as soon as they change.
 */
@Component({
  selector: 'app-clip-card',
  imports: [
    DatePipe,
    MatCardModule,
    MatButtonModule,
    MatButtonToggleModule,
    MatFormFieldModule,
    MatInputModule,
    MatIconModule,
    MatProgressBarModule,
    RouterLink,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './clip-card.html',
  styleUrl: './clip-card.scss',
})
export class ClipCard {
  private readonly api = inject(AssessmentsApi);
  private readonly dialog = inject(MatDialog);

  readonly clip = input.required<Clip>();
  /** Whether this user may delete the clip. */
  readonly canDelete = input(true);
  /** Whether the viewer is the athlete, whose settings lock once the clinician has marked the clip. */
  readonly athleteView = input(false);
  /** Where the review workspace of this clip is (staff only); no button when null. */
  readonly reviewLink = input<readonly (string | number)[] | null>(null);
  /** Emits the clip as the server returns it after a settings change or a retry. */
  readonly changed = output<Clip>();
  /** Emits the id of a clip the server deleted. */
  readonly deleted = output<number>();

  /** Whether the settings are read-only here: an athlete's view of a clip the clinician has marked. */
  protected readonly settingsLocked = computed(() => this.clip().marked && this.athleteView());
  protected readonly status = computed(() => clipStatusView(this.clip()));
  protected readonly processing = computed(() => isProcessing(this.clip().status));
  /** The review opens as soon as the first frames exist. */
  protected readonly reviewable = computed(() => isReviewable(this.clip()));
  protected readonly facts = computed(() => clipFacts(this.clip()));
  protected readonly poster = computed(() => imageBox(this.clip(), 180));
  protected readonly thumbBox = computed(() => imageBox(this.clip(), 72));
  protected readonly thumbs = computed(() => {
    const c = this.clip();
    if (c.status !== 'ready') return [];
    const every = c.thumbEvery ?? 1;
    const fps = c.effectiveFps;
    return Array.from({ length: c.thumbCount }, (_, n) => {
      const frame = n * every;
      const time = fps ? ` · ${(frame / fps).toFixed(2)} s` : '';
      return { n, src: clipMedia.thumb(c.id, n), label: `Frame ${frame}${time}` };
    });
  });
  protected readonly posterSrc = computed(() => clipMedia.poster(this.clip().id));
  protected readonly originalHref = computed(() => clipMedia.original(this.clip().id));

  // Settings as shown; they follow the clip and are put back when a save fails.
  protected readonly nearSide = linkedSignal(() => this.clip().nearSide);
  protected readonly direction = linkedSignal(() => this.clip().direction);
  protected readonly captureFpsText = linkedSignal(() => {
    const fps = this.clip().captureFps;
    return fps === null ? '' : String(fps);
  });
  protected readonly captureFpsError = signal<string | null>(null);
  protected readonly settingProblem = signal<string | null>(null);
  protected readonly saving = signal(false);
  protected readonly busy = signal(false);

  protected readonly sides = SIDES;
  protected readonly sideLabels = SIDE_LABELS;
  protected readonly directions = DIRECTIONS;
  protected readonly directionLabels = DIRECTION_LABELS;
  protected readonly fpsLimits = CAPTURE_FPS_LIMITS;

  protected setNearSide(side: Side): void {
    if (side === this.clip().nearSide || this.settingsLocked()) return;
    this.nearSide.set(side);
    void this.save({ nearSide: side });
  }

  protected setDirection(direction: Direction): void {
    if (direction === this.clip().direction || this.settingsLocked()) return;
    this.direction.set(direction);
    void this.save({ direction });
  }

  protected onCaptureFpsInput(text: string): void {
    this.captureFpsText.set(text);
    this.captureFpsError.set(null);
  }

  /** Saves the capture rate when the field is left or Enter is pressed. */
  protected commitCaptureFps(): void {
    if (this.settingsLocked()) return;
    const read = readCaptureFps(this.captureFpsText());
    if ('error' in read) {
      this.captureFpsError.set(read.error);
      return;
    }
    this.captureFpsError.set(null);
    if (read.value === this.clip().captureFps) return;
    void this.save({ captureFps: read.value });
  }

  protected async retry(): Promise<void> {
    if (this.busy()) return;
    this.busy.set(true);
    try {
      this.changed.emit(await firstValueFrom(this.api.retryClip(this.clip().id)));
    } catch {
      // The error snackbar says why.
    } finally {
      this.busy.set(false);
    }
  }

  protected confirmDelete(): void {
    const clip = this.clip();
    this.dialog
      .open<ConfirmDialog, ConfirmDialogData, boolean>(ConfirmDialog, {
        data: {
          title: 'Delete this clip?',
          message: `"${clip.originalName}" and all frames taken from it are deleted. This cannot be undone.`,
          confirmLabel: 'Delete clip',
        },
        maxWidth: '95vw',
        width: '440px',
      })
      .afterClosed()
      .pipe(filter((yes) => yes === true))
      .subscribe(() => void this.delete());
  }

  private async delete(): Promise<void> {
    this.busy.set(true);
    try {
      await firstValueFrom(this.api.deleteClip(this.clip().id));
      this.deleted.emit(this.clip().id);
    } catch {
      // The error snackbar says why.
    } finally {
      this.busy.set(false);
    }
  }

  private async save(change: ClipUpdate): Promise<void> {
    this.saving.set(true);
    this.settingProblem.set(null);
    try {
      this.changed.emit(await firstValueFrom(this.api.updateClip(this.clip().id, change)));
    } catch (err) {
      // Show the setting as it still is on the server, and why the change did not stick.
      this.nearSide.set(this.clip().nearSide);
      this.direction.set(this.clip().direction);
      if ('captureFps' in change) {
        this.captureFpsError.set(errorMessage(err));
      } else {
        this.settingProblem.set(errorMessage(err));
      }
    } finally {
      this.saving.set(false);
    }
  }
}
