import { HttpErrorResponse, provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { Observable, Subject } from 'rxjs';
import type { Clip } from '../../../../contracts/api';
import { ResumableClipUploads, type UploadEvent } from '../../../core/data/resumable-clip-uploads';
import { ClipUploader } from './clip-uploader';

/** One upload the uploader started through the (fake) resumable transport. */
interface Sent {
  assessmentId: number;
  file: File;
  events: Subject<UploadEvent>;
  /** Whether the uploader stopped listening (unsubscribed). */
  stopped: boolean;
  /** Whether the uploader asked the server to drop what it holds. */
  discarded: boolean;
}

/** Stands in for tus-js-client: each upload is a subject the test drives. */
class FakeUploads {
  readonly sent: Sent[] = [];
  upload(assessmentId: number, file: File) {
    const sent: Sent = { assessmentId, file, events: new Subject<UploadEvent>(), stopped: false, discarded: false };
    this.sent.push(sent);
    return {
      events: new Observable<UploadEvent>((subscriber) => {
        const subscription = sent.events.subscribe(subscriber);
        return () => {
          sent.stopped = true;
          subscription.unsubscribe();
        };
      }),
      discard: () => (sent.discarded = true),
    };
  }
}

function video(name: string, size = 1000, type = 'video/mp4'): File {
  return new File([new Uint8Array(size)], name, { type });
}

function clip(id: number, originalName: string): Clip {
  return {
    id,
    assessmentId: 4,
    athleteId: 9,
    originalName,
    sizeBytes: 1000,
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
    uploadedByName: 'Robin Coach',
    uploadedById: 3,
    marked: false,
    createdAt: '2025-03-14T10:00:00Z',
  };
}

describe('ClipUploader', () => {
  let fixture: ComponentFixture<ClipUploader>;
  let element: HTMLElement;
  let fake: FakeUploads;
  let uploaded: Clip[];

  beforeEach(async () => {
    fake = new FakeUploads();
    TestBed.configureTestingModule({
      imports: [ClipUploader],
      providers: [provideHttpClient(), provideHttpClientTesting(), { provide: ResumableClipUploads, useValue: fake }],
    });
    fixture = TestBed.createComponent(ClipUploader);
    fixture.componentRef.setInput('assessmentId', 4);
    uploaded = [];
    fixture.componentInstance.uploaded.subscribe((c) => uploaded.push(c));
    element = fixture.nativeElement;
    fixture.detectChanges();
  });

  const rows = () =>
    [...element.querySelectorAll('li.upload')].map((li) => ({
      name: li.querySelector('.upload-name')?.textContent?.trim(),
      status: li.querySelector('.upload-status')?.textContent?.trim(),
    }));
  const button = (label: string) =>
    [...element.querySelectorAll<HTMLButtonElement>('button')].find((b) => b.textContent?.replace(/\s+/g, ' ').trim().endsWith(label))!;
  /** Uploads still being listened to. */
  const uploads = () => fake.sent.filter((u) => !u.stopped);

  it('offers the camera and a multi-file picker', () => {
    const inputs = [...element.querySelectorAll<HTMLInputElement>('input[type="file"]')];
    expect(inputs.map((i) => [i.getAttribute('accept'), i.getAttribute('capture'), i.multiple])).toEqual([
      ['video/*', 'environment', false],
      ['video/*,.mp4,.mov,.m4v,.webm,.mkv,.avi,.3gp', null, true],
    ]);
    expect(button('Record with camera')).toBeTruthy();
    expect(button('Choose files')).toBeTruthy();
  });

  it('brings the list with the new upload’s progress into view (on a phone it opens below the screen edge)', async () => {
    const scrolled: Element[] = [];
    const original = Element.prototype.scrollIntoView;
    Element.prototype.scrollIntoView = function (this: Element) {
      scrolled.push(this);
    };
    try {
      fixture.componentInstance.addFiles([video('first.mp4')]);
      fixture.detectChanges();
      await fixture.whenStable();
      expect(scrolled).toEqual([element.querySelector('ul.uploads')]);
    } finally {
      Element.prototype.scrollIntoView = original;
    }
  });

  it('sends files one at a time with their own progress, and lists a refused file with its reason', () => {
    fixture.componentInstance.addFiles([video('first.mp4'), video('photo.jpg', 10, 'image/jpeg'), video('second.mov')]);
    fixture.detectChanges();

    const [first, ...others] = uploads();
    expect(others).toEqual([]); // one upload at a time
    expect(first.assessmentId).toBe(4);
    expect(first.file.name).toBe('first.mp4');
    expect(rows()).toEqual([
      { name: 'first.mp4', status: 'Uploading… 0 %' },
      { name: 'photo.jpg', status: 'This is not a video file. Choose a video (for example MP4, MOV or WebM).' },
      { name: 'second.mov', status: 'Waiting to upload' },
    ]);

    first.events.next({ type: 'progress', loaded: 400, total: 1000 });
    fixture.detectChanges();
    expect(rows()[0].status).toBe('Uploading… 40 %');
    expect(element.querySelector('mat-progress-bar')?.getAttribute('aria-valuenow')).toBe('40');

    first.events.next({ type: 'done', clip: clip(21, 'first.mp4') });
    first.events.complete();
    fixture.detectChanges();
    expect(uploaded.map((c) => c.id)).toEqual([21]);
    expect(rows()[0].status).toBe('Uploaded — processing shown below');

    const [second] = uploads();
    expect(second.file.name).toBe('second.mov');
    second.events.error(
      new HttpErrorResponse({ status: 413, error: { error: { code: 'file_too_large', message: 'Clips can be at most 2 GB.' } } }),
    );
    fixture.detectChanges();
    expect(rows()[2].status).toBe('Clips can be at most 2 GB.');
    expect(fixture.componentInstance.busy()).toBe(false);
  });

  it('shows a dropped connection as reconnecting with what is kept, then uploading again', () => {
    fixture.componentInstance.addFiles([video('long.mp4')]);
    fixture.detectChanges();
    const [u] = uploads();
    u.events.next({ type: 'progress', loaded: 300, total: 1000 });
    u.events.next({ type: 'reconnecting' });
    fixture.detectChanges();
    expect(rows()[0].status).toBe('Connection lost — reconnecting… (30 % kept)');
    expect(fixture.componentInstance.busy()).toBe(true);
    // Bytes a failing attempt pushes out do not mean the connection is back; the server answering does.
    u.events.next({ type: 'progress', loaded: 350, total: 1000 });
    fixture.detectChanges();
    expect(rows()[0].status).toBe('Connection lost — reconnecting… (35 % kept)');
    u.events.next({ type: 'reconnected' });
    u.events.next({ type: 'progress', loaded: 500, total: 1000 });
    fixture.detectChanges();
    expect(rows()[0].status).toBe('Uploading… 50 %');
  });

  it('says when it continues an upload of the same file begun before a reload', () => {
    fixture.componentInstance.addFiles([video('long.mp4')]);
    fixture.detectChanges();
    const [u] = uploads();
    u.events.next({ type: 'resumed' });
    u.events.next({ type: 'progress', loaded: 600, total: 1000 });
    fixture.detectChanges();
    expect(rows()[0].status).toBe('Resuming… 60 %');
  });

  it('a connection that never comes back fails with a way to continue', () => {
    fixture.componentInstance.addFiles([video('long.mp4')]);
    fixture.detectChanges();
    uploads()[0].events.error(new HttpErrorResponse({ status: 0, error: null }));
    fixture.detectChanges();
    expect(rows()[0].status).toBe(
      "The upload was interrupted: can't reach the server. What was sent is kept: try again (or choose the same file) to continue.",
    );
    expect(button('Try again')).toBeTruthy();
  });

  it('cancels the upload in flight (the server drops what it holds) and moves on to the next file', () => {
    fixture.componentInstance.addFiles([video('a.mp4'), video('b.mp4')]);
    fixture.detectChanges();
    const [a] = uploads();
    expect(fixture.componentInstance.busy()).toBe(true);
    button('Cancel').click();
    fixture.detectChanges();
    expect(a.stopped).toBe(true);
    expect(a.discarded).toBe(true);
    expect(rows()[0].status).toBe('Cancelled');
    const [b] = uploads();
    expect(b.file.name).toBe('b.mp4');
    b.events.next({ type: 'done', clip: clip(22, 'b.mp4') });
    b.events.complete();
    fixture.detectChanges();
    expect(uploaded.map((c) => c.originalName)).toEqual(['b.mp4']);

    // A cancelled file can be sent again.
    button('Upload again').click();
    fixture.detectChanges();
    const [again] = uploads();
    again.events.next({ type: 'done', clip: clip(23, 'a.mp4') });
    again.events.complete();
    fixture.detectChanges();
    expect(uploaded.map((c) => c.id)).toEqual([22, 23]);
    button('Clear finished').click();
    fixture.detectChanges();
    expect(rows()).toEqual([]);
  });

  it('leaving the page stops sending but keeps the upload for later (no discard)', () => {
    fixture.componentInstance.addFiles([video('a.mp4')]);
    fixture.detectChanges();
    const [a] = uploads();
    fixture.destroy();
    expect(a.stopped).toBe(true);
    expect(a.discarded).toBe(false);
  });
});
