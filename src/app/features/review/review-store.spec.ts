import { provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { AuthStore } from '../../core/auth-store';
import { AnnotationSync } from './annotation-sync';
import { ReviewStore } from './review-store';
import { openTestReview } from './test-review';

describe('ReviewStore', () => {
  let store: ReviewStore;

  beforeEach(() => {
    TestBed.configureTestingModule({
      providers: [
        ReviewStore,
        AnnotationSync,
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: AuthStore, useValue: { user: signal(null) } },
      ],
    });
    store = TestBed.inject(ReviewStore);
    openTestReview(store);
  });

  it('starts on the near side and walks through the landmarks as they are placed', () => {
    expect(store.side()).toBe('left');
    expect(store.landmark()).toBe('shoulder');
    const names: string[] = [];
    for (let i = 0; i < 6; i++) {
      names.push(store.landmark());
      expect(store.armed()).toBe(true);
      store.placeAt({ x: 0.5, y: 0.1 + i * 0.1 });
    }
    expect(names).toEqual(['shoulder', 'hip', 'knee', 'ankle', 'heel', 'toe']);
    // All six placed: clicks select until a landmark is chosen again.
    expect(store.armed()).toBe(false);
    store.chooseLandmark('knee');
    expect(store.armed()).toBe(true);
    store.placeAt({ x: 0.6, y: 0.4 });
    expect(store.sidePoints().knee).toEqual({ x: 0.6, y: 0.4 });
    expect(store.armed()).toBe(false);
  });

  it('arms again on a frame without marks and undoes a drag in one step', () => {
    for (let i = 0; i < 6; i++) store.placeAt({ x: 0.5, y: 0.1 + i * 0.1 });
    store.goTo(5);
    expect(store.armed()).toBe(true);
    store.goTo(0);
    const ref = { side: 'left' as const, landmark: 'hip' as const };
    const start = store.pointAt(ref)!;
    store.dragPoint(ref, { x: 0.52, y: 0.21 });
    store.dragPoint(ref, { x: 0.55, y: 0.22 });
    store.endDrag(ref, start);
    expect(store.historyLabels().undo).toBe('move Hip');
    store.undo();
    expect(store.pointAt(ref)).toEqual(start);
  });

  it('back on a frame marked part-way, the first landmark still missing there is chosen, so a click places it', () => {
    store.placeAt({ x: 0.5, y: 0.1 }); // shoulder on frame 0
    store.placeAt({ x: 0.5, y: 0.2 }); // hip on frame 0
    store.goTo(1);
    store.chooseLandmark('shoulder');
    store.placeAt({ x: 0.5, y: 0.1 }); // shoulder on frame 1: hip is next
    expect(store.landmark()).toBe('hip');
    store.goTo(0);
    expect(store.landmark()).toBe('knee');
    expect(store.armed()).toBe(true);
    store.placeAt({ x: 0.5, y: 0.3 });
    expect(store.sidePoints().knee).toEqual({ x: 0.5, y: 0.3 });
    // The other side has nothing on frame 0: the chosen landmark stays.
    store.chooseSide('right');
    expect(store.landmark()).toBe('ankle');
    expect(store.armed()).toBe(true);
  });

  it('steps, clamps and jumps between marked events', () => {
    store.step(-3);
    expect(store.frame()).toBe(0);
    store.last();
    expect(store.frame()).toBe(19);
    store.goTo(4);
    store.toggleEvent('initial_contact');
    store.goTo(12);
    store.toggleEvent('toe_off');
    store.first();
    expect(store.jumpToEvent(1)).toBe(true);
    expect(store.frame()).toBe(4);
    expect(store.jumpToEvent(1)).toBe(true);
    expect(store.frame()).toBe(12);
    expect(store.jumpToEvent(1)).toBe(false);
    expect(store.timeMs()).toBeCloseTo(200);
  });

  it("an undo after a colleague's save was merged in leaves the colleague's mark alone", () => {
    // Placed here: shoulder, then hip. A colleague's save moved the shoulder; the conflict merge
    // shows their shoulder with this tab's hip on top (what AnnotationSync's replaceLocal does).
    store.placeAt({ x: 0.3, y: 0.3 });
    store.placeAt({ x: 0.3, y: 0.4 });
    const theirs = { x: 0.65, y: 0.29 };
    store.annotations.update((s) => ({
      ...s,
      landmarks: s.landmarks.map((row) => ({ ...row, points: { ...row.points, shoulder: theirs } })),
    }));
    store.undo(); // hip: this tab's own mark, undone
    expect(store.sidePoints().hip).toBeUndefined();
    store.undo(); // shoulder: the colleague's now, kept (before: removed, their mark was lost)
    expect(store.sidePoints().shoulder).toEqual(theirs);
    store.redo(); // nothing of this command fits any more: still theirs
    expect(store.sidePoints().shoulder).toEqual(theirs);
    store.redo();
    expect(store.sidePoints().hip).toEqual({ x: 0.3, y: 0.4 });
  });
});
