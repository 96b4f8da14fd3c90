import { Injectable, computed, inject, signal } from '@angular/core';
import type { AngleGauge, FramePoint } from '../../../contracts/annotations';
import { formatValue } from '../../../kinematics/format';
import { gaugeAngleDeg, gaugeFromClicks } from '../../../kinematics/angle-gauge';
import { GaugeHandleRef, gaugeById, gaugesOn, moveGaugePointChanges, newGaugeId, putGaugeChanges, removeGaugeChanges } from './gauge-ops';
import { ReviewStore } from './review-store';

/** One gauge of the current frame as the panel lists it. */
export interface GaugeRow {
  id: string;
  /** 1-based number on this frame. */
  n: number;
  /** "34.2°", or "—" for a gauge whose arms have no length. */
  value: string;
}

/**
 * The Angle gauge tool (key G): three clicks on the frame — an arm end, the vertex, the other arm
 * end — measure any angle (pelvis, arm carriage…); drag a point to adjust it, Delete removes the
 * selected gauge. Gauges are annotations like landmarks: undoable, autosaved, on stills.
 * Provided by the review page beside the store.
 */
@Injectable()
export class GaugeTool {
  private readonly store = inject(ReviewStore);
  private readonly selectedId = signal<string | null>(null);
  private readonly draft = signal<{ frame: number; points: FramePoint[] } | null>(null);

  /** Where the pointer is while a gauge is being placed (draws the next arm). */
  readonly hover = signal<FramePoint | null>(null);
  /** The gauges of the current frame. */
  readonly frameGauges = computed(() => gaugesOn(this.store.annotations(), this.store.frame()));
  /** The selected gauge's id, while it is on this frame and no landmark is selected. */
  readonly selected = computed(() => {
    const id = this.selectedId();
    return id && !this.store.selected() && this.frameGauges().some((g) => g.id === id) ? id : null;
  });
  /** Points clicked so far for a new gauge on this frame (none unless the tool is on). */
  readonly draftPoints = computed<FramePoint[]>(() => {
    const d = this.draft();
    return d && d.frame === this.store.frame() && this.store.tool() === 'gauge' ? d.points : [];
  });
  /** The current frame's gauges with their values, for the panel. */
  readonly rows = computed<GaugeRow[]>(() =>
    this.frameGauges().map((g, i) => ({ id: g.id, n: i + 1, value: formatValue(gaugeAngleDeg(g, this.store.frameSize()), '°') })),
  );
  /** What the next click places, in words. */
  readonly nextClick = computed(() => ['the first arm’s end', 'the vertex', 'the other arm’s end'][this.draftPoints().length] ?? '');

  /** A click on the frame with the tool on: the next point; the third one makes the gauge. */
  click(at: FramePoint): AngleGauge | null {
    const frame = this.store.frame();
    const points = [...this.draftPoints(), at];
    const gauge = gaugeFromClicks(newGaugeId(), frame, points);
    if (!gauge) {
      this.draft.set({ frame, points });
      this.store.requestDraw();
      return null;
    }
    this.draft.set(null);
    this.store.edit('place angle gauge', putGaugeChanges(this.store.annotations(), gauge));
    this.select(gauge.id);
    return gauge;
  }

  select(id: string | null): void {
    this.selectedId.set(id);
    if (id) this.store.select(null);
    this.store.requestDraw();
  }

  /** Stops placing a gauge, else deselects one; false when there was neither. */
  cancel(): boolean {
    if (this.draftPoints().length) {
      this.draft.set(null);
      this.store.requestDraw();
      return true;
    }
    if (this.selected()) {
      this.select(null);
      return true;
    }
    return false;
  }

  remove(id: string): void {
    this.store.edit('remove angle gauge', removeGaugeChanges(this.store.annotations(), id));
    if (this.selectedId() === id) this.selectedId.set(null);
  }

  /** Removes the selected gauge; false when none is selected. */
  removeSelected(): boolean {
    const id = this.selected();
    if (!id) return false;
    this.remove(id);
    return true;
  }

  /** The gauge as it is now (the start of a drag). */
  gauge(id: string): AngleGauge | null {
    return gaugeById(this.store.annotations(), id);
  }

  /** Moves a point while it is dragged (not yet an undo step). */
  drag(ref: GaugeHandleRef, to: FramePoint): void {
    this.store.preview(moveGaugePointChanges(this.store.annotations(), ref, to));
  }

  /** Ends a drag: one undo step from where the gauge was. */
  endDrag(start: AngleGauge): void {
    const now = gaugeById(this.store.annotations(), start.id);
    if (!now) return;
    const changes = putGaugeChanges({ ...this.store.annotations(), gauges: [start] }, now);
    this.store.record('move angle gauge', changes);
  }
}
