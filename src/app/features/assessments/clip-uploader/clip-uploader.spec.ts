import { HttpEventType, provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import type { Clip } from '../../../../contracts/api';
import { ClipUploader } from './clip-uploader';

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
  let backend: HttpTestingController;
  let uploaded: Clip[];

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [ClipUploader],
      providers: [provideHttpClient(), provideHttpClientTesting()],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ClipUploader);
    fixture.componentRef.setInput('assessmentId', 4);
    uploaded = [];
    fixture.componentInstance.uploaded.subscribe((c) => uploaded.push(c));
    element = fixture.nativeElement;
    fixture.detectChanges();
  });

  afterEach(() => backend.verify());

  const rows = () =>
    [...element.querySelectorAll('li.upload')].map((li) => ({
      name: li.querySelector('.upload-name')?.textContent?.trim(),
      status: li.querySelector('.upload-status')?.textContent?.trim(),
    }));
  const button = (label: string) =>
    [...element.querySelectorAll<HTMLButtonElement>('button')].find((b) => b.textContent?.replace(/\s+/g, ' ').trim().endsWith(label))!;
  const uploads = () => backend.match((r) => r.url === '/api/assessments/4/clips');

  it('offers the camera and a multi-file picker', () => {
    const inputs = [...element.querySelectorAll<HTMLInputElement>('input[type="file"]')];
    expect(inputs.map((i) => [i.getAttribute('accept'), i.getAttribute('capture'), i.multiple])).toEqual([
      ['video/*', 'environment', false],
      ['video/*,.mp4,.mov,.m4v,.webm,.mkv,.avi,.3gp', null, true],
    ]);
    expect(button('Record with camera')).toBeTruthy();
    expect(button('Choose files')).toBeTruthy();
  });

  it('sends files one at a time with their own progress, and lists a refused file with its reason', () => {
    fixture.componentInstance.addFiles([video('first.mp4'), video('photo.jpg', 10, 'image/jpeg'), video('second.mov')]);
    fixture.detectChanges();

    const [first, ...others] = uploads();
    expect(others).toEqual([]); // one request at a time
    expect(first.request.method).toBe('POST');
    expect((first.request.body as FormData).get('file')).toBeInstanceOf(File);
    expect(first.request.reportProgress).toBe(true);
    expect(rows()).toEqual([
      { name: 'first.mp4', status: 'Uploading… 0 %' },
      { name: 'photo.jpg', status: 'This is not a video file. Choose a video (for example MP4, MOV or WebM).' },
      { name: 'second.mov', status: 'Waiting to upload' },
    ]);

    first.event({ type: HttpEventType.UploadProgress, loaded: 400, total: 1000 });
    fixture.detectChanges();
    expect(rows()[0].status).toBe('Uploading… 40 %');
    expect(element.querySelector('mat-progress-bar')?.getAttribute('aria-valuenow')).toBe('40');

    first.flush(clip(21, 'first.mp4'), { status: 201, statusText: 'Created' });
    fixture.detectChanges();
    expect(uploaded.map((c) => c.id)).toEqual([21]);
    expect(rows()[0].status).toBe('Uploaded — processing shown below');

    const [second] = uploads();
    second.flush({ error: { code: 'too_large', message: 'Clips can be at most 2 GB.' } }, { status: 413, statusText: 'Payload Too Large' });
    fixture.detectChanges();
    expect(rows()[2].status).toBe('Clips can be at most 2 GB.');
    expect(fixture.componentInstance.busy()).toBe(false);
  });

  it('cancels the upload in flight and moves on to the next file', () => {
    fixture.componentInstance.addFiles([video('a.mp4'), video('b.mp4')]);
    fixture.detectChanges();
    const [a] = uploads();
    expect(fixture.componentInstance.busy()).toBe(true);
    button('Cancel').click();
    fixture.detectChanges();
    expect(a.cancelled).toBe(true);
    expect(rows()[0].status).toBe('Cancelled');
    const [b] = uploads();
    expect(b).toBeTruthy();
    b.flush(clip(22, 'b.mp4'));
    fixture.detectChanges();
    expect(uploaded.map((c) => c.originalName)).toEqual(['b.mp4']);

    // A cancelled file can be sent again.
    button('Upload again').click();
    fixture.detectChanges();
    const [again] = uploads();
    again.flush(clip(23, 'a.mp4'));
    fixture.detectChanges();
    expect(uploaded.map((c) => c.id)).toEqual([22, 23]);
    button('Clear finished').click();
    fixture.detectChanges();
    expect(rows()).toEqual([]);
  });
});
