import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import type { ClipAnnotations } from '../../../contracts/annotations';
import { AnnotationState, applyChanges, stateOf } from './annotation-changes';
import { setPointChanges, toggleEventChanges } from './annotation-ops';
import { AnnotationSync } from './annotation-sync';
import { DRAFT_RESTORED, draftKey } from './review-draft';

function annotations(revision: number, partial: Partial<ClipAnnotations> = {}): ClipAnnotations {
  return { clipId: 7, revision, landmarks: [], events: [], scale: null, updatedAt: null, updatedByName: null, ...partial };
}

describe('AnnotationSync', () => {
  let sync: AnnotationSync;
  let backend: HttpTestingController;
  let local: AnnotationState;
  let messages: string[];

  beforeEach(() => {
    vi.useFakeTimers();
    TestBed.configureTestingModule({ providers: [AnnotationSync, provideHttpClient(), provideHttpClientTesting()] });
    sync = TestBed.inject(AnnotationSync);
    backend = TestBed.inject(HttpTestingController);
    local = stateOf(annotations(3));
    messages = [];
    sync.start(7, annotations(3), {
      local: () => local,
      replaceLocal: (s, m) => {
        local = s;
        messages.push(m);
      },
    });
  });

  afterEach(() => {
    backend.verify();
    vi.useRealTimers();
    sessionStorage.clear();
  });

  const edit = (changes: Parameters<typeof applyChanges>[1]) => {
    local = applyChanges(local, changes);
    sync.edited();
  };
  const puts = () => backend.match((r) => r.method === 'PUT' && r.url === '/api/clips/7/annotations');

  it('debounces edits into one PUT naming the base revision', () => {
    edit(setPointChanges(local, 1, 'left', 'hip', { x: 0.5, y: 0.5 }));
    vi.advanceTimersByTime(500);
    edit(setPointChanges(local, 1, 'left', 'knee', { x: 0.5, y: 0.7 }));
    expect(sync.state()).toBe('unsaved');
    vi.advanceTimersByTime(799);
    expect(puts()).toHaveLength(0);
    vi.advanceTimersByTime(1);
    const [req] = puts();
    expect(sync.state()).toBe('saving');
    expect(req.request.body.baseRevision).toBe(3);
    expect(Object.keys(req.request.body.landmarks[0].points)).toEqual(['hip', 'knee']);
    req.flush(annotations(4, { landmarks: req.request.body.landmarks }));
    expect(sync.state()).toBe('saved');
    expect(sync.base()?.revision).toBe(4);
  });

  it('goes back to Saved without a request when an undo returns to the loaded state', () => {
    const changes = toggleEventChanges(local, 2, 'left', 'toe_off');
    edit(changes);
    local = stateOf(annotations(3));
    sync.edited();
    expect(sync.state()).toBe('saved');
    vi.advanceTimersByTime(5000);
    expect(puts()).toHaveLength(0);
  });

  it('retries with back-off while offline, then saves', () => {
    edit(toggleEventChanges(local, 2, 'left', 'toe_off'));
    vi.advanceTimersByTime(800);
    puts()[0].error(new ProgressEvent('error'), { status: 0 });
    expect(sync.state()).toBe('offline');
    expect(sync.hasUnsaved()).toBe(true);
    vi.advanceTimersByTime(999);
    expect(puts()).toHaveLength(0);
    vi.advanceTimersByTime(300);
    const retry = puts();
    expect(retry).toHaveLength(1);
    retry[0].flush({ error: { code: 'internal', message: 'boom' } }, { status: 503, statusText: 'Unavailable' });
    expect(sync.state()).toBe('offline');
    vi.advanceTimersByTime(2500);
    puts()[0].flush(annotations(4, { events: [{ frame: 2, side: 'left', kind: 'toe_off' }] }));
    expect(sync.state()).toBe('saved');
  });

  it('on 409 puts the local edits on top of the server copy and saves again', () => {
    edit(setPointChanges(local, 1, 'left', 'hip', { x: 0.5, y: 0.5 }));
    vi.advanceTimersByTime(800);
    const theirs = annotations(5, { events: [{ frame: 9, side: 'right', kind: 'initial_contact' }], updatedByName: 'Sam Physio' });
    puts()[0].flush(
      { error: { code: 'stale_revision', message: 'Saved by someone else', details: { current: theirs } } },
      { status: 409, statusText: 'Conflict' },
    );
    expect(local.events).toEqual(theirs.events);
    expect(local.landmarks[0].points.hip).toEqual({ x: 0.5, y: 0.5 });
    expect(messages).toEqual(['Sam Physio saved this clip meanwhile; your edit was put on top of theirs.']);
    vi.advanceTimersByTime(0);
    const [again] = puts();
    expect(again.request.body.baseRevision).toBe(5);
    again.flush(annotations(6, { landmarks: local.landmarks, events: local.events }));
    expect(sync.state()).toBe('saved');
  });

  it('stops with the server message on a 422 until asked to try again', () => {
    edit(toggleEventChanges(local, 2, 'left', 'toe_off'));
    vi.advanceTimersByTime(800);
    puts()[0].flush(
      { error: { code: 'validation', message: 'Frame 2 is past the end of the clip', details: [] } },
      { status: 422, statusText: 'Unprocessable' },
    );
    expect(sync.state()).toBe('failed');
    expect(sync.problem()).toBe('Frame 2 is past the end of the clip');
    vi.advanceTimersByTime(60_000);
    expect(puts()).toHaveLength(0);
    sync.saveNow();
    vi.advanceTimersByTime(0);
    expect(puts()).toHaveLength(1);
    backend.match(() => true).forEach((r) => r.flush(annotations(4)));
  });

  it('saves the edits made while a save was running once it answers', () => {
    edit(toggleEventChanges(local, 2, 'left', 'toe_off'));
    vi.advanceTimersByTime(800);
    const [first] = puts();
    edit(toggleEventChanges(local, 4, 'left', 'initial_contact'));
    first.flush(annotations(4, { events: [{ frame: 2, side: 'left', kind: 'toe_off' }] }));
    expect(sync.state()).toBe('unsaved');
    vi.advanceTimersByTime(800);
    const [second] = puts();
    expect(second.request.body.baseRevision).toBe(4);
    expect(second.request.body.events).toHaveLength(2);
    second.flush(annotations(5, { events: local.events }));
    expect(sync.state()).toBe('saved');
  });

  it('keeps marks refused because the session ended and puts them back when the clip opens again', () => {
    edit(setPointChanges(local, 1, 'left', 'hip', { x: 0.5, y: 0.5 }));
    vi.advanceTimersByTime(800);
    puts()[0].flush({ error: { code: 'unauthenticated', message: 'Please sign in.' } }, { status: 401, statusText: 'Unauthorized' });
    expect(sync.state()).toBe('failed');
    expect(sync.sessionEnded()).toBe(true);
    sync.stop(); // the page goes to sign-in
    expect(sessionStorage.getItem(draftKey(7))).not.toBeNull();

    // Signed in again, the clip opens on the server's copy (someone added a knee meanwhile).
    const knee = { frame: 1, side: 'left' as const, points: { knee: { x: 0.5, y: 0.7 } } };
    let shown = stateOf(annotations(4, { landmarks: [knee] }));
    const told: string[] = [];
    sync.start(7, annotations(4, { landmarks: [knee] }), { local: () => shown, replaceLocal: (s, m) => ((shown = s), told.push(m)) });
    expect(told).toEqual([DRAFT_RESTORED]);
    expect(Object.keys(shown.landmarks[0].points).sort()).toEqual(['hip', 'knee']);
    vi.advanceTimersByTime(0);
    const [req] = puts();
    expect(req.request.body.baseRevision).toBe(4);
    req.flush(annotations(5, { landmarks: req.request.body.landmarks }));
    expect(sync.state()).toBe('saved');
    expect(sessionStorage.getItem(draftKey(7))).toBeNull();
  });

  it('forgets unsaved marks the coach chose to leave behind', () => {
    edit(setPointChanges(local, 1, 'left', 'hip', { x: 0.5, y: 0.5 }));
    expect(sessionStorage.getItem(draftKey(7))).not.toBeNull();
    sync.stop(); // left the page with "Leave and discard"
    expect(sessionStorage.getItem(draftKey(7))).toBeNull();
  });
});
