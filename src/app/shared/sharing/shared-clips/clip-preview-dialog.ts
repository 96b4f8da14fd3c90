import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule } from '@angular/material/dialog';
import type { AnnotatedClip } from '../../../../contracts/annotated-clips';
import { ClipPlayer } from '../clip-player/clip-player';
import { clipFactsText, clipTitle } from '../clip-logic';

/** Preview of an annotated clip in the app, before (or after) publishing it. */
@Component({
  selector: 'app-clip-preview-dialog',
  imports: [MatDialogModule, MatButtonModule, ClipPlayer],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <h2 mat-dialog-title>{{ title }}</h2>
    <mat-dialog-content class="content">
      <app-clip-player [clip]="clip" />
      <p class="muted small">{{ facts }}{{ clip.note ? ' · ' + clip.note : '' }}</p>
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button mat-button type="button" mat-dialog-close>Close</button>
    </mat-dialog-actions>
  `,
  styles: `
    .content {
      display: flex;
      flex-direction: column;
      gap: 8px;
    }
    p {
      margin: 0;
    }
  `,
})
export class ClipPreviewDialog {
  protected readonly clip = inject<AnnotatedClip>(MAT_DIALOG_DATA);
  protected readonly title = clipTitle(this.clip);
  protected readonly facts = clipFactsText(this.clip);
}
