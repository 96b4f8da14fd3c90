import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { EMPTY, Subject } from 'rxjs';
import type { ClipAnnotations, FrameLandmarks } from '../../../contracts/annotations';
import type { Assessment, Clip, FrameManifest } from '../../../contracts/api';
import { AuthStore } from '../../core/auth-store';
import { ProcessingEvents, type ProcessingMessage } from '../../core/processing-events';
import { AnnotationSync } from './annotation-sync';
import { FrameCache } from './frame-cache';
import { MarkerFollowing } from './marker-following';
import { ReviewStore } from './review-store';

describe('MarkerFollowing', () => {
  const clip = { id: 7, athleteId: 3, nearSide: 'left', direction: 'left_to_right', captureFps: null, fps: 120, effectiveFps: 120 } as Clip;
  const manifest = { frameCount: 30, width: 640, height: 360, fps: 120, timestampsMs: [] } as unknown as FrameManifest;
  const start: FrameLandmarks = { frame: 10, side: 'left', points: { hip: { x: 0.5, y: 0.4, origin: 'placed' } } };
  const loaded: ClipAnnotations = {
    clipId: 7,
    revision: 3,
    landmarks: [start],
    events: [],
    scale: null,
    updatedAt: null,
    updatedByName: null,
  };
  let following: MarkerFollowing;
  let store: ReviewStore;
  let http: HttpTestingController;
  let stream: Subject<ProcessingMessage>;
  const item = (state: 'running' | 'ready' | 'failed', progress: { done: number; total: number } | null, error: string | null = null) =>
    stream.next({ type: 'item', event: { subject: 'clip', id: 7, kind: 'follow_markers', state, progress, error } as never });

  beforeEach(() => {
    stream = new Subject<ProcessingMessage>();
    TestBed.configureTestingModule({
      providers: [
        ReviewStore,
        AnnotationSync,
        MarkerFollowing,
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: AuthStore, useValue: { user: signal(null) } },
        { provide: ProcessingEvents, useValue: { follow: (id: number) => (id === 3 ? stream : EMPTY) } },
      ],
    });
    store = TestBed.inject(ReviewStore);
    following = TestBed.inject(MarkerFollowing);
    http = TestBed.inject(HttpTestingController);
    const cache = new FrameCache({
      frameCount: 30,
      width: 640,
      height: 360,
      fetch: () => EMPTY,
      decode: () => Promise.reject(new Error('unused')),
    });
    store.open({ clip, assessment: { surface: 'treadmill', speedMps: 3 } as Assessment, manifest }, loaded, cache);
  });

  it('needs landmarks on the current frame, and says so until there are', () => {
    expect(following.canFollow()).toBe(false);
    expect(following.blocked()).toMatch(/^Place markers on this frame first/);
    store.goTo(10);
    expect(following.canFollow()).toBe(true);
    expect(following.blocked()).toBeNull();
  });

  it('asks to follow from the current frame over the whole clip, shows progress, then the followed points as one undo step with the frames to check', async () => {
    store.goTo(10);
    const started = following.follow();
    const req = http.expectOne('/api/clips/7/follow');
    expect(req.request.body).toEqual({ startFrame: 10, from: 0, to: 29 });
    req.flush({ itemId: 40, kind: 'follow_markers' });
    await started;
    expect(following.running()).toBe(true);
    item('running', { done: 12, total: 29 });
    expect(following.status()).toBe('Following markers… 12 of 29 frames');
    expect(following.progress()).toEqual({ done: 12, total: 29 });
    item('ready', { done: 29, total: 29 });
    await Promise.resolve();
    const followed: FrameLandmarks[] = [
      { frame: 9, side: 'left', points: { hip: { x: 0.49, y: 0.4, origin: 'followed', confidence: 0.9 } } },
      start,
      { frame: 11, side: 'left', points: { hip: { x: 0.51, y: 0.4, origin: 'followed', confidence: 0.3 } } },
    ];
    http.expectOne('/api/clips/7/annotations').flush({ ...loaded, revision: 4, landmarks: followed });
    await new Promise((r) => setTimeout(r, 0));
    expect(following.running()).toBe(false);
    expect(store.annotations().landmarks.map((l) => l.frame)).toEqual([9, 10, 11]);
    expect(following.lowFrames()).toEqual([11]);
    expect(following.status()).toBe('Markers followed. 1 frame to check (low confidence).');
    expect(store.saveState()).toBe('saved');
    expect(store.historyLabels().undo).toBe('follow markers');
  });

  it('after following, sums up the markers lost, steps between their frames, shows what to place there and drops a frame once it is placed by hand', async () => {
    store.goTo(10);
    const started = following.follow();
    http.expectOne('/api/clips/7/follow').flush({ itemId: 42, kind: 'follow_markers' });
    await started;
    item('ready', { done: 29, total: 29 });
    await Promise.resolve();
    http.expectOne('/api/clips/7/annotations').flush({
      ...loaded,
      revision: 4,
      notFollowed: [
        { frame: 12, side: 'left', landmark: 'hip', reason: 'not_found' },
        { frame: 20, side: 'left', landmark: 'hip', reason: 'on_other_marker' },
      ],
    });
    await new Promise((r) => setTimeout(r, 0));
    expect(following.status()).toBe('Markers followed. Left hip not followed on 2 frames — check them.');
    expect(following.toCheck().frames).toEqual([12, 20]);
    expect(following.stepToCheck()).toBe(true);
    expect(store.frame()).toBe(12);
    expect(following.missingHere().map((m) => m.text)).toEqual([
      'Left hip needs placing: the marker could not be seen here (hidden by a limb, blurred, or out of the picture).',
    ]);
    store.chooseSide('left');
    store.chooseLandmark('hip');
    store.placeAt({ x: 0.5, y: 0.4 });
    expect(following.toCheck().frames).toEqual([20]);
    expect(following.missingHere()).toEqual([]);
    expect(following.stepToCheck(-1)).toBe(true);
    expect(store.frame()).toBe(20);
    expect(following.stepToCheck()).toBe(false);
  });

  it('shows why following failed and changes nothing', async () => {
    store.goTo(10);
    const started = following.follow();
    http.expectOne('/api/clips/7/follow').flush({ itemId: 41, kind: 'follow_markers' });
    await started;
    item('failed', null, 'Frame 10 has no landmarks any more: place them, then follow again.');
    expect(following.running()).toBe(false);
    expect(following.problem()).toBe('Frame 10 has no landmarks any more: place them, then follow again.');
    expect(store.annotations().landmarks).toEqual([start]);
  });

  it('follows over the range the coach chose, forward and backward from this frame; Whole clip restores the default', async () => {
    store.goTo(10);
    expect(following.wholeClip()).toBe(true);
    following.setRangeEnd('from', 5);
    following.setRangeEnd('to', 20);
    expect(following.range()).toEqual({ from: 5, to: 20 });
    expect(following.wholeClip()).toBe(false);
    const started = following.follow();
    const req = http.expectOne('/api/clips/7/follow');
    expect(req.request.body).toEqual({ startFrame: 10, from: 5, to: 20 });
    req.flush({ itemId: 42, kind: 'follow_markers' });
    await started;
    item('failed', null, 'stop');
    following.followWholeClip();
    expect(following.range()).toEqual({ from: 0, to: 29 });
  });

  it('will not start when this frame is outside the range or the range leaves the clip, and says why', () => {
    store.goTo(10);
    following.setRangeEnd('from', 12);
    expect(following.canFollow()).toBe(false);
    expect(following.rangeProblem()).toBe('This frame (10) is outside 12–29: follow from a frame inside the range.');
    following.setRangeEnd('from', 0);
    following.setRangeEnd('to', 30);
    expect(following.canFollow()).toBe(false);
    expect(following.rangeProblem()).toBe("The clip's frames are 0–29.");
    following.followWholeClip();
    expect(following.canFollow()).toBe(true);
  });

  it('Cancel asks the server to stop; when the stream says cancelled, nothing changed and the status says nothing was kept', async () => {
    store.goTo(10);
    const started = following.follow();
    http.expectOne('/api/clips/7/follow').flush({ itemId: 43, kind: 'follow_markers' });
    await started;
    item('running', { done: 3, total: 29 });
    const cancelling = following.cancel();
    expect(following.cancelling()).toBe(true);
    http.expectOne({ method: 'POST', url: '/api/clips/7/follow/cancel' }).flush({ cancelled: 1 });
    await cancelling;
    stream.next({
      type: 'item',
      event: { subject: 'clip', id: 7, kind: 'follow_markers', state: 'cancelled', progress: null, error: null } as never,
    });
    expect(following.running()).toBe(false);
    expect(following.cancelling()).toBe(false);
    expect(following.status()).toBe('Following cancelled: nothing it followed was kept, the landmarks are as they were.');
    expect(following.problem()).toBeNull();
    expect(store.annotations().landmarks).toEqual([start]);
    http.verify();
  });
});
