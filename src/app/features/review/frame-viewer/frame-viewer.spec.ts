import { provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { signal } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { AuthStore } from '../../../core/auth-store';
import { stubJsdomCanvas } from '../../../shared/testing/jsdom-canvas';
import { AnnotationSync } from '../annotation-sync';
import { GaugeTool } from '../gauge-tool';
import { ReviewStore } from '../review-store';
import { openTestReview } from '../test-review';
import { FrameViewer } from './frame-viewer';

/*
 * Pointer handling of the review canvas with synthetic pointer and wheel events (jsdom: no layout,
 * no 2D context — the canvas box is given by hand and nothing is painted).
 *
 * Geometry worked by hand for every check: a 1280 × 720 frame in a 656 × 376 canvas with the
 * viewer's 8 px margin fits at scale min(640/1280, 360/720) = 0.5, offset (8, 8). So a screen point
 * (x, y) is the frame fraction ((x − 8) / 640, (y − 8) / 360): the frame centre (0.5, 0.5) is at
 * (328, 188), the point (0.25, 0.25) at (168, 98).
 */
const VIEW = { width: 656, height: 376 };

describe('FrameViewer pointer handling', () => {
  let fixture: ComponentFixture<FrameViewer>;
  let viewer: FrameViewer;
  let store: ReviewStore;
  let canvas: HTMLCanvasElement;

  let restoreJsdom: () => void;
  beforeAll(() => {
    // jsdom has no layout observer, no canvas drawing and no image decoding.
    restoreJsdom = stubJsdomCanvas();
  });
  afterAll(() => restoreJsdom());

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [FrameViewer],
      providers: [
        ReviewStore,
        AnnotationSync,
        GaugeTool,
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: AuthStore, useValue: { user: signal(null) } },
      ],
    });
    store = TestBed.inject(ReviewStore);
    openTestReview(store);
    fixture = TestBed.createComponent(FrameViewer);
    viewer = fixture.componentInstance;
    const host = fixture.nativeElement as HTMLElement;
    canvas = host.querySelector('canvas')!;
    const box = () => new DOMRect(0, 0, VIEW.width, VIEW.height);
    host.getBoundingClientRect = box;
    canvas.getBoundingClientRect = box;
    await settle();
  });
  afterEach(() => fixture.destroy());

  async function settle(): Promise<void> {
    TestBed.tick();
    await new Promise((r) => setTimeout(r));
    TestBed.tick();
  }

  function pointer(type: 'pointerdown' | 'pointermove' | 'pointerup' | 'pointercancel', x: number, y: number, init: PointerEventInit = {}) {
    const e = new PointerEvent(type, {
      clientX: x,
      clientY: y,
      pointerId: 1,
      pointerType: 'mouse',
      button: 0,
      bubbles: true,
      cancelable: true,
      ...init,
    });
    canvas.dispatchEvent(e);
    return e;
  }
  /** Press at `from`, move through `via` to `to`, release. */
  function drag(from: [number, number], to: [number, number], init: PointerEventInit = {}) {
    pointer('pointerdown', ...from, init);
    const mid: [number, number] = [(from[0] + to[0]) / 2, (from[1] + to[1]) / 2];
    pointer('pointermove', ...mid, init);
    pointer('pointermove', ...to, init);
    pointer('pointerup', ...to, init);
  }
  const click = (x: number, y: number, init: PointerEventInit = {}) => drag([x, y], [x, y], init);
  function wheel(x: number, y: number, init: WheelEventInit) {
    const e = new WheelEvent('wheel', { clientX: x, clientY: y, bubbles: true, cancelable: true, ...init });
    canvas.dispatchEvent(e);
    return e;
  }
  /** The frame fraction under a screen point with the viewer's current view. */
  function fractionAt(x: number, y: number) {
    const t = viewer.view();
    return { x: (x - t.tx) / t.scale / 1280, y: (y - t.ty) / t.scale / 720 };
  }
  /** Stored points keep 5 decimals (a tenth of a pixel of a 4K frame). */
  function expectPoint(actual: { x: number; y: number } | null | undefined, x: number, y: number) {
    expect(actual).toBeTruthy();
    expect(actual!.x).toBeCloseTo(x, 4);
    expect(actual!.y).toBeCloseTo(y, 4);
  }

  it('fits the frame into the canvas: scale 0.5 at offset (8, 8)', () => {
    expect(viewer.view()).toEqual({ scale: 0.5, tx: 8, ty: 8 });
    expect(viewer.zoomPercent()).toBe(50);
  });

  it('at 150 % puts the canvas box on whole device pixels inside its host and maps a press from there', async () => {
    // A 374 × 257.39 CSS px viewer at (8, 283): its top is 424.5 device px, half-way through a
    // pixel, where the picture showed a third of a CSS px (≈ 1 frame px) away from the press.
    const ratio = Object.getOwnPropertyDescriptor(window, 'devicePixelRatio');
    Object.defineProperty(window, 'devicePixelRatio', { value: 1.5, configurable: true });
    try {
      const host = fixture.nativeElement as HTMLElement;
      host.getBoundingClientRect = () => new DOMRect(8, 283, 374, 257.390625);
      canvas.getBoundingClientRect = () => new DOMRect(8, 284.003, 374, 256);
      window.dispatchEvent(new Event('resize'));
      await settle();
      expect([canvas.style.left, canvas.style.top, canvas.style.width, canvas.style.height]).toEqual(['0px', '1px', '374px', '256px']);
      viewer.fit();
      const t = viewer.view();
      expect(t.scale).toBeCloseTo(358 / 1280, 12);
      // The middle of the frame, pressed at the middle of the placed box (284 + 128).
      click(8 + 187, 284 + 128);
      expectPoint(store.sidePoints().shoulder, 0.5, 0.5);
    } finally {
      if (ratio) Object.defineProperty(window, 'devicePixelRatio', ratio);
      else delete (window as { devicePixelRatio?: number }).devicePixelRatio;
    }
  });

  describe('place', () => {
    it('a click places the chosen landmark where it lands and moves on to the next', () => {
      expect(store.landmark()).toBe('shoulder');
      click(328, 188);
      expectPoint(store.sidePoints().shoulder, 0.5, 0.5);
      expect(store.landmark()).toBe('hip');
      click(168, 98);
      expectPoint(store.sidePoints().hip, 0.25, 0.25);
    });

    it('a click beside the frame places nothing', () => {
      click(4, 4); // inside the 8 px margin: fraction (−0.006, −0.011)
      expect(store.sidePoints().shoulder).toBeUndefined();
    });

    it('a small wobble (under 6 px) still places; a longer move on empty frame pans instead', () => {
      drag([328, 188], [332, 190]);
      expectPoint(store.sidePoints().shoulder, 0.5 + 4 / 640, 0.5 + 2 / 360);
      drag([168, 98], [188, 98]);
      expect(store.sidePoints().hip).toBeUndefined();
      expect(viewer.view()).toEqual({ scale: 0.5, tx: 28, ty: 8 });
    });
  });

  describe('drag a marker', () => {
    beforeEach(() => click(328, 188)); // shoulder at (0.5, 0.5)

    it('moves the marker by the pointer’s travel: 64 × 36 screen px = 0.1 × 0.1 of the frame', () => {
      drag([330, 189], [394, 225]);
      expectPoint(store.sidePoints().shoulder, 0.6, 0.6);
      expect(store.selected()).toEqual({ side: 'left', landmark: 'shoulder' });
      // Hip was next to place and stays unplaced: a drag does not place.
      expect(store.sidePoints().hip).toBeUndefined();
    });

    it('follows the pointer while it moves, and the whole drag is one undo step', () => {
      pointer('pointerdown', 328, 188);
      pointer('pointermove', 360, 188);
      expectPoint(store.sidePoints().shoulder, 0.55, 0.5);
      pointer('pointermove', 392, 224);
      expectPoint(store.sidePoints().shoulder, 0.6, 0.6);
      pointer('pointerup', 392, 224);
      store.undo();
      expectPoint(store.sidePoints().shoulder, 0.5, 0.5);
    });

    it('a drag past the canvas edge (released outside the window) stops at the frame’s edge, and one undo puts it back', () => {
      // Far left and below: (−200 − 8) / 640 and (900 − 8) / 360 are outside 0–1 both ways.
      drag([328, 188], [-200, 900]);
      expectPoint(store.sidePoints().shoulder, 0, 1);
      drag([8, 368], [2000, -50]);
      expectPoint(store.sidePoints().shoulder, 1, 0);
      store.undo();
      expectPoint(store.sidePoints().shoulder, 0, 1);
      store.undo();
      expectPoint(store.sidePoints().shoulder, 0.5, 0.5);
    });

    it('a finger must travel 8 px before it drags; less is a tap', () => {
      pointer('pointerdown', 328, 188, { pointerType: 'touch' });
      pointer('pointermove', 333, 188, { pointerType: 'touch' });
      expectPoint(store.sidePoints().shoulder, 0.5, 0.5);
      pointer('pointermove', 348, 188, { pointerType: 'touch' });
      expectPoint(store.sidePoints().shoulder, 0.5 + 20 / 640, 0.5);
      pointer('pointerup', 348, 188, { pointerType: 'touch' });
    });
  });

  describe('pan', () => {
    it('Shift + drag moves the view and keeps marks where they are on the frame', () => {
      click(328, 188);
      drag([100, 100], [150, 120], { shiftKey: true });
      expect(viewer.view()).toEqual({ scale: 0.5, tx: 58, ty: 28 });
      expectPoint(store.sidePoints().shoulder, 0.5, 0.5);
      expect(store.sidePoints().hip).toBeUndefined();
      // The frame centre is now at (378, 208): a click there places hip at the centre.
      click(378, 208);
      expectPoint(store.sidePoints().hip, 0.5, 0.5);
    });

    it('the middle button and the pan tool drag the view too', () => {
      drag([300, 200], [280, 190], { button: 1, buttons: 4 });
      expect(viewer.view()).toEqual({ scale: 0.5, tx: -12, ty: -2 });
      store.setTool('pan');
      drag([300, 200], [330, 230]);
      expect(viewer.view()).toEqual({ scale: 0.5, tx: 18, ty: 28 });
      expect(store.sidePoints().shoulder).toBeUndefined();
    });
  });

  describe('wheel and zoom', () => {
    it('the plain wheel leaves the view alone (the page scrolls) and says how to zoom', async () => {
      const e = wheel(328, 188, { deltaY: 100 });
      expect(e.defaultPrevented).toBe(false);
      expect(viewer.view()).toEqual({ scale: 0.5, tx: 8, ty: 8 });
      await settle();
      expect(fixture.nativeElement.querySelector('.wheel-hint')?.textContent).toContain('Hold Ctrl');
    });

    it('Ctrl + wheel up zooms in around the pointer: the frame point under it stays under it', () => {
      const before = fractionAt(168, 98);
      const e = wheel(168, 98, { deltaY: -100, ctrlKey: true });
      expect(e.defaultPrevented).toBe(true);
      expect(viewer.view().scale).toBeGreaterThan(0.5);
      expectPoint(fractionAt(168, 98), before.x, before.y);
      // A click at the same spot still places at the point that was under it.
      click(168, 98);
      expectPoint(store.sidePoints().shoulder, 0.25, 0.25);
    });

    it('⌘ + wheel down zooms out; zooming in and out by the same amount comes back', () => {
      wheel(328, 188, { deltaY: -120, metaKey: true });
      const zoomed = viewer.view().scale;
      expect(zoomed).toBeGreaterThan(0.5);
      wheel(328, 188, { deltaY: 120, metaKey: true });
      expect(viewer.view().scale).toBeCloseTo(0.5, 9);
      expectPoint(fractionAt(328, 188), 0.5, 0.5);
    });

    it('the + and − buttons’ zoom steps 1.25 and 0.8 around the centre', () => {
      viewer.zoomBy(1);
      expect(viewer.view().scale).toBeCloseTo(0.625, 9);
      expect(viewer.zoomPercent()).toBe(63);
      viewer.zoomBy(-1);
      expect(viewer.view().scale).toBeCloseTo(0.5, 9);
    });
  });

  describe('touch', () => {
    const touch = (id: number): PointerEventInit => ({ pointerId: id, pointerType: 'touch' });

    it('two fingers moving apart zoom around their midpoint (240 → 360 px apart = × 1.5) and place nothing', () => {
      pointer('pointerdown', 208, 188, touch(1));
      pointer('pointerdown', 448, 188, touch(2));
      pointer('pointermove', 148, 188, touch(1));
      pointer('pointermove', 508, 188, touch(2));
      expect(viewer.view().scale).toBeCloseTo(0.75, 9);
      expect(viewer.zoomPercent()).toBe(75);
      expectPoint(fractionAt(328, 188), 0.5, 0.5);
      pointer('pointerup', 148, 188, touch(1));
      pointer('pointerup', 508, 188, touch(2));
      expect(store.sidePoints().shoulder).toBeUndefined();
    });

    it('two fingers moving together pan; the finger left after a pinch pans on', () => {
      pointer('pointerdown', 208, 188, touch(1));
      pointer('pointerdown', 448, 188, touch(2));
      pointer('pointermove', 228, 198, touch(1));
      pointer('pointermove', 468, 198, touch(2));
      expect(viewer.view().scale).toBeCloseTo(0.5, 9);
      expect(viewer.view().tx).toBeCloseTo(28, 9);
      expect(viewer.view().ty).toBeCloseTo(18, 9);
      pointer('pointerup', 228, 198, touch(1));
      pointer('pointermove', 478, 208, touch(2));
      expect(viewer.view().tx).toBeCloseTo(38, 9);
      expect(viewer.view().ty).toBeCloseTo(28, 9);
      pointer('pointerup', 478, 208, touch(2));
      expect(store.sidePoints().shoulder).toBeUndefined();
    });

    it('a tap places the landmark, as a click does', () => {
      click(168, 98, touch(5));
      expectPoint(store.sidePoints().shoulder, 0.25, 0.25);
    });
  });
});
