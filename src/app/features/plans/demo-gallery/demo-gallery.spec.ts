import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import type { DemoClip, DemoPicture } from '../../../../contracts/demonstrations';
import { DemoGallery } from './demo-gallery';
import { flushApiError } from '../../../shared/testing/api-errors';

const picture = (id: number, position: number, caption: string): DemoPicture => ({
  id,
  exerciseId: 4,
  position,
  caption,
  url: `/api/demo-pictures/${id}/picture.jpg`,
  thumbUrl: `/api/demo-pictures/${id}/thumb.jpg`,
  width: 1000,
  height: 750,
  createdAt: '2026-12-04T10:00:00Z',
});

const wait = (ms: number) => new Promise((r) => setTimeout(r, ms));

describe('DemoGallery', () => {
  let fixture: ComponentFixture<DemoGallery>;
  let element: HTMLElement;
  let backend: HttpTestingController;

  beforeEach(async () => {
    // jsdom has no element scrolling; the gallery's smooth scroll is a no-op here.
    Element.prototype.scrollTo ??= function () {};
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(DemoGallery);
    fixture.componentRef.setInput('exerciseId', 4);
    fixture.componentRef.setInput('exerciseName', 'Heel drop');
    element = fixture.nativeElement;
    fixture.detectChanges();
    await wait(10);
  });
  const settle = async () => {
    await wait(20);
    fixture.detectChanges();
    await fixture.whenStable();
    fixture.detectChanges();
  };
  afterEach(() => backend.verify());

  it("says why the pictures could not be loaded, with Try again; a 404 (not on this athlete's plans) shows nothing", async () => {
    flushApiError(backend.expectOne('/api/exercises/4/demonstrations'), 503, 'The server is busy.');
    await settle();
    const alert = element.querySelector('[role="alert"]')!;
    expect(alert.textContent).toContain("Couldn't load the pictures of Heel drop: The server is busy.");
    alert.querySelector('button')!.click();
    await wait(20);
    fixture.detectChanges();
    flushApiError(backend.expectOne('/api/exercises/4/demonstrations'), 404, 'Not found');
    await settle();
    expect(element.querySelector('[role="alert"]')).toBeNull();
    expect(element.querySelector('section')).toBeNull();
  });

  it('shows nothing when the exercise has no pictures', async () => {
    backend.expectOne('/api/exercises/4/demonstrations').flush({ exerciseId: 4, pictures: [] });
    await settle();
    expect(element.querySelector('section')).toBeNull();
  });

  it('shows nothing when the caller may not see them (404)', async () => {
    flushApiError(backend.expectOne('/api/exercises/4/demonstrations'), 404, 'Exercise not found.');
    await settle();
    expect(element.querySelector('section')).toBeNull();
  });

  it('shows the pictures in order with captions, the first as "Picture 1 of 2", and steps with the buttons', async () => {
    backend.expectOne('/api/exercises/4/demonstrations').flush({
      exerciseId: 4,
      pictures: [picture(9, 0, 'Start on the toes'), picture(7, 1, 'Lower slowly')],
    });
    await fixture.whenStable();
    const imgs = [...element.querySelectorAll('img')];
    expect(imgs.map((i) => i.getAttribute('src'))).toEqual(['/api/demo-pictures/9/picture.jpg', '/api/demo-pictures/7/picture.jpg']);
    expect(imgs.map((i) => i.getAttribute('alt'))).toEqual(['Start on the toes', 'Lower slowly']);
    expect([...element.querySelectorAll('figcaption')].map((f) => f.textContent?.trim())).toEqual(['Start on the toes', 'Lower slowly']);
    const track = element.querySelector('.track')!;
    expect(track.getAttribute('aria-label')).toBe('Picture 1 of 2');
    const previous = element.querySelector<HTMLButtonElement>('button[aria-label="Previous picture"]')!;
    const next = element.querySelector<HTMLButtonElement>('button[aria-label="Next picture"]')!;
    expect(previous.disabled).toBe(true);
    next.click();
    await settle();
    expect(track.getAttribute('aria-label')).toBe('Picture 2 of 2');
    expect(next.disabled).toBe(true);
  });

  it('shows a ready clip in its place: inline, looped, muted, with its poster and caption', async () => {
    backend.expectOne('/api/exercises/4/demonstrations').flush({
      exerciseId: 4,
      pictures: [picture(9, 0, 'Start on the toes'), picture(7, 1, 'Lower slowly')],
      clip: {
        id: 3,
        exerciseId: 4,
        position: 1,
        caption: 'Three seconds down',
        status: 'ready',
        error: null,
        durationS: 6,
        width: 1280,
        height: 720,
        videoUrl: '/api/demo-clips/3/video.mp4?v=1',
        posterUrl: '/api/demo-clips/3/poster.jpg?v=1',
        createdAt: '2026-12-04T10:00:00Z',
      } satisfies DemoClip,
    });
    await settle();
    const slides = [...element.querySelectorAll('figure')];
    expect(slides.map((f) => (f.querySelector('video') ? 'clip' : 'picture'))).toEqual(['picture', 'clip', 'picture']);
    const video = element.querySelector('video')!;
    expect(video.getAttribute('src')).toBe('/api/demo-clips/3/video.mp4?v=1');
    expect(video.getAttribute('poster')).toBe('/api/demo-clips/3/poster.jpg?v=1');
    expect(video.muted).toBe(true);
    expect(video.hasAttribute('loop')).toBe(true);
    expect(video.hasAttribute('playsinline')).toBe(true);
    expect(slides[1]!.querySelector('figcaption')!.textContent!.trim()).toBe('Three seconds down');
    expect(element.querySelector('.track')!.getAttribute('aria-label')).toBe('Picture 1 of 3');
  });

  it('has no step buttons for a single picture', async () => {
    backend.expectOne('/api/exercises/4/demonstrations').flush({ exerciseId: 4, pictures: [picture(9, 0, '')] });
    await settle();
    expect(element.querySelectorAll('img').length).toBe(1);
    expect(element.querySelector('img')!.getAttribute('alt')).toBe('Heel drop, picture 1');
    expect(element.querySelector('button')).toBeNull();
  });
});
