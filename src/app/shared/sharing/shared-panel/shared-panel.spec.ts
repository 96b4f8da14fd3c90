import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { FakeEventSource, provideFakeEventSource } from '../../../core/fake-event-source';
import { aStill, aSummary } from '../test-stills';
import { SharedPanel } from './shared-panel';

/** Lets `ms` pass: on the fake clock when the test installed it, else in real time. */
const wait = (ms: number): Promise<unknown> =>
  vi.isFakeTimers() ? vi.advanceTimersByTimeAsync(ms) : new Promise((r) => setTimeout(r, ms));

describe('SharedPanel', () => {
  let fixture: ComponentFixture<SharedPanel>;
  let element: HTMLElement;
  let backend: HttpTestingController;

  async function open() {
    TestBed.configureTestingModule({
      imports: [SharedPanel],
      providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([]), provideFakeEventSource()],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(SharedPanel);
    fixture.componentRef.setInput('athleteId', 9);
    fixture.componentRef.setInput('athleteName', 'Ada Kestrel');
    element = fixture.nativeElement;
    fixture.detectChanges();
  }
  /** The annotated clips below the stills have their own spec; here they are an empty list. */
  const flushClips = () => backend.match((r) => r.url.endsWith('/annotated-clips')).forEach((r) => r.flush({ clips: [] }));
  const settle = async () => {
    flushClips();
    await wait(20);
    fixture.detectChanges();
    await fixture.whenStable();
    fixture.detectChanges();
  };
  afterEach(() => {
    vi.useRealTimers();
    flushClips();
    backend.verify();
    document.querySelector('.cdk-overlay-container')?.replaceChildren();
  });

  it('follows a render on the progress stream: its progress in place, the still once ready, no polling', async () => {
    // The fake clock from the start: a poll set up when the list opened would fire when the clock is moved below.
    vi.useFakeTimers();
    await open();
    backend.expectOne('/api/athletes/9/stills').flush([aStill({ status: 'rendering', progress: 0.4 })]);
    backend.expectOne('/api/athletes/9/summaries').flush({ summaries: [] });
    await settle();
    expect(element.textContent).toContain('Rendering… 40 %');
    expect(element.querySelector('mat-progress-bar[mode="determinate"]')).not.toBeNull();
    const source = FakeEventSource.instances[0]!;
    expect(source.url).toBe('/api/athletes/9/processing-events');
    source.open();
    // A list showing a render is read again once the stream is open: a render that ended before
    // then sends no more events.
    await wait(20);
    fixture.detectChanges();
    backend.expectOne('/api/athletes/9/stills').flush([aStill({ status: 'rendering', progress: 0.4 })]);
    backend.expectOne('/api/athletes/9/summaries').flush({ summaries: [] });
    await settle();

    source.send({ subject: 'still', kind: 'render_still', id: aStill().id, state: 'running', progress: { done: 70, total: 100 } });
    await settle();
    expect(element.textContent).toContain('Rendering… 70 %');
    backend.expectNone(`/api/stills/${aStill().id}`);

    source.send({ subject: 'still', kind: 'render_still', id: aStill().id, state: 'ready' });
    backend.expectOne(`/api/stills/${aStill().id}`).flush(aStill({ status: 'ready', caption: 'Hip at toe-off' }));
    await settle();
    expect(element.querySelector('img')?.getAttribute('alt')).toBe('Hip at toe-off');

    // Nothing asks again by itself, however long the list stays open.
    await vi.advanceTimersByTimeAsync(10 * 60_000);
    backend.expectNone('/api/athletes/9/stills');
  });

  it('publishes after a confirmation that mentions the e-mail notice', async () => {
    await open();
    backend.expectOne('/api/athletes/9/stills').flush([aStill()]);
    backend.expectOne('/api/athletes/9/summaries').flush([aSummary()]);
    await settle();
    element.querySelector<HTMLButtonElement>('button[aria-label="Publish still"]')!.click();
    await settle();
    const overlay = document.querySelector('.cdk-overlay-container')!;
    expect(overlay.textContent).toContain('Ada Kestrel will see this still');
    expect(overlay.textContent).toContain('e-mail notice');
    [...overlay.querySelectorAll('button')].find((b) => b.textContent?.includes('Publish and notify'))!.click();
    await settle();
    await wait(200);
    const req = backend.expectOne('/api/stills/1/publish');
    expect(req.request.method).toBe('POST');
    req.flush(aStill({ publishedAt: '2026-12-01T11:00:00Z', publishedBy: 'Tobin Ashgrove' }));
    await settle();
    expect(element.querySelector('button[aria-label="Unpublish still"]')).not.toBeNull();
  });

  it('keeps an edited caption the server refuses, with the reason', async () => {
    await open();
    backend.expectOne('/api/athletes/9/stills').flush([aStill({ caption: 'Old' })]);
    backend.expectOne('/api/athletes/9/summaries').flush([]);
    await settle();
    element.querySelector<HTMLButtonElement>('button[aria-label="Edit caption"]')!.click();
    await settle();
    const area = element.querySelector<HTMLTextAreaElement>('.caption-edit textarea')!;
    area.value = 'New words';
    area.dispatchEvent(new Event('input'));
    await settle();
    element.querySelector<HTMLButtonElement>('.caption-edit button[type="submit"]')!.click();
    backend
      .expectOne('/api/stills/1')
      .flush(
        { error: { code: 'validation', message: 'x', details: [{ path: ['caption'], message: 'Too long for the still' }] } },
        { status: 422, statusText: 'Unprocessable' },
      );
    await settle();
    expect(element.querySelector<HTMLTextAreaElement>('.caption-edit textarea')!.value).toBe('New words');
    expect(element.textContent).toContain('Too long for the still');
  });

  it('offers Preview, Download and a retry for a failed summary', async () => {
    await open();
    backend.expectOne('/api/athletes/9/stills').flush([]);
    backend
      .expectOne('/api/athletes/9/summaries')
      .flush([aSummary(), aSummary({ id: 6, status: 'failed', error: 'Out of memory', pdfUrl: '/api/summaries/6/pdf' })]);
    await settle();
    expect(element.querySelector('a[href="/api/summaries/5/pdf"]')?.getAttribute('target')).toBe('_blank');
    expect(element.querySelector('a[href="/api/summaries/5/pdf?download=1"]')).not.toBeNull();
    expect(element.textContent).toContain('Rendering failed: Out of memory');
    expect(element.querySelector('a[href="/api/summaries/6/pdf"]')).toBeNull();
    expect([...element.querySelectorAll('button')].some((b) => b.textContent?.includes('Try again'))).toBe(true);
  });
});
