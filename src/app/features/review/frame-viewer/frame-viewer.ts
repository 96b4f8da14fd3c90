import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  ElementRef,
  afterNextRender,
  computed,
  effect,
  inject,
  signal,
  viewChild,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import type { AngleGauge, FramePoint } from '../../../../contracts/annotations';
import { LANDMARK_LABELS } from '../../../../contracts/annotations';
import { eventNamesAt } from '../../../../kinematics/event-names';
import { GaugeHandleRef, gaugeHandleCandidates } from '../gauge-ops';
import { GaugeTool } from '../gauge-tool';
import { paintFrame } from './frame-painter';
import { CanvasPlacement, canvasOrigin, clientToView, deviceRatio, isOnDevicePixels, placeCanvas } from '../canvas-pixels';
import { HitCandidate, LandmarkRef, hitTest, hitTolerancePx, landmarkCandidates } from '../hit-test';
import { ReviewStore } from '../review-store';
import { MIN_SCALE_LINE_PX, scaleLengthPx } from '../scale-bar';
import {
  Size,
  Vec,
  ViewTransform,
  clampPan,
  fitTransform,
  fractionToScreen,
  isOnFrame,
  panBy,
  pinchTransform,
  scaleLimits,
  screenToFraction,
  wheelIntent,
  wheelZoomFactor,
  zoomAt,
} from '../view-transform';

type Gesture =
  | { kind: 'none' }
  | { kind: 'tap'; id: number; start: Vec; last: Vec }
  | { kind: 'pan'; id: number; last: Vec }
  | { kind: 'point'; id: number; ref: LandmarkRef; start: FramePoint; offset: Vec; down: Vec; slop: number; moved: boolean }
  | { kind: 'scale-new'; id: number; a: FramePoint }
  | { kind: 'scale-end'; id: number; end: 'a' | 'b'; fromSaved: boolean }
  | { kind: 'gauge-point'; id: number; ref: GaugeHandleRef; start: AngleGauge; offset: Vec; down: Vec; slop: number; moved: boolean }
  | { kind: 'pinch'; ids: [number, number]; view: ViewTransform; a0: Vec; b0: Vec };

/** How far (CSS px) a press may move and still count as a click that places a landmark. */
const TAP_SLOP_PX = 6;
/** How far a press on a marker must move before it drags the marker (fingers wobble more). */
const DRAG_SLOP_PX: Record<string, number> = { mouse: 2, pen: 4, touch: 8 };
/** How long the "how to zoom" hint stays after a plain wheel turn over the frame, ms. */
const WHEEL_HINT_MS = 1800;

/**
 * The frame on a canvas with the overlay. Draws the cached bitmap of the current frame (or the
 * nearest one, dimmed, while it loads), the landmarks through the shared overlay code and the scale
 * bar, angle gauges and the current frame's gait events in words. Pointer: click to place the
 * chosen landmark, drag a marker to adjust it, drag empty space, the middle button, Shift + drag or
 * two fingers to pan, Ctrl/⌘ + wheel or pinch to zoom around the pointer (the plain wheel scrolls
 * the page); with the scale tool, drag along the object of known length; with the Angle gauge,
 * click three points (end, vertex, end) and drag a point to adjust.
 */
@Component({
  selector: 'app-frame-viewer',
  imports: [MatButtonModule, MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './frame-viewer.html',
  styleUrl: './frame-viewer.scss',
  host: { class: 'frame-viewer' },
})
export class FrameViewer {
  protected readonly store = inject(ReviewStore);
  protected readonly gauges = inject(GaugeTool);
  private readonly host = inject<ElementRef<HTMLElement>>(ElementRef);
  private readonly canvasRef = viewChild.required<ElementRef<HTMLCanvasElement>>('canvas');

  /** Frame pixels → canvas CSS pixels. */
  readonly view = signal<ViewTransform>({ scale: 1, tx: 0, ty: 0 });
  private readonly viewSize = signal<Size>({ width: 0, height: 0 });
  /** Where the canvas box sits in the host, on whole device pixels, and its backing store. */
  private placement: CanvasPlacement | null = null;
  /** Zoom as a percentage of the frame's own pixels. */
  readonly zoomPercent = computed(() => Math.round(this.view().scale * 100));
  protected readonly cursor = signal('crosshair');
  /** Whether the "Ctrl/⌘ + wheel zooms" hint shows (after a plain wheel turn over the frame). */
  protected readonly wheelHint = signal(false);
  private wheelHintTimer: ReturnType<typeof setTimeout> | null = null;
  /** The gait events marked on this frame, in words ("Right toe-off · step 3"). */
  protected readonly frameEvents = computed(() => eventNamesAt(this.store.events(), this.store.frame()));

  private readonly pointers = new Map<number, Vec>();
  private gesture: Gesture = { kind: 'none' };
  private raf: number | null = null;
  private fitted = false;
  /** Whether the view is "fit to view" (kept fitted when the canvas changes size). */
  private autoFit = true;

  /** What the status chip over the canvas says about the current frame. */
  protected readonly frameStatus = computed<'ready' | 'loading' | 'failed'>(() => {
    const cache = this.store.cache();
    cache?.version();
    const f = this.store.frame();
    if (!cache) return 'loading';
    if (cache.has(f)) return 'ready';
    return cache.isFailed(f) ? 'failed' : 'loading';
  });

  protected readonly canvasLabel = computed(() => {
    const tool = this.store.tool();
    const base = `Frame ${this.store.frame()} of ${this.store.frameCount()}.`;
    if (tool === 'scale') return `${base} Drag along an object of known length to draw the scale bar.`;
    if (tool === 'pan') return `${base} Drag to move the view.`;
    if (tool === 'gauge') return `${base} Angle gauge: click ${this.gauges.nextClick()}; drag a gauge's point to adjust it.`;
    if (!this.store.armed()) return `${base} All landmarks of this side are placed; drag a marker to adjust it.`;
    return `${base} Click to place ${LANDMARK_LABELS[this.store.landmark()]}; drag a marker to adjust it.`;
  });

  constructor() {
    const destroyRef = inject(DestroyRef);
    this.store.attachViewer({ requestDraw: () => this.requestDraw(), drawNow: () => this.draw() });
    destroyRef.onDestroy(() => {
      this.store.attachViewer(null);
      if (this.raf !== null) cancelAnimationFrame(this.raf);
      if (this.wheelHintTimer !== null) clearTimeout(this.wheelHintTimer);
    });

    // Anything on screen changed: draw on the next animation frame.
    effect(() => {
      this.store.frame();
      this.store.frameRows();
      this.store.selected();
      this.store.showAngles();
      this.store.tool();
      this.store.scaleDraft();
      this.store.annotations();
      this.gauges.frameGauges();
      this.gauges.selected();
      this.gauges.draftPoints();
      this.gauges.hover();
      this.store.cache()?.version();
      this.view();
      this.viewSize();
      this.requestDraw();
    });

    // Fit once both the frame size and the canvas size are known.
    effect(() => {
      const frame = this.store.frameSize();
      const size = this.viewSize();
      if (!this.fitted && frame.width > 0 && size.width > 0 && size.height > 0) {
        this.fitted = true;
        this.view.set(fitTransform(frame, size));
      }
    });

    afterNextRender(() => {
      const canvas = this.canvasRef().nativeElement;
      const observer = new ResizeObserver(() => this.measure());
      observer.observe(this.host.nativeElement);
      const onWheel = (e: WheelEvent) => this.onWheel(e);
      canvas.addEventListener('wheel', onWheel, { passive: false });
      // Scrolling or a new display scaling moves the box off whole device pixels without resizing it.
      const onMove = () => this.measure();
      window.addEventListener('resize', onMove);
      document.addEventListener('scroll', onMove, { capture: true, passive: true });
      destroyRef.onDestroy(() => {
        observer.disconnect();
        canvas.removeEventListener('wheel', onWheel);
        window.removeEventListener('resize', onMove);
        document.removeEventListener('scroll', onMove, { capture: true });
      });
      this.measure();
    });
  }

  /** Fits the whole frame into the view. */
  fit(): void {
    this.autoFit = true;
    this.view.set(fitTransform(this.store.frameSize(), this.viewSize()));
  }

  /** Zooms in (+1) or out (−1) around the centre of the view. */
  zoomBy(dir: -1 | 1): void {
    const size = this.viewSize();
    this.zoomAround(dir > 0 ? 1.25 : 0.8, { x: size.width / 2, y: size.height / 2 });
  }

  requestDraw(): void {
    if (this.raf !== null) return;
    this.raf = requestAnimationFrame(() => {
      this.raf = null;
      this.draw();
    });
  }

  /** Draws the frame and overlay now. */
  draw(): void {
    const store = this.store;
    paintFrame(this.canvasRef().nativeElement, {
      view: this.view(),
      viewSize: this.viewSize(),
      backing: this.placement?.backing ?? { width: 0, height: 0 },
      ratio: this.placement?.ratio ?? 1,
      frameSize: store.frameSize(),
      frame: store.frame(),
      cache: store.cache(),
      rows: store.frameRows(),
      nearSide: store.nearSide(),
      direction: store.direction(),
      showAngles: store.showAngles(),
      selected: store.selected(),
      scale: store.annotations().scale,
      scaleTool: store.tool() === 'scale',
      scaleDraft: store.scaleDraft(),
      gauges: this.gauges.frameGauges(),
      selectedGauge: this.gauges.selected(),
      gaugeDraft: this.gauges.draftPoints(),
      hover: this.gauges.hover(),
    });
  }

  /**
   * Places the canvas box on whole device pixels inside the host (see canvas-pixels.ts) and
   * takes its size as the view's; redraws when the backing store changes.
   */
  private measure(): void {
    const placement = placeCanvas(this.host.nativeElement.getBoundingClientRect(), deviceRatio(globalThis.devicePixelRatio));
    const was = this.placement;
    this.placement = placement;
    const style = this.canvasRef().nativeElement.style;
    style.left = `${placement.offset.x}px`;
    style.top = `${placement.offset.y}px`;
    style.width = `${placement.size.width}px`;
    style.height = `${placement.size.height}px`;
    if (
      was &&
      (was.backing.width !== placement.backing.width || was.backing.height !== placement.backing.height || was.ratio !== placement.ratio)
    ) {
      this.requestDraw();
    }
    const next = placement.size;
    const prev = this.viewSize();
    if (next.width === prev.width && next.height === prev.height) return;
    this.viewSize.set(next);
    if (!this.fitted) return;
    if (this.autoFit) {
      this.view.set(fitTransform(this.store.frameSize(), next));
    } else if (prev.width > 0) {
      // Keep the part of the frame in view centred when the view changes size.
      this.view.update((t) => panBy(t, (next.width - prev.width) / 2, (next.height - prev.height) / 2));
    }
  }

  /** The pointer in canvas CSS px, from where the canvas box is on the screen's pixels. */
  private local(e: PointerEvent | WheelEvent): Vec {
    const ratio = this.placement?.ratio ?? deviceRatio(globalThis.devicePixelRatio);
    const origin = canvasOrigin(this.canvasRef().nativeElement.getBoundingClientRect(), ratio);
    return clientToView(origin, { x: e.clientX, y: e.clientY });
  }

  private setView(t: ViewTransform): void {
    this.autoFit = false;
    this.view.set(clampPan(t, this.store.frameSize(), this.viewSize()));
  }

  private zoomAround(factor: number, anchor: Vec): void {
    const limits = scaleLimits(this.store.frameSize(), this.viewSize());
    this.setView(zoomAt(this.view(), factor, anchor, limits));
  }

  private onWheel(e: WheelEvent): void {
    if (wheelIntent(e) === 'scroll') {
      // The page scrolls; say how to zoom.
      this.wheelHint.set(true);
      if (this.wheelHintTimer !== null) clearTimeout(this.wheelHintTimer);
      this.wheelHintTimer = setTimeout(() => {
        this.wheelHintTimer = null;
        this.wheelHint.set(false);
      }, WHEEL_HINT_MS);
      return;
    }
    // Ctrl/⌘ + wheel and trackpad pinch (sent as Ctrl + wheel) zoom around the pointer.
    e.preventDefault();
    this.zoomAround(wheelZoomFactor(e.deltaY, e.deltaMode), this.local(e));
  }

  private toFraction(p: Vec): FramePoint {
    return screenToFraction(this.view(), this.store.frameSize(), p);
  }

  private landmarkHit(p: Vec, pointerType: string): LandmarkRef | null {
    const side = this.store.side();
    const candidates = landmarkCandidates(this.store.frameRows(), this.store.frameSize(), this.view());
    return hitTest(candidates, p, hitTolerancePx(pointerType), (k) => k.side === side);
  }

  /** Scale-bar ends under the pointer: the draft's, else the saved bar's. */
  private scaleEndHit(p: Vec, pointerType: string): { end: 'a' | 'b'; fromSaved: boolean } | null {
    const frame = this.store.frameSize();
    const t = this.view();
    const draft = this.store.scaleDraft();
    const saved = this.store.annotations().scale;
    const line = draft ?? saved;
    if (!line) return null;
    const candidates: HitCandidate<'a' | 'b'>[] = (['a', 'b'] as const).map((end) => ({
      key: end,
      ...fractionToScreen(t, frame, line[end]),
    }));
    const end = hitTest(candidates, p, hitTolerancePx(pointerType));
    return end ? { end, fromSaved: !draft } : null;
  }

  protected onPointerDown(e: PointerEvent): void {
    const canvas = this.canvasRef().nativeElement;
    if (!isOnDevicePixels(canvas.getBoundingClientRect(), deviceRatio(globalThis.devicePixelRatio))) {
      // The page moved under the canvas since it was placed (a layout change above it): place it again.
      this.measure();
      this.draw();
    }
    const p = this.local(e);
    this.pointers.set(e.pointerId, p);
    canvas.setPointerCapture?.(e.pointerId);
    canvas.focus({ preventScroll: true });
    if (e.button === 1) e.preventDefault();

    if (this.pointers.size === 2) {
      this.finishGesture(false);
      const [a, b] = [...this.pointers.entries()];
      this.gesture = { kind: 'pinch', ids: [a[0], b[0]], view: this.view(), a0: a[1], b0: b[1] };
      return;
    }
    if (this.pointers.size > 2 || (e.button !== 0 && e.button !== 1)) return;

    const store = this.store;
    if (e.button === 1 || e.shiftKey || store.tool() === 'pan') {
      this.gesture = { kind: 'pan', id: e.pointerId, last: p };
      this.cursor.set('grabbing');
      return;
    }
    if (store.playing()) store.pause();

    if (store.tool() === 'scale') {
      const hit = this.scaleEndHit(p, e.pointerType);
      if (hit) {
        this.gesture = { kind: 'scale-end', id: e.pointerId, ...hit };
        return;
      }
      const a = this.toFraction(p);
      if (!isOnFrame(a)) return;
      this.gesture = { kind: 'scale-new', id: e.pointerId, a };
      store.scaleDraft.set({ frame: store.frame(), a, b: a });
      return;
    }

    if (store.tool() === 'gauge') {
      const handle = this.gaugeHit(p, e.pointerType);
      const start = handle && this.gauges.gauge(handle.id);
      if (handle && start && !this.gauges.draftPoints().length) {
        const at = this.toFraction(p);
        const point = start[handle.point];
        const slop = DRAG_SLOP_PX[e.pointerType] ?? 2;
        this.gesture = {
          kind: 'gauge-point',
          id: e.pointerId,
          ref: handle,
          start,
          offset: { x: point.x - at.x, y: point.y - at.y },
          down: p,
          slop,
          moved: false,
        };
        return;
      }
      this.gesture = { kind: 'tap', id: e.pointerId, start: p, last: p };
      return;
    }

    const hit = this.landmarkHit(p, e.pointerType);
    if (hit) {
      // Selected on release (a click) or on the first real move (a drag), not yet: a click on a
      // marker may still mean "place the chosen landmark here" (see onPointerUp).
      const start = store.pointAt(hit)!;
      const at = this.toFraction(p);
      const slop = DRAG_SLOP_PX[e.pointerType] ?? 2;
      this.gesture = {
        kind: 'point',
        id: e.pointerId,
        ref: hit,
        start,
        offset: { x: start.x - at.x, y: start.y - at.y },
        down: p,
        slop,
        moved: false,
      };
      return;
    }
    this.gesture = { kind: 'tap', id: e.pointerId, start: p, last: p };
  }

  protected onPointerMove(e: PointerEvent): void {
    const p = this.local(e);
    if (this.pointers.has(e.pointerId)) this.pointers.set(e.pointerId, p);
    const g = this.gesture;
    switch (g.kind) {
      case 'none':
        if (e.pointerType === 'mouse' && !this.pointers.size) this.updateHoverCursor(p, e.pointerType);
        if (this.gauges.draftPoints().length) this.gauges.hover.set(clampFraction(this.toFraction(p)));
        return;
      case 'pinch': {
        const a1 = this.pointers.get(g.ids[0]);
        const b1 = this.pointers.get(g.ids[1]);
        if (!a1 || !b1) return;
        this.setView(pinchTransform(g.view, g.a0, g.b0, a1, b1, scaleLimits(this.store.frameSize(), this.viewSize())));
        return;
      }
      case 'tap':
        if (e.pointerId !== g.id) return;
        if (Math.hypot(p.x - g.start.x, p.y - g.start.y) > TAP_SLOP_PX) {
          // A drag on empty space moves the view instead of placing.
          this.gesture = { kind: 'pan', id: g.id, last: g.last };
          this.cursor.set('grabbing');
          this.onPointerMove(e);
        } else {
          g.last = p;
        }
        return;
      case 'pan':
        if (e.pointerId !== g.id) return;
        this.setView(panBy(this.view(), p.x - g.last.x, p.y - g.last.y));
        g.last = p;
        return;
      case 'point': {
        if (e.pointerId !== g.id) return;
        if (!g.moved) {
          if (Math.hypot(p.x - g.down.x, p.y - g.down.y) < g.slop) return;
          g.moved = true;
          this.store.select(g.ref);
          this.cursor.set('grabbing');
        }
        const at = this.toFraction(p);
        this.store.dragPoint(g.ref, { x: at.x + g.offset.x, y: at.y + g.offset.y });
        return;
      }
      case 'gauge-point': {
        if (e.pointerId !== g.id) return;
        if (!g.moved) {
          if (Math.hypot(p.x - g.down.x, p.y - g.down.y) < g.slop) return;
          g.moved = true;
          this.gauges.select(g.ref.id);
          this.cursor.set('grabbing');
        }
        const at = this.toFraction(p);
        this.gauges.drag(g.ref, clampFraction({ x: at.x + g.offset.x, y: at.y + g.offset.y }));
        return;
      }
      case 'scale-new': {
        if (e.pointerId !== g.id) return;
        this.store.scaleDraft.set({ frame: this.store.frame(), a: g.a, b: clampFraction(this.toFraction(p)) });
        return;
      }
      case 'scale-end': {
        if (e.pointerId !== g.id) return;
        const at = clampFraction(this.toFraction(p));
        const line = this.store.scaleDraft() ?? this.store.annotations().scale;
        if (!line) return;
        this.store.scaleDraft.set({ frame: line.frame, a: g.end === 'a' ? at : line.a, b: g.end === 'b' ? at : line.b });
        return;
      }
    }
  }

  protected onPointerUp(e: PointerEvent): void {
    const g = this.gesture;
    const p = this.local(e);
    this.pointers.delete(e.pointerId);
    if (g.kind === 'pinch') {
      if (this.pointers.size === 0) this.gesture = { kind: 'none' };
      else {
        // One finger left: carry on as a pan.
        const [id, last] = [...this.pointers.entries()][0];
        this.gesture = { kind: 'pan', id, last };
      }
      return;
    }
    if (g.kind === 'none' || ('id' in g && g.id !== e.pointerId)) return;
    if (e.type === 'pointercancel') {
      this.finishGesture(false);
      return;
    }
    if (g.kind === 'tap' && this.store.tool() === 'gauge') {
      const at = this.toFraction(p);
      if (isOnFrame(at)) this.gauges.click(at);
      else if (!this.gauges.draftPoints().length) this.gauges.select(null);
    } else if (g.kind === 'tap') {
      const at = this.toFraction(p);
      if (isOnFrame(at) && this.store.armed()) this.store.placeAt(at);
      else this.store.select(null);
    } else if (g.kind === 'gauge-point' && !g.moved) {
      this.gauges.select(g.ref.id);
    } else if (g.kind === 'point' && !g.moved) {
      this.clickOnMarker(g.ref, this.toFraction(p));
    }
    this.finishGesture(true);
    this.updateHoverCursor(p, e.pointerType);
  }

  /** Ends the running gesture; a dragged point becomes one undo step, a drawn line a draft. */
  private finishGesture(commit: boolean): void {
    const g = this.gesture;
    this.gesture = { kind: 'none' };
    this.cursor.set(this.baseCursor());
    if (g.kind === 'point') {
      if (g.moved) this.store.endDrag(g.ref, g.start);
    } else if (g.kind === 'gauge-point') {
      if (g.moved) this.gauges.endDrag(g.start);
    } else if (g.kind === 'scale-new' || g.kind === 'scale-end') {
      const draft = this.store.scaleDraft();
      if (!draft) return;
      const long = scaleLengthPx(draft.a, draft.b, this.store.frameSize()) >= MIN_SCALE_LINE_PX;
      if (!commit || !long) {
        if (g.kind === 'scale-new' || g.fromSaved) this.store.scaleDraft.set(null);
        return;
      }
      const saved = this.store.annotations().scale;
      if (g.kind === 'scale-end' && g.fromSaved && saved) {
        // Moving an end of the saved bar keeps its length: save it at once (one undo step).
        this.store.setScale({ ...saved, a: draft.a, b: draft.b });
      }
    }
  }

  /**
   * A click (no drag) on a marker: while the chosen landmark is to be placed (see `armed`), it is
   * placed here (markers sit close together, and fingers are wide); otherwise the marker clicked
   * is selected.
   */
  private clickOnMarker(hit: LandmarkRef, at: FramePoint): void {
    const store = this.store;
    const isChosen = hit.side === store.side() && hit.landmark === store.landmark();
    if (!isChosen && store.armed() && isOnFrame(at)) store.placeAt(at);
    else store.select(hit);
  }

  private baseCursor(): string {
    switch (this.store.tool()) {
      case 'pan':
        return 'grab';
      default:
        return 'crosshair';
    }
  }

  /** Gauge handles of this frame under the pointer. */
  private gaugeHit(p: Vec, pointerType: string): GaugeHandleRef | null {
    const candidates = gaugeHandleCandidates(this.gauges.frameGauges(), this.store.frameSize(), this.view());
    const selected = this.gauges.selected();
    return hitTest(candidates, p, hitTolerancePx(pointerType), (k) => k.id === selected);
  }

  private updateHoverCursor(p: Vec, pointerType: string): void {
    if (this.store.tool() === 'landmark' && this.landmarkHit(p, pointerType)) this.cursor.set('move');
    else if (this.store.tool() === 'gauge' && !this.gauges.draftPoints().length && this.gaugeHit(p, pointerType)) this.cursor.set('move');
    else if (this.store.tool() === 'scale' && this.scaleEndHit(p, pointerType)) this.cursor.set('move');
    else this.cursor.set(this.baseCursor());
  }

  protected retryFrame(): void {
    this.store.cache()?.retry(this.store.frame());
  }
}

function clampFraction(p: FramePoint): FramePoint {
  return { x: Math.min(1, Math.max(0, p.x)), y: Math.min(1, Math.max(0, p.y)) };
}
