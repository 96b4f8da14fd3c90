import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialog, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import { CAPTION_MAX, type Still, type StillCreate } from '../../../../contracts/sharing';
import { textCount } from '../sharing-logic';
import { saveProblems } from '../sharing-errors';
import { StillsApi } from '../../../core/data/stills-api';

/** What the save-still dialog saves: the clip and frame (and, for a pair, the baseline's). */
export interface SaveStillData {
  clipId: number;
  frameIndex: number;
  pairWith?: { clipId: number; frameIndex: number } | null;
  /** What is being saved, in words, e.g. "Frame 41 of the Re-test · 1 Dec 2026". */
  what: string;
  /** Angle labels on by default (the review's current setting). */
  showAngles?: boolean;
  /** The review has marks not saved yet (the still is drawn from the saved ones). */
  unsavedMarks?: boolean;
  /** The caption to start from (e.g. the frame's gait events, "Right toe-off · step 3."). */
  caption?: string;
}

/**
 * "Save still": a caption (counted against CAPTION_MAX) and whether angles are drawn. Closes with
 * the still as the server answered (`rendering`); on an error the caption stays as typed.
 */
@Component({
  selector: 'app-save-still-dialog',
  imports: [
    MatDialogModule,
    MatFormFieldModule,
    MatInputModule,
    MatSlideToggleModule,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './save-still-dialog.html',
  styleUrl: './save-still-dialog.scss',
})
export class SaveStillDialog {
  private readonly api = inject(StillsApi);
  private readonly dialogRef = inject<MatDialogRef<SaveStillDialog, Still>>(MatDialogRef);
  protected readonly data = inject<SaveStillData>(MAT_DIALOG_DATA);

  protected readonly max = CAPTION_MAX;
  protected readonly caption = signal(this.data.caption ?? '');
  protected readonly showAngles = signal(this.data.showAngles ?? true);
  protected readonly busy = signal(false);
  protected readonly captionError = signal<string | null>(null);
  protected readonly problem = signal<string | null>(null);
  protected readonly count = computed(() => textCount(this.caption(), CAPTION_MAX));
  protected readonly captionMessage = computed(() =>
    this.count().over ? `The caption is ${-this.count().remaining} characters over the limit of ${CAPTION_MAX}.` : this.captionError(),
  );

  protected onCaption(value: string): void {
    this.caption.set(value);
    this.captionError.set(null);
  }

  protected async save(): Promise<void> {
    if (this.busy()) return;
    if (this.count().over) return;
    this.problem.set(null);
    this.busy.set(true);
    const body: StillCreate = {
      frameIndex: this.data.frameIndex,
      caption: this.caption().trim(),
      showAngles: this.showAngles(),
      pairWith: this.data.pairWith ?? null,
    };
    try {
      const still = await firstValueFrom(this.api.createStill(this.data.clipId, body));
      this.dialogRef.close(still);
    } catch (err) {
      const { byField, general } = saveProblems(err, ['caption']);
      this.captionError.set(byField['caption'] ?? null);
      this.problem.set(general);
    } finally {
      this.busy.set(false);
    }
  }
}

/**
 * Opens "Save still" and, once saved, says so with a link to the athlete's shared items
 * (the profile's Shared tab, where rendering progress shows). Resolves with the still, or null.
 */
export function openSaveStill(
  deps: { dialog: MatDialog; snackBar: MatSnackBar; router: Router },
  athleteId: number,
  data: SaveStillData,
): Promise<Still | null> {
  const ref = deps.dialog.open<SaveStillDialog, SaveStillData, Still>(SaveStillDialog, {
    data,
    width: '560px',
    maxWidth: '95vw',
    autoFocus: 'first-tabbable',
    restoreFocus: true,
  });
  return firstValueFrom(ref.afterClosed()).then((still) => {
    if (!still) return null;
    deps.snackBar
      .open('Still saved — rendering…', 'View shared items', { duration: 8000 })
      .onAction()
      .subscribe(() => void deps.router.navigate(['/athletes', athleteId], { queryParams: { tab: 'shared' } }));
    return still;
  });
}
