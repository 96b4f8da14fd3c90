import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { EMPTY } from 'rxjs';
import type { ClipAnnotations, GaitEventMark } from '../../../contracts/annotations';
import type { Assessment, Clip, FrameManifest } from '../../../contracts/api';
import { AuthStore } from '../../core/auth-store';
import { AnnotationState, EMPTY_STATE, applyChanges, invertChanges } from './annotation-changes';
import { acceptProposalChanges, removeEventChanges, toggleEventChanges } from './annotation-ops';
import { AnnotationSync } from './annotation-sync';
import { EventProposals, proposalSummary } from './event-proposals';
import { FrameCache } from './frame-cache';
import { ReviewStore } from './review-store';

const placed: GaitEventMark = { frame: 4, side: 'left', kind: 'initial_contact' };
const proposedTo: GaitEventMark = { frame: 12, side: 'left', kind: 'toe_off', origin: 'proposed' };
const proposedIc: GaitEventMark = { frame: 9, side: 'right', kind: 'initial_contact', origin: 'proposed' };
const state: AnnotationState = { ...EMPTY_STATE, events: [placed, proposedIc, proposedTo] };

describe('event origin in edits', () => {
  it('accepting all turns every proposal into accepted and leaves placed events alone; undo brings the proposals back', () => {
    const changes = acceptProposalChanges(state);
    const after = applyChanges(state, changes);
    expect(after.events).toEqual([placed, { ...proposedIc, origin: 'accepted' }, { ...proposedTo, origin: 'accepted' }]);
    expect(applyChanges(after, invertChanges(changes)).events).toEqual(state.events);
  });

  it('accepting one changes only that one', () => {
    const after = applyChanges(state, acceptProposalChanges(state, [proposedTo]));
    expect(after.events.map((e) => e.origin ?? 'placed')).toEqual(['placed', 'proposed', 'accepted']);
  });

  it('removing a proposal (rejecting it) and undoing keeps its origin; a newly marked event is placed', () => {
    const removed = removeEventChanges(state, proposedIc);
    expect(removed).toEqual([
      { key: { kind: 'event', frame: 9, side: 'right', event: 'initial_contact' }, before: 'proposed', after: null },
    ]);
    const without = applyChanges(state, removed);
    expect(applyChanges(without, invertChanges(removed)).events).toEqual(state.events);
    const marked = applyChanges(without, toggleEventChanges(without, 20, 'right', 'toe_off'));
    expect(marked.events.at(-1)).toEqual({ frame: 20, side: 'right', kind: 'toe_off' });
  });
});

describe('proposalSummary', () => {
  it('says how many were proposed, which need a close look, and how many were left out', () => {
    expect(proposalSummary({ proposed: 8, byRule: { heel_minimum: 4, knee_extension: 4 }, skipped: [] })).toBe('8 events proposed.');
    expect(proposalSummary({ proposed: 1, byRule: { coordinate: 1 }, skipped: ['x', 'y'] })).toBe(
      "1 event proposed; 1 toe-off from the toe's rearmost point only (no knee or ankle marked there): check closely; 2 left out beside events already marked.",
    );
    expect(proposalSummary({ proposed: 0, byRule: {}, skipped: ['x'] })).toBe(
      'No new events proposed; 1 left out beside events already marked.',
    );
  });
});

describe('EventProposals', () => {
  const clip = { id: 7, nearSide: 'left', direction: 'left_to_right', captureFps: null, fps: 120, effectiveFps: 120 } as Clip;
  const manifest = { frameCount: 30, width: 640, height: 360, fps: 120, timestampsMs: [] } as unknown as FrameManifest;
  const loaded: ClipAnnotations = {
    clipId: 7,
    revision: 3,
    landmarks: [],
    events: [placed],
    scale: null,
    updatedAt: null,
    updatedByName: null,
  };
  let proposals: EventProposals;
  let store: ReviewStore;
  let http: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      providers: [
        ReviewStore,
        AnnotationSync,
        EventProposals,
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: AuthStore, useValue: { user: signal(null) } },
      ],
    });
    store = TestBed.inject(ReviewStore);
    proposals = TestBed.inject(EventProposals);
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

  it('posts the current revision, shows the saved proposals as one undo step, and stays saved', async () => {
    expect(proposals.canPropose()).toBe(true);
    const done = proposals.propose();
    const req = http.expectOne('/api/clips/7/events/proposals');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({ baseRevision: 3 });
    req.flush({
      annotations: { ...loaded, revision: 4, events: [placed, proposedTo] },
      proposed: 1,
      byRule: { knee_extension: 1 },
      skipped: [],
    });
    await done;
    expect(store.events()).toEqual([placed, proposedTo]);
    expect(proposals.waiting()).toEqual([proposedTo]);
    expect(proposals.message()).toBe('1 event proposed.');
    expect(store.saveState()).toBe('saved');
    expect(store.historyLabels().undo).toBe('propose gait events');
  });

  it('shows the server’s reason when there are too few landmarked frames, and changes nothing', async () => {
    const done = proposals.propose();
    http.expectOne('/api/clips/7/events/proposals').flush(
      {
        error: { code: 'too_few_landmarked_frames', message: 'Proposing events needs hip, heel and toe on at least 96 frames in a row.' },
      },
      { status: 422, statusText: 'Unprocessable Entity' },
    );
    await done;
    expect(proposals.problem()).toBe('Proposing events needs hip, heel and toe on at least 96 frames in a row.');
    expect(store.events()).toEqual([placed]);
  });
});
