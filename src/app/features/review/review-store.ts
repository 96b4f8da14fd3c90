import { DestroyRef, Injectable, computed, inject, signal } from '@angular/core';
import { MatSnackBar } from '@angular/material/snack-bar';
import type { ClipAnnotations, FramePoint, GaitEventKind, GaitEventMark, LandmarkName, ScaleBar } from '../../../contracts/annotations';
import { GAIT_EVENT_LABELS, LANDMARKS, LANDMARK_LABELS } from '../../../contracts/annotations';
import type { Assessment, Clip } from '../../../contracts/api';
import type { Side } from '../../../contracts/assessment';
import type { ClipMeasures, ReferenceBand } from '../../../contracts/measures';
import {
  AnnotationState,
  Change,
  EMPTY_STATE,
  PointKey,
  applyChanges,
  changesThatFit,
  invertChanges,
  stateOf,
  valueAt,
} from './annotation-changes';
import {
  copyPreviousChanges,
  neighbourEventFrame,
  nextLandmark,
  pointsOn,
  removeEventChanges,
  removePointChanges,
  setPointChanges,
  setScaleChanges,
  toggleEventChanges,
} from './annotation-ops';
import { AnnotationSync } from './annotation-sync';
import { History, canRedo, canUndo, createHistory, nextLabels, record, redo, undo } from './command-history';
import { FrameCache } from './frame-cache';
import type { LandmarkRef } from './hit-test';
import type { ReviewTool } from './key-map';
import { DEFAULT_REFERENCE_BANDS, computeClipMeasures, validateEvents } from './kinematics-adapter';
import { PlaybackRate, clampFrame, playbackFrame, realTimestamps, stepRate } from './playback';
import type { ClipManifest } from '../../core/data/review-api';

/** Everything about the clip the workspace needs, fixed while it is open. */
export interface ReviewClip {
  clip: Clip;
  assessment: Assessment;
  manifest: ClipManifest;
}

/** Hooks the frame viewer registers so moves can draw at once. */
export interface ViewerHooks {
  /** Draws on the next animation frame (coalesced). */
  requestDraw(): void;
  /** Draws now (inside an animation frame already). */
  drawNow(): void;
}

const SIDE_NAMES: Record<Side, string> = { left: 'Left', right: 'Right' };

/** Said when a mark is tried while frames are still being extracted. */
export const MARKING_WAITS = 'Marking opens once every frame is extracted; step through the frames that are here meanwhile.';

/** Said when an undo or redo leaves marks alone that were changed by a save from elsewhere. */
export function keptMarksMessage(skipped: number): string {
  return skipped === 1
    ? 'One mark was changed since in another save, so it was left as it is.'
    : `${skipped} marks were changed since in another save, so they were left as they are.`;
}

/**
 * The review workspace's state: the clip, the annotations as shown (with undo/redo and autosave),
 * the current frame and playback, the chosen side, landmark and tool, and the live measures.
 * Provided by the review page; its parts inject it.
 */
@Injectable()
export class ReviewStore {
  private readonly sync = inject(AnnotationSync);
  private readonly snackBar = inject(MatSnackBar);

  private readonly clip$ = signal<ReviewClip | null>(null);
  private readonly cache$ = signal<FrameCache | null>(null);
  private readonly history$ = signal<History<Change>>(createHistory<Change>(300));
  private viewer: ViewerHooks | null = null;
  private playRaf: number | null = null;
  private playAnchor = { frame: 0, wall: 0 };

  readonly clip = this.clip$.asReadonly();
  readonly cache = this.cache$.asReadonly();
  /** The annotations as shown (the server's copy plus unsaved edits). */
  readonly annotations = signal<AnnotationState>(EMPTY_STATE);
  readonly frame = signal(0);
  readonly side = signal<Side>('left');
  readonly landmark = signal<LandmarkName>('shoulder');
  readonly selected = signal<LandmarkRef | null>(null);
  readonly tool = signal<ReviewTool>('landmark');
  readonly showAngles = signal(true);
  readonly playing = signal(false);
  /** Playback is waiting for frames to arrive. */
  readonly buffering = signal(false);
  readonly rate = signal<PlaybackRate>(0.25);
  /** A scale line drawn but not yet given a length (or being drawn). */
  readonly scaleDraft = signal<{ frame: number; a: FramePoint; b: FramePoint } | null>(null);
  /** The clinic's reference bands (defaults until loaded). */
  readonly bands = signal<ReferenceBand[]>(DEFAULT_REFERENCE_BANDS);

  readonly saveState = this.sync.state;
  readonly saveProblem = this.sync.problem;
  readonly hasUnsaved = this.sync.hasUnsaved;

  readonly frameCount = computed(() => this.clip$()?.manifest.frameCount ?? 0);
  /** Whether frames are still being extracted: the review is open on the first ones (see `framesArrived`). */
  readonly filling = computed(() => this.clip$()?.manifest.complete === false);
  /** Frames extracted so far while filling (they arrive in order). */
  readonly readyFrames = signal(0);
  /** Frames that can be shown: all of them, or those extracted so far while filling. */
  readonly available = computed(() => (this.filling() ? Math.min(this.readyFrames(), this.frameCount()) : this.frameCount()));
  readonly frameSize = computed(() => {
    const m = this.clip$()?.manifest;
    return { width: m?.width ?? 0, height: m?.height ?? 0 };
  });
  readonly nearSide = computed<Side>(() => this.clip$()?.clip.nearSide ?? 'left');
  readonly direction = computed(() => this.clip$()?.clip.direction ?? 'left_to_right');
  /** The rate all timing uses (capture rate for slow-motion files). */
  readonly fps = computed(() => {
    const c = this.clip$();
    return c?.clip.effectiveFps ?? c?.manifest.fps ?? 30;
  });
  /** Real time of every frame from the first, ms. */
  readonly times = computed(() => {
    const c = this.clip$();
    if (!c) return [];
    return realTimestamps(c.manifest.timestampsMs, c.manifest.frameCount, this.slowMotion(), this.fps());
  });
  /** A capture rate was set for a slow-motion file: timing uses it, not the file's timestamps. */
  readonly slowMotion = computed(() => this.clip$()?.clip.captureFps != null);
  readonly timeMs = computed(() => this.times()[this.frame()] ?? null);
  readonly surface = computed(() => this.clip$()?.assessment.surface ?? 'treadmill');
  readonly beltSpeedMps = computed(() => {
    const a = this.clip$()?.assessment;
    return a && a.surface === 'treadmill' ? a.speedMps : null;
  });

  /** The landmark was chosen on purpose (so a click re-places it even when it is placed). */
  private readonly explicitChoice = signal(false);
  /**
   * Whether a click on the frame places the chosen landmark: it is not on this frame yet, or the
   * coach chose it to place it again. Once all six are placed, clicks only select.
   */
  readonly armed = computed(() => this.explicitChoice() || !this.sidePoints()[this.landmark()]);

  /** Landmark rows on the current frame (either side). */
  readonly frameRows = computed(() => {
    const f = this.frame();
    return this.annotations().landmarks.filter((l) => l.frame === f);
  });
  /** Points of the chosen side on the current frame. */
  readonly sidePoints = computed(() => pointsOn(this.annotations(), this.frame(), this.side()));
  /** Events in order. */
  readonly events = computed(() => this.annotations().events);
  /** Problems with the marked events (order, gaps…), from kinematics. */
  readonly eventProblems = computed(() => validateEvents(this.annotations().events, this.frameCount()));
  /** Frames with any landmark, per side. */
  readonly markedFrameCount = computed(() => {
    const counts: Record<Side, number> = { left: 0, right: 0 };
    for (const row of this.annotations().landmarks) counts[row.side] += 1;
    return counts;
  });

  /** Measures computed in the browser from the annotations as shown. */
  readonly measures = computed<{ value: ClipMeasures | null; error: string | null }>(() => {
    const c = this.clip$();
    if (!c) return { value: null, error: null };
    try {
      return {
        value: computeClipMeasures({
          clipId: c.clip.id,
          annotations: this.annotations(),
          frameSize: this.frameSize(),
          fps: this.fps(),
          // As the server's snapshot does: file timestamps, unless a capture rate overrides them.
          timestampsMs: this.slowMotion() ? undefined : c.manifest.timestampsMs,
          direction: this.direction(),
          surface: this.surface(),
          beltSpeedMps: this.beltSpeedMps(),
          bands: this.bands(),
          frameCount: this.frameCount(),
        }),
        error: null,
      };
    } catch (err) {
      return { value: null, error: err instanceof Error ? err.message : String(err) };
    }
  });

  readonly canUndo = computed(() => canUndo(this.history$()));
  readonly canRedo = computed(() => canRedo(this.history$()));
  readonly historyLabels = computed(() => nextLabels(this.history$()));

  constructor() {
    inject(DestroyRef).onDestroy(() => {
      this.pause();
      this.cache$()?.destroy();
    });
  }

  /** Opens a clip with the annotations just loaded (while filling, on the frames extracted so far). */
  open(clip: ReviewClip, loaded: ClipAnnotations, cache: FrameCache): void {
    this.cache$()?.destroy();
    this.clip$.set(clip);
    this.cache$.set(cache);
    this.readyFrames.set(clip.clip.progress?.done ?? 0);
    if (this.filling()) cache.setAvailable(this.available());
    this.annotations.set(stateOf(loaded));
    this.history$.set(createHistory<Change>(300));
    this.side.set(clip.clip.nearSide);
    this.landmark.set(LANDMARKS[0]);
    this.selected.set(null);
    this.frame.set(0);
    cache.setCurrent(0);
    this.sync.start(clip.clip.id, loaded, {
      local: () => this.annotations(),
      replaceLocal: (state, message) => {
        this.annotations.set(state);
        this.snackBar.open(message, 'OK', { duration: 8000 });
        this.requestDraw();
      },
    });
  }

  /** More frames were extracted: they can be shown now. */
  framesArrived(ready: number): void {
    if (!this.filling() || ready <= this.readyFrames()) return;
    this.readyFrames.set(ready);
    this.cache$()?.setAvailable(this.available());
    this.requestDraw();
  }

  /** Extraction finished: the complete manifest (exact frame count and timestamps) replaces the plan. */
  extractionDone(clip: Clip, manifest: ClipManifest): void {
    const current = this.clip$();
    if (!current || current.clip.id !== clip.id) return;
    this.clip$.set({ ...current, clip, manifest });
    this.readyFrames.set(manifest.frameCount);
    this.cache$()?.setAvailable(manifest.frameCount, manifest.frameCount);
    if (this.frame() >= manifest.frameCount) this.goTo(manifest.frameCount - 1);
    this.requestDraw();
  }

  attachViewer(hooks: ViewerHooks | null): void {
    this.viewer = hooks;
  }

  requestDraw(): void {
    this.viewer?.requestDraw();
  }

  saveNow(): void {
    this.sync.saveNow();
  }

  // ---- Frames and playback ---------------------------------------------------------------

  goTo(frame: number): void {
    const f = clampFrame(frame, this.available());
    if (f !== this.frame()) {
      this.frame.set(f);
      this.explicitChoice.set(false);
      this.chooseUnplacedLandmark();
      this.cache$()?.setCurrent(f);
      if (this.scaleDraft() && this.tool() !== 'scale') this.scaleDraft.set(null);
    }
    this.requestDraw();
  }

  step(by: number): void {
    if (this.playing()) this.pause();
    this.goTo(this.frame() + by);
  }

  first(): void {
    this.step(-this.frame());
  }

  last(): void {
    this.step(this.available());
  }

  /** Moves to the previous/next marked event; false when there is none that way. */
  jumpToEvent(dir: -1 | 1): boolean {
    const target = neighbourEventFrame(this.annotations().events, this.frame(), dir);
    if (target === null) return false;
    this.step(target - this.frame());
    return true;
  }

  togglePlay(): void {
    if (this.playing()) this.pause();
    else this.play();
  }

  play(): void {
    if (this.playing() || this.available() < 2) return;
    if (this.frame() >= this.available() - 1) this.goTo(0);
    this.playing.set(true);
    this.playAnchor = { frame: this.frame(), wall: performance.now() };
    this.playRaf = requestAnimationFrame((t) => this.tick(t));
  }

  pause(): void {
    this.playing.set(false);
    this.buffering.set(false);
    if (this.playRaf !== null) cancelAnimationFrame(this.playRaf);
    this.playRaf = null;
  }

  setRate(rate: PlaybackRate): void {
    this.rate.set(rate);
    // Keep playing from here at the new speed.
    this.playAnchor = { frame: this.frame(), wall: performance.now() };
  }

  stepRate(dir: -1 | 1): void {
    this.setRate(stepRate(this.rate(), dir));
  }

  private tick(now: number): void {
    if (!this.playing()) return;
    const cache = this.cache$();
    const times = this.times();
    const target = playbackFrame(times, this.playAnchor.frame, now - this.playAnchor.wall, this.rate());
    let next = this.frame();
    // Never run ahead of the frames that have arrived.
    while (next < target && cache?.has(next + 1)) next++;
    if (next !== this.frame()) {
      this.frame.set(next);
      cache?.setCurrent(next);
      this.viewer?.drawNow();
    }
    if (next < target) {
      this.buffering.set(true);
      this.playAnchor = { frame: next, wall: now };
    } else {
      this.buffering.set(false);
    }
    if (next >= this.available() - 1) {
      this.pause();
      return;
    }
    this.playRaf = requestAnimationFrame((t) => this.tick(t));
  }

  // ---- Choosing ---------------------------------------------------------------------------

  /**
   * On another frame or side the chosen landmark may be placed there already while others are not
   * (a frame marked part-way): the first one still missing is chosen, so a click places it.
   */
  private chooseUnplacedLandmark(): void {
    const points = this.sidePoints();
    if (!points[this.landmark()]) return;
    const missing = LANDMARKS.find((l) => !points[l]);
    if (missing) this.landmark.set(missing);
  }

  chooseLandmark(landmark: LandmarkName): void {
    this.landmark.set(landmark);
    this.explicitChoice.set(true);
    const placed = this.sidePoints()[landmark];
    this.selected.set(placed ? { side: this.side(), landmark } : null);
    if (this.tool() !== 'landmark') this.tool.set('landmark');
    this.requestDraw();
  }

  chooseSide(side: Side): void {
    this.side.set(side);
    this.explicitChoice.set(false);
    this.chooseUnplacedLandmark();
    this.selected.set(null);
    this.requestDraw();
  }

  toggleSide(): void {
    this.chooseSide(this.side() === 'left' ? 'right' : 'left');
  }

  select(ref: LandmarkRef | null): void {
    this.selected.set(ref);
    if (ref) {
      this.side.set(ref.side);
      this.landmark.set(ref.landmark);
    }
    this.requestDraw();
  }

  setTool(tool: ReviewTool): void {
    this.tool.set(tool);
    if (tool !== 'scale' && this.scaleDraft() && !this.scaleDraftComplete()) this.scaleDraft.set(null);
    this.requestDraw();
  }

  toggleAngles(): void {
    this.showAngles.update((v) => !v);
    this.requestDraw();
  }

  // ---- Edits ------------------------------------------------------------------------------

  /** Places the chosen landmark at `point` on this frame and moves on to the next landmark. */
  placeAt(point: FramePoint): void {
    const side = this.side();
    const landmark = this.landmark();
    const changes = setPointChanges(this.annotations(), this.frame(), side, landmark, point);
    this.apply(`place ${LANDMARK_LABELS[landmark].split(' (')[0]}`, changes);
    this.selected.set({ side, landmark });
    this.explicitChoice.set(false);
    this.landmark.set(nextLandmark(landmark, this.sidePoints()));
  }

  /** Moves a point while it is dragged (not yet an undo step). */
  dragPoint(ref: LandmarkRef, point: FramePoint): void {
    if (this.refuseWhileFilling()) return;
    const changes = setPointChanges(this.annotations(), this.frame(), ref.side, ref.landmark, point);
    if (!changes.length) return;
    this.annotations.update((s) => applyChanges(s, changes));
    this.sync.edited();
    this.requestDraw();
  }

  /** Ends a drag: one undo step from where the point started. */
  endDrag(ref: LandmarkRef, start: FramePoint): void {
    const key: PointKey = { kind: 'point', frame: this.frame(), side: ref.side, landmark: ref.landmark };
    const now = valueAt(this.annotations(), key) as FramePoint | null;
    if (!now || (now.x === start.x && now.y === start.y)) return;
    this.history$.update((h) =>
      record(h, { label: `move ${LANDMARK_LABELS[ref.landmark].split(' (')[0]}`, changes: [{ key, before: start, after: now }] }),
    );
  }

  /** The stored position of a point on the current frame. */
  pointAt(ref: LandmarkRef): FramePoint | null {
    return pointsOn(this.annotations(), this.frame(), ref.side)[ref.landmark] ?? null;
  }

  removeSelected(): boolean {
    const ref = this.selected();
    if (!ref) return false;
    this.removePoint(ref);
    return true;
  }

  removePoint(ref: LandmarkRef): void {
    const changes = removePointChanges(this.annotations(), this.frame(), ref.side, ref.landmark);
    this.apply(`remove ${LANDMARK_LABELS[ref.landmark].split(' (')[0]}`, changes);
    const sel = this.selected();
    if (sel && sel.side === ref.side && sel.landmark === ref.landmark) this.selected.set(null);
    this.landmark.set(ref.landmark);
  }

  /** Copies the nearest earlier marked frame's points here; returns the frame copied from. */
  copyPrevious(): number | null {
    const { from, changes } = copyPreviousChanges(this.annotations(), this.frame());
    if (from === null) return null;
    this.apply(`copy points from frame ${from}`, changes);
    return from;
  }

  /** Marks (or unmarks) a gait event of the chosen side on this frame. */
  toggleEvent(kind: GaitEventKind): void {
    const present = this.annotations().events.some((e) => e.frame === this.frame() && e.side === this.side() && e.kind === kind);
    this.apply(
      `${present ? 'unmark' : 'mark'} ${GAIT_EVENT_LABELS[kind]} (${SIDE_NAMES[this.side()]})`,
      toggleEventChanges(this.annotations(), this.frame(), this.side(), kind),
    );
  }

  removeEvent(mark: GaitEventMark): void {
    this.apply(`remove ${GAIT_EVENT_LABELS[mark.kind]} at frame ${mark.frame}`, removeEventChanges(this.annotations(), mark));
  }

  scaleDraftComplete(): boolean {
    const d = this.scaleDraft();
    return !!d && (d.a.x !== d.b.x || d.a.y !== d.b.y);
  }

  /** Sets the scale bar (or removes it with null). */
  setScale(scale: ScaleBar | null): void {
    this.apply(scale ? 'set scale bar' : 'remove scale bar', setScaleChanges(this.annotations(), scale));
    this.scaleDraft.set(null);
  }

  undo(): string | null {
    const result = undo(this.history$());
    if (!result) return null;
    this.history$.set(result.history);
    this.applyHistoryMove(invertChanges(result.command.changes));
    return result.command.label;
  }

  redo(): string | null {
    const result = redo(this.history$());
    if (!result) return null;
    this.history$.set(result.history);
    this.applyHistoryMove(result.command.changes);
    return result.command.label;
  }

  /** Applies an undo or redo to the marks it still fits; marks saved since by someone else stay. */
  private applyHistoryMove(changes: readonly Change[]): void {
    const { fit, skipped } = changesThatFit(this.annotations(), changes);
    this.annotations.update((s) => applyChanges(s, fit));
    if (skipped) this.snackBar.open(keptMarksMessage(skipped), 'OK', { duration: 6000 });
    this.afterHistoryMove();
  }

  /** Applies `changes` as one undo step called `label` (for tools kept in their own files). */
  edit(label: string, changes: Change[]): void {
    this.apply(label, changes);
  }

  /** Shows `changes` without an undo step (while something is dragged); {@link record} ends it. */
  preview(changes: Change[]): void {
    if (!changes.length || this.refuseWhileFilling()) return;
    this.annotations.update((s) => applyChanges(s, changes));
    this.sync.edited();
    this.requestDraw();
  }

  /** Records one undo step for changes already shown (the end of a drag). */
  record(label: string, changes: Change[]): void {
    if (changes.length) this.history$.update((h) => record(h, { label, changes }));
  }

  private afterHistoryMove(): void {
    const sel = this.selected();
    if (sel && !this.pointAt(sel)) this.selected.set(null);
    this.sync.edited();
    this.requestDraw();
  }

  /**
   * Marks are saved only on a clip whose every frame exists (the server checks frames against the
   * clip's length): while frames arrive, the review is for looking, and a mark says so.
   */
  private refuseWhileFilling(): boolean {
    if (!this.filling()) return false;
    this.snackBar.open(MARKING_WAITS, undefined, { duration: 3000 });
    return true;
  }

  private apply(label: string, changes: Change[]): void {
    if (!changes.length || this.refuseWhileFilling()) return;
    this.annotations.update((s) => applyChanges(s, changes));
    this.history$.update((h) => record(h, { label, changes }));
    this.sync.edited();
    this.requestDraw();
  }
}
