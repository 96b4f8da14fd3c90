import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatIconModule } from '@angular/material/icon';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatTooltipModule } from '@angular/material/tooltip';
import type { LandmarkName } from '../../../../contracts/annotations';
import { LANDMARKS, LANDMARK_LABELS } from '../../../../contracts/annotations';
import { SIDES, Side } from '../../../../contracts/assessment';
import { previousMarkedFrame } from '../annotation-ops';
import { GaugeTool } from '../gauge-tool';
import { MarkerFollowing } from '../marker-following';
import { ReviewStore } from '../review-store';

/**
 * Side and landmark pickers, what is placed on this frame, copy from the previous marked frame,
 * Follow markers (frame range, progress, cancel, frames to check), and this frame's angle gauges (select, remove).
 */
@Component({
  selector: 'app-landmarks-panel',
  imports: [
    MatButtonModule,
    MatButtonToggleModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    MatSlideToggleModule,
    MatTooltipModule,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './landmarks-panel.html',
  styleUrl: './landmarks-panel.scss',
})
export class LandmarksPanel {
  protected readonly store = inject(ReviewStore);
  protected readonly gauges = inject(GaugeTool);
  protected readonly following = inject(MarkerFollowing);
  private readonly snackBar = inject(MatSnackBar);

  protected readonly sides = SIDES;
  protected readonly rows = computed(() => {
    const points = this.store.sidePoints();
    const chosen = this.store.landmark();
    const selected = this.store.selected();
    const side = this.store.side();
    const missing = this.following.missingHere();
    return LANDMARKS.map((name, i) => ({
      name,
      key: String(i + 1),
      label: LANDMARK_LABELS[name],
      placed: !!points[name],
      followed: points[name]?.origin === 'followed',
      missing: !points[name] && missing.some((m) => m.side === side && m.landmark === name),
      chosen: name === chosen,
      selected: selected?.side === side && selected.landmark === name,
    }));
  });
  protected readonly chosenLabel = computed(() => LANDMARK_LABELS[this.store.landmark()]);
  protected readonly placedCount = computed(() => this.rows().filter((r) => r.placed).length);
  /** Whether this frame has a followed point to check. */
  protected readonly lowHere = computed(() => this.following.lowFrames().includes(this.store.frame()));
  protected readonly copyFrom = computed(() => previousMarkedFrame(this.store.annotations(), this.store.frame()));

  protected sideLabel(side: Side): string {
    const name = side === 'left' ? 'Left' : 'Right';
    return side === this.store.nearSide() ? `${name} (near)` : `${name} (far)`;
  }

  protected choose(name: LandmarkName): void {
    this.store.chooseLandmark(name);
  }

  protected remove(name: LandmarkName): void {
    this.store.removePoint({ side: this.store.side(), landmark: name });
  }

  /** Selects a gauge and turns the Angle gauge on, so its points can be dragged. */
  protected selectGauge(id: string): void {
    this.store.setTool('gauge');
    this.gauges.select(id);
  }

  /** Chooses a marker following lost on this frame, so the next click on the frame places it. */
  protected placeMissing(side: Side, landmark: LandmarkName): void {
    this.store.setTool('landmark');
    this.store.chooseSide(side);
    this.store.chooseLandmark(landmark);
  }

  /** Goes to the next frame following could not follow a marker on. */
  protected nextToCheck(): void {
    if (!this.following.stepToCheck(1)) this.snackBar.open('No other frame to check.', undefined, { duration: 2000 });
  }

  /** Sets one end of the range to follow from what was typed (empty: the clip's own end). */
  protected setEnd(end: 'from' | 'to', text: string): void {
    this.following.setRangeEnd(end, text.trim() === '' ? null : Number(text));
  }

  protected copyPrevious(): void {
    const from = this.store.copyPrevious();
    if (from !== null) this.snackBar.open(`Copied the points of frame ${from}. Drag them into place.`, 'OK', { duration: 3000 });
  }
}
