import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { signal } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { AssessmentDetail, Clip } from '../../../../contracts/api';
import { AuthStore } from '../../../core/auth-store';
import { FakeEventSource, provideFakeEventSource } from '../../../core/fake-event-source';
import { AssessmentClips, UPLOADS_RUNNING_WARNING, upsertClip } from './assessment-clips';

function clip(id: number, overrides: Partial<Clip> = {}): Clip {
  return {
    id,
    assessmentId: 4,
    athleteId: 9,
    originalName: `take-${id}.mov`,
    sizeBytes: 5_000_000,
    status: 'queued',
    progress: null,
    error: null,
    nearSide: 'left',
    direction: 'left_to_right',
    captureFps: null,
    fps: null,
    effectiveFps: null,
    width: null,
    height: null,
    frameCount: null,
    durationS: null,
    rotation: null,
    codec: null,
    thumbCount: 0,
    thumbEvery: null,
    uploadedByName: 'Sam Runner',
    uploadedById: 7,
    marked: false,
    createdAt: `2025-03-14T10:0${id}:00Z`,
    ...overrides,
  };
}

function detail(overrides: Partial<AssessmentDetail> = {}): AssessmentDetail {
  return {
    id: 4,
    athleteId: 9,
    date: '2025-03-14',
    kind: 'baseline',
    surface: 'treadmill',
    speedMps: null,
    speedUnit: 'kmh',
    inclinePercent: null,
    shoes: null,
    cameraNotes: null,
    notes: null,
    clipCount: 1,
    createdAt: '2025-03-14T09:00:00Z',
    updatedAt: '2025-03-14T09:00:00Z',
    clips: [clip(1)],
    videoConsent: true,
    ...overrides,
  };
}

describe('upsertClip', () => {
  it('replaces by id and keeps upload order', () => {
    const list = [clip(1), clip(3)];
    expect(upsertClip(list, clip(2)).map((c) => c.id)).toEqual([1, 2, 3]);
    expect(upsertClip(list, clip(3, { status: 'ready' }))[1].status).toBe('ready');
  });
});

describe('UPLOADS_RUNNING_WARNING', () => {
  it('says what to do after leaving mid-upload: the part sent is kept, the same file chosen again continues', () => {
    expect(UPLOADS_RUNNING_WARNING.message).toContain(
      'What was sent is kept: choose the same file here again to continue where it stopped.',
    );
  });
});

describe('AssessmentClips', () => {
  let fixture: ComponentFixture<AssessmentClips>;
  let element: HTMLElement;
  let backend: HttpTestingController;

  function create(assessment: AssessmentDetail, audience: 'staff' | 'athlete' = 'staff') {
    TestBed.configureTestingModule({
      imports: [AssessmentClips],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        provideFakeEventSource(),
        { provide: AuthStore, useValue: { user: signal({ id: 7, name: 'Sam Runner' }) } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(AssessmentClips);
    fixture.componentRef.setInput('assessment', assessment);
    fixture.componentRef.setInput('audience', audience);
    fixture.componentRef.setInput('consentLink', audience === 'staff' ? '/athletes/9' : '/portal/profile');
    element = fixture.nativeElement;
  }

  afterEach(() => backend.verify());

  const statuses = () => [...element.querySelectorAll('.status-chip')].map((e) => e.textContent?.trim());

  it('follows processing on the athlete’s progress stream and reloads after every (re)connection', async () => {
    create(detail());
    await fixture.whenStable();
    const source = FakeEventSource.instances[0];
    expect(source.url).toBe('/api/athletes/9/processing-events');
    expect(statuses()).toEqual(['Queued']);

    // Progress of a shown clip is patched in place, without a request.
    source.open();
    source.send({ id: 1, state: 'running', progress: { done: 60, total: 240 } });
    await fixture.whenStable();
    backend.expectNone('/api/assessments/4');
    backend.expectNone('/api/clips/1');
    expect(statuses()).toEqual(['Extracting frames']);
    expect(element.textContent).toContain('Frame 60 of 240 (25 %)');

    // Any other change brings the clip again.
    source.send({ id: 1, state: 'failed', error: 'No video stream found in the file.' });
    backend.expectOne('/api/clips/1').flush(clip(1, { status: 'failed', error: 'No video stream found in the file.' }));
    await fixture.whenStable();
    expect(statuses()).toEqual(['Failed']);
    expect(element.textContent).toContain('No video stream found in the file.');
    expect(element.textContent).toContain('Retry processing');

    // A clip someone else added shows up as well; one of another assessment does not.
    source.send({ id: 2, state: 'ready' });
    backend
      .expectOne('/api/clips/2')
      .flush(clip(2, { status: 'ready', frameCount: 300, thumbCount: 3, thumbEvery: 10, width: 1280, height: 720 }));
    source.send({ id: 5, state: 'queued' });
    backend.expectOne('/api/clips/5').flush(clip(5, { assessmentId: 77 }));
    await fixture.whenStable();
    expect(statuses()).toEqual(['Failed', 'Ready']);
    const thumbs = [...element.querySelectorAll<HTMLImageElement>('.thumbs img')];
    expect(thumbs.map((t) => t.getAttribute('src'))).toEqual(['/api/clips/2/thumbs/0', '/api/clips/2/thumbs/1', '/api/clips/2/thumbs/2']);
    expect(thumbs.every((t) => t.getAttribute('loading') === 'lazy' && t.getAttribute('width') === '128')).toBe(true);
    expect(element.querySelector<HTMLImageElement>('.poster img')?.getAttribute('src')).toBe('/api/clips/2/poster');

    // After a dropped connection the list is reloaded (a clip deleted meanwhile disappears).
    source.onerror?.();
    source.open();
    backend.expectOne('/api/assessments/4').flush(detail({ clips: [clip(2, { status: 'ready', frameCount: 300 })] }));
    await fixture.whenStable();
    expect(statuses()).toEqual(['Ready']);

    // Processing cancelled: the clip is being deleted.
    source.send({ id: 2, state: 'cancelled' });
    await fixture.whenStable();
    expect(statuses()).toEqual([]);
    expect(element.textContent).toContain('No clips yet');

    fixture.destroy();
    expect(source.readyState).toBe(2);
  });

  it('blocks uploads with a link to the consent while video consent is not in force', async () => {
    create(detail({ videoConsent: false, clips: [] }), 'athlete');
    await fixture.whenStable();
    expect(element.querySelector('app-clip-uploader')).toBeNull();
    const notice = element.querySelector('.consent-block')!;
    expect(notice.textContent).toContain('Video consent is needed before clips can be uploaded');
    expect(notice.querySelector('a')?.getAttribute('href')).toBe('/portal/profile');
    expect(element.querySelector('mat-expansion-panel')?.classList).toContain('mat-expanded');
  });

  it('links staff to the review workspace of ready clips only', async () => {
    create(detail({ clips: [clip(1, { status: 'ready', frameCount: 300 }), clip(2)] }));
    await fixture.whenStable();
    const links = [...element.querySelectorAll('app-clip-card')].map(
      (card) => card.querySelector('a.review-link')?.getAttribute('href') ?? null,
    );
    expect(links).toEqual(['/athletes/9/assessments/4/clips/1/review', null]);
  });

  it('gives athletes no review link', async () => {
    create(detail({ clips: [clip(1, { status: 'ready', frameCount: 300 })] }), 'athlete');
    await fixture.whenStable();
    expect(element.querySelector('a.review-link')).toBeNull();
  });

  it('lets an athlete delete only the clips they uploaded', async () => {
    create(detail({ clips: [clip(1), clip(2, { uploadedByName: 'Robin Coach', uploadedById: 99 })] }), 'athlete');
    await fixture.whenStable();
    const deletable = [...element.querySelectorAll('app-clip-card')].map((card) => !!card.querySelector('button.delete'));
    expect(deletable).toEqual([true, false]);
    expect(element.querySelector('app-clip-uploader')).not.toBeNull();
  });

  it('locks an athlete out of a marked clip’s settings and says why; staff keep them', async () => {
    create(
      detail({ clips: [clip(1, { status: 'ready', frameCount: 300, marked: true }), clip(2, { status: 'ready', frameCount: 300 })] }),
      'athlete',
    );
    await fixture.whenStable();
    const cards = [...element.querySelectorAll('app-clip-card')];
    const disabled = (card: Element) =>
      [...card.querySelectorAll('.settings button, .settings input')].map((b) => (b as HTMLButtonElement).disabled);
    expect(disabled(cards[0]!).every(Boolean)).toBe(true);
    expect(cards[0]!.querySelector('.settings-locked')?.textContent).toContain('Your clinician has marked this clip');
    expect(cards[0]!.querySelector('.settings')?.getAttribute('aria-describedby')).toBe('locked-1');
    expect(disabled(cards[1]!).some(Boolean)).toBe(false);
    expect(cards[1]!.querySelector('.settings-locked')).toBeNull();
  });

  it('leaves a marked clip’s settings to staff', async () => {
    create(detail({ clips: [clip(1, { status: 'ready', frameCount: 300, marked: true })] }), 'staff');
    await fixture.whenStable();
    const inputs = [...element.querySelectorAll('.settings button, .settings input')].map((b) => (b as HTMLButtonElement).disabled);
    expect(inputs.some(Boolean)).toBe(false);
    expect(element.querySelector('.settings-locked')).toBeNull();
  });
});
