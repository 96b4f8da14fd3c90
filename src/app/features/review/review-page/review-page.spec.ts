import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, TestRequest, provideHttpClientTesting } from '@angular/common/http/testing';
import { signal } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { ClipAnnotations } from '../../../../contracts/annotations';
import type { AssessmentDetail, Clip } from '../../../../contracts/api';
import { AuthStore } from '../../../core/auth-store';
import { buttonWithText, flushApiError } from '../../../shared/testing/api-errors';
import { stubJsdomCanvas } from '../../../shared/testing/jsdom-canvas';
import { FakeEventSource, provideFakeEventSource } from '../../../core/fake-event-source';
import { ReviewPage } from './review-page';

function clip(overrides: Partial<Clip> = {}): Clip {
  return {
    id: 7,
    assessmentId: 4,
    athleteId: 9,
    originalName: 'treadmill-side.mp4',
    sizeBytes: 5_000_000,
    status: 'ready',
    progress: null,
    error: null,
    nearSide: 'right',
    direction: 'left_to_right',
    captureFps: null,
    fps: 120,
    effectiveFps: 120,
    width: 1280,
    height: 720,
    frameCount: 50,
    durationS: 50 / 120,
    rotation: 0,
    codec: 'h264',
    thumbCount: 5,
    thumbEvery: 10,
    uploadedByName: 'Robin Coach',
    uploadedById: 3,
    marked: false,
    createdAt: '2025-03-14T10:00:00Z',
    ...overrides,
  };
}

const assessment: AssessmentDetail = {
  id: 4,
  athleteId: 9,
  date: '2025-03-14',
  kind: 'baseline',
  surface: 'treadmill',
  speedMps: 3,
  speedUnit: 'kmh',
  inclinePercent: 0,
  shoes: null,
  cameraNotes: null,
  notes: null,
  clipCount: 1,
  createdAt: '2025-03-14T09:00:00Z',
  updatedAt: '2025-03-14T09:00:00Z',
  clips: [],
  videoConsent: true,
};

const empty: ClipAnnotations = { clipId: 7, revision: 2, landmarks: [], events: [], scale: null, updatedAt: null, updatedByName: null };

describe('ReviewPage', () => {
  let fixture: ComponentFixture<ReviewPage>;
  let element: HTMLElement;
  let backend: HttpTestingController;

  let restoreJsdom: () => void;
  beforeAll(() => {
    // jsdom has no layout observer, no canvas drawing and no image decoding.
    restoreJsdom = stubJsdomCanvas();
  });
  afterAll(() => restoreJsdom());

  /** Runs change detection and effects (no whenStable: open frame fetches keep the app busy). */
  async function settle(): Promise<void> {
    TestBed.tick();
    await new Promise((r) => setTimeout(r));
    TestBed.tick();
  }

  /** Opens the page; `optionalLoadsFail` makes the clinic's bands and the athlete (for the name) fail to load. */
  async function open(c: Clip, optionalLoadsFail = false): Promise<void> {
    TestBed.configureTestingModule({
      imports: [ReviewPage],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        provideFakeEventSource(),
        { provide: AuthStore, useValue: { user: signal({ id: 3, name: 'Robin Coach' }), role: signal('coach') } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ReviewPage);
    fixture.componentRef.setInput('athleteId', '9');
    fixture.componentRef.setInput('assessmentId', '4');
    fixture.componentRef.setInput('clipId', '7');
    element = fixture.nativeElement;
    await settle();
    backend.expectOne('/api/clips/7').flush(c);
    if (optionalLoadsFail) {
      backend.match('/api/reference-bands').forEach((r) => flushApiError(r, 503, 'The server is busy.'));
      backend.match('/api/athletes/9').forEach((r) => flushApiError(r, 503, 'The server is busy.'));
    } else {
      backend.match('/api/reference-bands').forEach((r) => r.flush({ bands: [] }));
      backend.match('/api/athletes/9').forEach((r) => r.flush({ id: 9, firstName: 'Ada', lastName: 'Kestrel' }));
    }
    await settle();
  }

  function frameRequests(): TestRequest[] {
    return backend.match((r) => /\/api\/clips\/7\/frames\/\d+$/.test(r.url));
  }

  afterEach(() => {
    frameRequests();
    fixture?.destroy();
  });

  function press(key: string, init: KeyboardEventInit = {}, target: EventTarget = document.body): void {
    target.dispatchEvent(new KeyboardEvent('keydown', { key, bubbles: true, cancelable: true, ...init }));
  }

  const readout = () => element.querySelector('.frame-no')?.textContent?.replace(/\s+/g, ' ').trim();

  it('says a clip without frames yet is not ready, with a way back, and opens by itself on its first frames', async () => {
    await open(clip({ status: 'queued', frameCount: 50 }));
    expect(element.textContent).toContain('This clip is not ready for review');
    expect(element.textContent).toContain('opens by itself as soon as the first frames exist');
    const back = [...element.querySelectorAll('a')].find((a) => a.textContent?.includes('Back to the assessment'));
    expect(back?.getAttribute('href')).toBe('/athletes/9/assessments/4');
    expect(element.querySelector('app-frame-viewer')).toBeNull();

    const source = FakeEventSource.instances[0]!;
    expect(source.url).toBe('/api/athletes/9/processing-events');
    source.open();
    source.send({ id: 7, state: 'running', progress: { done: 3, total: 50 } });
    await settle();
    backend.expectOne('/api/clips/7').flush(clip({ status: 'extracting', progress: { done: 3, total: 50 } }));
    await openOn(plannedManifest());
    expect(element.querySelector('app-frame-viewer canvas')).not.toBeNull();
    expect(element.textContent).toContain('Frames arriving: 3 of 50 ready');
  });

  /** The manifest while frames are extracted: the probe's count, computed timestamps. */
  function plannedManifest(frameCount = 50) {
    return {
      complete: false,
      frameCount,
      width: 1280,
      height: 720,
      fps: 120,
      timestampsMs: Array.from({ length: frameCount }, (_, i) => (i * 1000) / 120),
    };
  }

  /** Answers the loads that open the workspace. */
  async function openOn(manifest: object): Promise<void> {
    backend.expectOne('/api/assessments/4').flush(assessment);
    backend.expectOne('/api/clips/7/manifest').flush(manifest);
    backend.expectOne('/api/clips/7/annotations').flush(empty);
    await settle();
  }

  it('opens on the first frames, asks only for frames that exist, fills in, and takes the complete manifest', async () => {
    await open(clip({ status: 'extracting', progress: { done: 10, total: 50 } }));
    await openOn(plannedManifest());
    expect(readout()).toBe('Frame 0 / 49');
    expect(element.textContent).toContain('Frames arriving: 10 of 50 ready');
    // Only frames that exist are fetched.
    expect(Math.max(...frameRequests().map((r) => Number(r.request.url.split('/').pop())))).toBeLessThan(10);

    // The end of what exists is as far as stepping goes; marking waits for every frame.
    press('End');
    await settle();
    expect(readout()).toBe('Frame 9 / 49');
    press('o');
    await settle();
    expect(element.querySelector('app-events-panel .events')).toBeNull();
    expect(element.querySelector('.save')?.textContent).toContain('Saved');

    const source = FakeEventSource.instances[0]!;
    source.open();
    source.send({ id: 7, state: 'running', progress: { done: 30, total: 50 } });
    await settle();
    expect(element.textContent).toContain('Frames arriving: 30 of 50 ready');
    press('End');
    await settle();
    expect(readout()).toBe('Frame 29 / 49');

    // Done: the complete manifest (here one frame fewer than the probe said) replaces the plan.
    source.send({ id: 7, state: 'ready' });
    await settle();
    backend.expectOne('/api/clips/7').flush(clip({ frameCount: 49 }));
    await settle();
    backend.expectOne('/api/clips/7/manifest').flush({ ...plannedManifest(49), complete: true });
    await settle();
    expect(element.querySelector('.filling')).toBeNull();
    press('End');
    await settle();
    expect(readout()).toBe('Frame 48 / 48');
  });

  async function openReady(optionalLoadsFail = false): Promise<void> {
    await open(clip(), optionalLoadsFail);
    backend.expectOne('/api/assessments/4').flush(assessment);
    backend.expectOne('/api/clips/7/manifest').flush({
      frameCount: 50,
      width: 1280,
      height: 720,
      fps: 120,
      timestampsMs: Array.from({ length: 50 }, (_, i) => (i * 1000) / 120),
    });
    backend.expectOne('/api/clips/7/annotations').flush(empty);
    await settle();
  }

  it('says when the clinic bands or the athlete name could not be loaded, keeps working, and loads them again on Try again', async () => {
    await openReady(true);
    expect(element.querySelector('app-frame-viewer canvas')).not.toBeNull();
    const nameNote = element.querySelector('.review-header app-error-note');
    expect(nameNote?.textContent).toContain("The athlete's name could not be loaded. The server is busy.");
    expect(nameNote?.getAttribute('role')).toBe('status');

    [...element.querySelectorAll<HTMLElement>('[role="tab"]')].find((t) => t.textContent?.includes('Measures'))?.click();
    await settle();
    const bandsNote = element.querySelector('app-error-note.bands-note');
    expect(bandsNote?.textContent).toContain(
      "The clinic's reference bands could not be loaded; the default bands are shown. The server is busy.",
    );

    buttonWithText(bandsNote as HTMLElement, 'Try again').click();
    buttonWithText(nameNote as HTMLElement, 'Try again').click();
    await settle();
    backend.expectOne('/api/reference-bands').flush({ bands: [] });
    backend.expectOne('/api/athletes/9').flush({ id: 9, firstName: 'Ada', lastName: 'Kestrel' });
    await settle();
    expect(element.querySelector('app-error-note')).toBeNull();
    expect(element.querySelector('.crumbs')?.textContent).toContain('Ada Kestrel');
  });

  it('opens the workspace, steps with the keyboard, marks events and undoes them', async () => {
    await openReady();

    expect(element.querySelector('app-frame-viewer canvas')).not.toBeNull();
    // Frames are fetched around the current one through the authorised route.
    expect(frameRequests().map((r) => r.request.url)[0]).toBe('/api/clips/7/frames/0');
    expect(readout()).toBe('Frame 0 / 49');

    press('ArrowRight');
    press('ArrowRight', { shiftKey: true });
    await settle();
    expect(readout()).toBe('Frame 11 / 49');
    expect(element.querySelector('.time')?.textContent).toContain('91.7 ms');

    // Keys typed into a text field stay there.
    const input = document.createElement('input');
    document.body.appendChild(input);
    press('ArrowRight', {}, input);
    press('End', {}, input);
    input.remove();
    await settle();
    expect(readout()).toBe('Frame 11 / 49');

    // Toe-off for the near (right) side on this frame, listed on the Events tab.
    press('o');
    await settle();
    expect(element.querySelector('.save')?.textContent).toContain('Unsaved changes');
    const eventsTab = [...element.querySelectorAll<HTMLElement>('[role="tab"]')].find((t) => t.textContent?.includes('Events'))!;
    eventsTab.click();
    await settle();
    const row = element.querySelector('app-events-panel .events li')!;
    expect(row.querySelector('.frame')?.textContent?.trim()).toBe('11');
    expect(row.querySelector('.what')?.textContent?.trim()).toBe('Right · Toe-off');

    press('End');
    press('[');
    await settle();
    expect(readout()).toBe('Frame 11 / 49');

    press('z', { ctrlKey: true });
    await settle();
    expect(element.querySelector('app-events-panel .events')).toBeNull();
    expect(element.querySelector('.save')?.textContent).toContain('Saved');
    expect(fixture.componentInstance.leaveWarning()).toBeNull();

    press('z', { ctrlKey: true, shiftKey: true });
    await settle();
    expect(element.querySelector('app-events-panel .events')?.textContent).toContain('Toe-off');
    expect(fixture.componentInstance.leaveWarning()?.title).toBe('Leave before your marks are saved?');
  });

  it('steps frames with the arrows after a click on a side tab or a speed toggle, which keep their choice', async () => {
    await openReady();
    const tab = [...element.querySelectorAll<HTMLElement>('[role="tab"]')].find((t) => t.textContent?.includes('Events'))!;
    tab.click();
    tab.focus();
    await settle();
    press('ArrowRight', {}, tab);
    press('ArrowRight', { shiftKey: true }, tab);
    await settle();
    expect(readout()).toBe('Frame 11 / 49');
    expect(tab.getAttribute('aria-selected')).toBe('true');

    const speed = [...element.querySelectorAll<HTMLButtonElement>('mat-button-toggle button')].find((b) =>
      b.textContent?.includes('1/2×'),
    )!;
    speed.click();
    speed.focus();
    await settle();
    press('ArrowLeft', {}, speed);
    press('End', {}, speed);
    press('Home', {}, speed);
    press('ArrowRight', {}, speed);
    await settle();
    expect(readout()).toBe('Frame 1 / 49');
    expect(speed.getAttribute('aria-checked')).toBe('true');
  });

  it('names the gait event on the frame ("Right toe-off · step 1") and offers the Angle gauge on G', async () => {
    await openReady();
    press('ArrowRight');
    press('o');
    await settle();
    expect(element.querySelector('.frame-events')?.textContent?.replace(/\s+/g, ' ').trim()).toBe('Right toe-off · step 1');
    press('ArrowRight');
    await settle();
    expect(element.querySelector('.frame-events')).toBeNull();

    press('g');
    await settle();
    const gauge = element.querySelector<HTMLButtonElement>('mat-button-toggle button[aria-label="Angle gauge"]')!;
    expect(gauge.getAttribute('aria-checked')).toBe('true');
    expect(element.querySelector('.gauge-hint')?.textContent).toContain('the first arm’s end');
    expect(element.querySelector('app-landmarks-panel .gauges')?.textContent).toContain('None.');
  });
});
