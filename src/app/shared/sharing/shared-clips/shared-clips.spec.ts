import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { FakeEventSource, provideFakeEventSource } from '../../../core/fake-event-source';
import { anAnnotatedClip } from '../test-stills';
import { SharedClips } from './shared-clips';

/** Lets `ms` pass: on the fake clock when the test installed it, else in real time. */
const wait = (ms: number): Promise<unknown> =>
  vi.isFakeTimers() ? vi.advanceTimersByTimeAsync(ms) : new Promise((r) => setTimeout(r, ms));

describe('SharedClips', () => {
  let fixture: ComponentFixture<SharedClips>;
  let element: HTMLElement;
  let backend: HttpTestingController;

  async function open() {
    TestBed.configureTestingModule({
      imports: [SharedClips],
      providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([]), provideFakeEventSource()],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(SharedClips);
    fixture.componentRef.setInput('athleteId', 9);
    element = fixture.nativeElement;
    fixture.detectChanges();
  }
  const settle = async () => {
    await wait(20);
    fixture.detectChanges();
    await fixture.whenStable();
    fixture.detectChanges();
  };
  afterEach(() => {
    vi.useRealTimers();
    backend.verify();
    document.querySelector('.cdk-overlay-container')?.replaceChildren();
  });

  it('follows a render on the progress stream: its progress in place, the clip once ready, no polling', async () => {
    // The fake clock from the start: a poll set up when the list opened would fire when the clock is moved below.
    vi.useFakeTimers();
    const rendering = anAnnotatedClip({ status: 'rendering', progress: 0.2 });
    await open();
    backend.expectOne('/api/athletes/9/annotated-clips').flush({ clips: [rendering] });
    await settle();
    expect(element.textContent).toContain('Rendering… 20 %');
    const source = FakeEventSource.instances.at(-1)!;
    expect(source.url).toBe('/api/athletes/9/processing-events');
    source.open();
    // A list showing a render is read again once the stream is open (it may have ended before).
    await wait(20);
    fixture.detectChanges();
    backend.expectOne('/api/athletes/9/annotated-clips').flush({ clips: [rendering] });
    await settle();

    source.send({ subject: 'annotated_clip', kind: 'render_annotated_clip', id: 3, state: 'running', progress: { done: 65, total: 100 } });
    await settle();
    expect(element.textContent).toContain('Rendering… 65 %');
    backend.expectNone('/api/annotated-clips/3');

    // Stills and clips' frames are not this list's.
    source.send({ subject: 'still', kind: 'render_still', id: 3, state: 'ready' });
    source.send({ subject: 'clip', kind: 'extract_frames', id: 3, state: 'ready' });
    await settle();
    backend.expectNone('/api/annotated-clips/3');

    source.send({ subject: 'annotated_clip', kind: 'render_annotated_clip', id: 3, state: 'ready' });
    backend.expectOne('/api/annotated-clips/3').flush(anAnnotatedClip({ caption: 'Hip drive' }));
    await settle();
    expect(element.textContent).toContain('Hip drive');
    expect(element.querySelector('button[aria-label="Preview: Hip drive"]')).not.toBeNull();

    // Nothing asks again by itself, however long the list stays open.
    await vi.advanceTimersByTimeAsync(10 * 60_000);
    backend.expectNone('/api/athletes/9/annotated-clips');
  });

  it('adds a clip made elsewhere when its render is first heard of, and drops one being deleted', async () => {
    await open();
    backend.expectOne('/api/athletes/9/annotated-clips').flush({ clips: [anAnnotatedClip({ id: 4, caption: 'Old one' })] });
    await settle();
    const source = FakeEventSource.instances.at(-1)!;
    source.open();
    await settle();
    source.send({ subject: 'annotated_clip', kind: 'render_annotated_clip', id: 5, state: 'queued' });
    backend.expectOne('/api/annotated-clips/5').flush(anAnnotatedClip({ id: 5, status: 'rendering', progress: 0, caption: 'New one' }));
    await settle();
    expect(element.textContent).toContain('New one');
    source.send({ subject: 'annotated_clip', kind: 'render_annotated_clip', id: 4, state: 'cancelled' });
    await settle();
    expect(element.textContent).not.toContain('Old one');
  });
});
