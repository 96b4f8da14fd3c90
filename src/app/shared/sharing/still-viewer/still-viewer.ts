import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialog, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import type { Still } from '../../../../contracts/sharing';
import { CautionNote } from '../../caution-note/caution-note';
import { SHARED_CAUTION, panelText, positionText, stepIndex, stillAlt, stillSrc, swipeStep } from '../sharing-logic';

export interface StillViewerData {
  stills: Still[];
  index: number;
}

/**
 * A still enlarged to the whole screen: the image (phone JPEG on narrow screens), its caption
 * under it, "n of m"; swipe (drag sideways more than 50 px), the arrow keys or the buttons move
 * between stills.
 */
@Component({
  selector: 'app-still-viewer',
  imports: [DatePipe, MatDialogModule, MatButtonModule, MatIconModule, CautionNote],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './still-viewer.html',
  styleUrl: './still-viewer.scss',
  host: {
    class: 'still-viewer',
    '(document:keydown)': 'onKey($event)',
  },
})
export class StillViewer {
  protected readonly data = inject<StillViewerData>(MAT_DIALOG_DATA);
  protected readonly index = signal(stepIndex(this.data.index, 0, this.data.stills.length));
  protected readonly still = computed<Still | null>(() => this.data.stills[this.index()] ?? null);
  protected readonly position = computed(() => positionText(this.index(), this.data.stills.length));
  protected readonly atStart = computed(() => this.index() <= 0);
  protected readonly atEnd = computed(() => this.index() >= this.data.stills.length - 1);
  protected readonly stillAlt = stillAlt;
  protected readonly stillSrc = stillSrc;
  /** Angles are on the image: the caution goes with them, even full screen. */
  protected readonly caution = SHARED_CAUTION;
  protected readonly panelText = panelText;
  private drag: { id: number; x: number; y: number } | null = null;

  protected move(by: number): void {
    this.index.set(stepIndex(this.index(), by, this.data.stills.length));
  }

  protected onKey(e: KeyboardEvent): void {
    if (e.defaultPrevented || e.altKey || e.ctrlKey || e.metaKey) return;
    if (e.key === 'ArrowRight') this.move(1);
    else if (e.key === 'ArrowLeft') this.move(-1);
    else if (e.key === 'Home') this.index.set(0);
    else if (e.key === 'End') this.index.set(Math.max(0, this.data.stills.length - 1));
    else return;
    e.preventDefault();
  }

  protected onPointerDown(e: PointerEvent): void {
    if (e.pointerType === 'mouse' && e.button !== 0) return;
    this.drag = { id: e.pointerId, x: e.clientX, y: e.clientY };
  }

  protected onPointerUp(e: PointerEvent): void {
    const d = this.drag;
    this.drag = null;
    if (!d || d.id !== e.pointerId) return;
    const step = swipeStep(e.clientX - d.x, e.clientY - d.y);
    if (step) this.move(step);
  }

  protected onPointerCancel(): void {
    this.drag = null;
  }
}

/** Opens the viewer over the whole screen at `index`. */
export function openStillViewer(dialog: MatDialog, stills: Still[], index: number): MatDialogRef<StillViewer> {
  return dialog.open<StillViewer, StillViewerData>(StillViewer, {
    data: { stills, index },
    width: '100vw',
    maxWidth: '100vw',
    height: '100dvh',
    maxHeight: '100dvh',
    panelClass: 'still-viewer-panel',
    autoFocus: 'dialog',
    ariaLabel: 'Still, enlarged',
  });
}
