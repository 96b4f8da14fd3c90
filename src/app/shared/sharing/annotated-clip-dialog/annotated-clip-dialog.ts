import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MAT_DIALOG_DATA, MatDialog, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import {
  ANNOTATED_CLIP_MAX_SOURCE_FRAMES,
  CLIP_CAPTION_MAX,
  SLOW_MOTION_FACTORS,
  SLOW_MOTION_LABELS,
  type AnnotatedClip,
  type SlowMotionFactor,
} from '../../../../contracts/annotated-clips';
import { frameRangeProblem } from '../../../../kinematics';
import { AnnotatedClipsApi } from '../../../core/data/annotated-clips-api';
import { textCount } from '../sharing-logic';
import { saveProblems } from '../sharing-errors';
import { clipLengthText } from '../clip-logic';

/** What the dialog makes: a frame range of one clip (review), or Baseline and Re-test side by side (comparison). */
export type AnnotatedClipDialogData = {
  /** What is being made, in words ("Frames of the Baseline · 6 Oct 2026, clip.mp4"). */
  what: string;
  /** Angle labels on by default (the page's current setting). */
  showAngles?: boolean;
  caption?: string;
} & (
  | { mode: 'single'; clipId: number; frameCount: number; fps: number; from: number; to: number }
  | { mode: 'side_by_side'; athleteId: number; baselineClipId: number; retestClipId: number }
);

/**
 * "Make annotated clip": the frame range (from the review; default two strides around the current
 * frame), the slow-motion speed, a caption and whether angles are drawn. Closes with the clip as the
 * server answered (`rendering`); on an error what was typed stays and the problem shows by its field.
 */
@Component({
  selector: 'app-annotated-clip-dialog',
  imports: [
    MatDialogModule,
    MatFormFieldModule,
    MatInputModule,
    MatSlideToggleModule,
    MatButtonToggleModule,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './annotated-clip-dialog.html',
  styleUrl: './annotated-clip-dialog.scss',
})
export class AnnotatedClipDialog {
  private readonly api = inject(AnnotatedClipsApi);
  private readonly dialogRef = inject<MatDialogRef<AnnotatedClipDialog, AnnotatedClip>>(MatDialogRef);
  protected readonly data = inject<AnnotatedClipDialogData>(MAT_DIALOG_DATA);

  protected readonly factors = SLOW_MOTION_FACTORS;
  protected readonly factorLabels = SLOW_MOTION_LABELS;
  protected readonly maxFrames = ANNOTATED_CLIP_MAX_SOURCE_FRAMES;
  protected readonly captionMax = CLIP_CAPTION_MAX;
  protected readonly from = signal(this.data.mode === 'single' ? this.data.from : 0);
  protected readonly to = signal(this.data.mode === 'single' ? this.data.to : 0);
  protected readonly factor = signal<SlowMotionFactor>(0.25);
  protected readonly caption = signal(this.data.caption ?? '');
  protected readonly showAngles = signal(this.data.showAngles ?? true);
  protected readonly busy = signal(false);
  protected readonly fieldErrors = signal<Record<string, string>>({});
  protected readonly problem = signal<string | null>(null);
  protected readonly count = computed(() => textCount(this.caption(), CLIP_CAPTION_MAX));
  /** The range's problem as typed (checked again by the server). */
  protected readonly rangeProblem = computed(() =>
    this.data.mode === 'single' ? frameRangeProblem(this.from(), this.to(), this.data.frameCount, ANNOTATED_CLIP_MAX_SOURCE_FRAMES) : null,
  );
  protected readonly length = computed(() =>
    this.data.mode === 'single' && !this.rangeProblem() ? clipLengthText(this.to() - this.from() + 1, this.data.fps, this.factor()) : '',
  );

  protected setNumber(which: 'from' | 'to', value: string): void {
    (which === 'from' ? this.from : this.to).set(value.trim() === '' ? Number.NaN : Number(value));
    this.fieldErrors.set({});
  }

  protected onCaption(value: string): void {
    this.caption.set(value);
    this.fieldErrors.update(({ caption: _c, ...rest }) => rest);
  }

  protected async save(): Promise<void> {
    if (this.busy() || this.count().over || this.rangeProblem()) return;
    this.problem.set(null);
    this.busy.set(true);
    const common = { factor: this.factor(), caption: this.caption().trim(), showAngles: this.showAngles() };
    const d = this.data;
    try {
      const clip = await firstValueFrom(
        d.mode === 'single'
          ? this.api.create(d.clipId, { ...common, fromFrame: this.from(), toFrame: this.to() })
          : this.api.createSideBySide(d.athleteId, { ...common, baselineClipId: d.baselineClipId, retestClipId: d.retestClipId }),
      );
      this.dialogRef.close(clip);
    } catch (err) {
      const { byField, general } = saveProblems(err, ['fromFrame', 'toFrame', 'factor', 'caption']);
      this.fieldErrors.set(byField);
      this.problem.set(general);
    } finally {
      this.busy.set(false);
    }
  }
}

/**
 * Opens "Make annotated clip" and, once made, says so with a link to the athlete's Shared tab
 * (where rendering progress, preview and publish are). Resolves with the clip, or null.
 */
export function openAnnotatedClipDialog(
  deps: { dialog: MatDialog; snackBar: MatSnackBar; router: Router },
  athleteId: number,
  data: AnnotatedClipDialogData,
): Promise<AnnotatedClip | null> {
  const ref = deps.dialog.open<AnnotatedClipDialog, AnnotatedClipDialogData, AnnotatedClip>(AnnotatedClipDialog, {
    data,
    width: '600px',
    maxWidth: '95vw',
    autoFocus: 'first-tabbable',
    restoreFocus: true,
  });
  return firstValueFrom(ref.afterClosed()).then((clip) => {
    if (!clip) return null;
    deps.snackBar
      .open('Annotated clip started — rendering…', 'View shared items', { duration: 8000 })
      .onAction()
      .subscribe(() => void deps.router.navigate(['/athletes', athleteId], { queryParams: { tab: 'shared' } }));
    return clip;
  });
}
