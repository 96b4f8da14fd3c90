import { provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { EMPTY } from 'rxjs';
import type { Assessment, Clip } from '../../../contracts/api';
import { AuthStore } from '../../core/auth-store';
import { AnnotationSync } from './annotation-sync';
import { FrameCache } from './frame-cache';
import { ReviewStore } from './review-store';
import type { FrameManifest } from '../../../contracts/api';

const clip = { id: 7, nearSide: 'left', direction: 'left_to_right', captureFps: null, fps: 60, effectiveFps: 60 } as Clip;
const assessment = { surface: 'treadmill', speedMps: 3 } as Assessment;
const manifest: FrameManifest = {
  version: 1,
  frameCount: 20,
  width: 1280,
  height: 720,
  fps: 60,
  durationS: 20 / 60,
  rotationApplied: 0,
  timestampsMs: Array.from({ length: 20 }, (_, i) => (i * 1000) / 60),
  timestampsSource: 'computed',
  thumbEvery: 6,
  thumbCount: 4,
  thumbWidth: 160,
  thumbHeight: 90,
  quality: 4,
};

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
    const cache = new FrameCache({
      frameCount: 20,
      width: 1280,
      height: 720,
      fetch: () => EMPTY,
      decode: () => Promise.reject(new Error('unused')),
    });
    store.open(
      { clip, assessment, manifest },
      { clipId: 7, revision: 0, landmarks: [], events: [], scale: null, updatedAt: null, updatedByName: null },
      cache,
    );
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
});
