import { HttpErrorResponse } from '@angular/common/http';
import {
  ALREADY_HERE,
  UploadItem,
  addFiles,
  clearFinished,
  isBusy,
  markCancelled,
  markDone,
  markFailed,
  markProgress,
  markStarted,
  nextToStart,
  precheck,
  removeItem,
  requeue,
  uploadErrorMessage,
  uploadPercent,
  uploadStatusText,
} from './upload-queue';

function video(name: string, size = 1000, type = 'video/mp4'): File {
  return new File([new Uint8Array(size)], name, { type });
}

function queue(...files: File[]): UploadItem[] {
  return addFiles([], files, 1).items;
}

describe('precheck', () => {
  it('refuses a file over the server limit before sending it', () => {
    const big = { name: 'long.mp4', size: 3 * 1024 ** 3, type: 'video/mp4' };
    expect(precheck(big, 2 * 1024 ** 3)).toMatch(/larger than the 2\.0 GB upload limit/);
    expect(precheck(big, null)).toBeNull();
  });

  it('sends videos and files of unknown type to the server', () => {
    expect(precheck(video('run.mp4'))).toBeNull();
    expect(precheck(video('run.MOV', 10, 'video/quicktime'))).toBeNull();
    expect(precheck(video('clip', 10, ''))).toBeNull();
    expect(precheck(video('slowmo.mkv', 10, 'application/octet-stream'))).toBeNull();
  });

  it('refuses empty files and files that are clearly not video', () => {
    expect(precheck(video('empty.mp4', 0))).toMatch(/empty/);
    expect(precheck(video('photo.jpg', 10, 'image/jpeg'))).toMatch(/not a video/);
    expect(precheck(video('notes.pdf', 10, 'application/pdf'))).toMatch(/not a video/);
  });
});

describe('upload queue', () => {
  it('keeps every chosen file: refused ones fail with their reason, the rest wait in order', () => {
    const { items, nextId } = addFiles([], [video('a.mp4'), video('b.jpg', 10, 'image/jpeg'), video('c.mov')], 7);
    expect(items.map((i) => [i.id, i.name, i.state])).toEqual([
      [7, 'a.mp4', 'waiting'],
      [8, 'b.jpg', 'failed'],
      [9, 'c.mov', 'waiting'],
    ]);
    expect(items[1].message).toMatch(/not a video/);
    expect(nextId).toBe(10);
  });

  it('sends one file at a time, in order', () => {
    let items = queue(video('a.mp4'), video('b.mp4'));
    expect(nextToStart(items)?.name).toBe('a.mp4');
    items = markStarted(items, 1);
    expect(nextToStart(items)).toBeNull();
    items = markDone(items, 1, { id: 40 });
    expect(nextToStart(items)?.name).toBe('b.mp4');
    items = markStarted(items, 2);
    items = markFailed(items, 2, 'The file is larger than the upload limit.');
    expect(nextToStart(items)).toBeNull();
    expect(isBusy(items)).toBe(false);
    expect(items.map((i) => i.state)).toEqual(['done', 'failed']);
    expect(items[0].clipId).toBe(40);
  });

  it('tracks progress within the request total', () => {
    let items = markStarted(queue(video('a.mp4', 2000)), 1);
    items = markProgress(items, 1, 500, 2000);
    expect(uploadPercent(items[0])).toBe(25);
    expect(uploadStatusText(items[0])).toBe('Uploading… 25 %');
    items = markProgress(items, 1, 5000, 2000);
    expect(items[0].loaded).toBe(2000);
    items = markDone(items, 1, { id: 3 });
    expect(uploadPercent(items[0])).toBe(100);
  });

  it('cancels waiting or uploading items only, and lets them be sent again', () => {
    let items = queue(video('a.mp4'), video('b.mp4'));
    items = markStarted(items, 1);
    items = markCancelled(items, 1);
    items = markCancelled(items, 2);
    expect(items.map((i) => i.state)).toEqual(['cancelled', 'cancelled']);
    expect(isBusy(items)).toBe(false);
    items = requeue(items, 2);
    expect(items[1].state).toBe('waiting');
    expect(nextToStart(items)?.id).toBe(2);
    // Done items cannot be cancelled or re-sent.
    items = markDone(markStarted(items, 2), 2, { id: 9 });
    expect(markCancelled(items, 2)).toEqual(items);
    expect(requeue(items, 2)).toEqual(items);
  });

  it('ignores events for items not in the matching state', () => {
    const items = queue(video('a.mp4'));
    expect(markProgress(items, 1, 10, 1000)).toEqual(items); // not started yet
    expect(markDone(items, 1, { id: 1 })).toEqual(items);
    expect(markStarted(items, 99)).toEqual(items);
  });

  it('holds back a file with the name and size of a clip already here, and sends it only on "Upload anyway"', () => {
    const held = [{ originalName: 'run.mp4', sizeBytes: 1000 }];
    let { items } = addFiles([], [video('run.mp4'), video('run.mp4', 999), video('other.mp4')], 1, null, held);
    expect(items.map((i) => [i.name, i.state, i.duplicate])).toEqual([
      ['run.mp4', 'failed', true],
      ['run.mp4', 'waiting', false],
      ['other.mp4', 'waiting', false],
    ]);
    expect(uploadStatusText(items[0])).toBe(ALREADY_HERE);
    expect(nextToStart(items)?.id).toBe(2);
    items = requeue(items, 1);
    expect(items[0]).toMatchObject({ state: 'waiting', duplicate: false, message: null });
  });

  it('holds back the same file chosen again while it waits, uploads or is uploaded in the list', () => {
    let items = queue(video('a.mp4'));
    items = addFiles(items, [video('a.mp4')], 2).items;
    expect(items[1]).toMatchObject({ state: 'failed', duplicate: true });
    items = markDone(markStarted(items, 1), 1, { id: 7 });
    items = addFiles(items, [video('a.mp4')], 3).items;
    expect(items[2]).toMatchObject({ state: 'failed', duplicate: true });
    // Twice in one pick: the second is held back.
    expect(queue(video('b.mp4'), video('b.mp4')).map((i) => i.state)).toEqual(['waiting', 'failed']);
    // A cancelled or failed upload is no clip: choosing the file again sends it (and resumes).
    items = addFiles(markCancelled(queue(video('c.mp4')), 1), [video('c.mp4')], 2).items;
    expect(items[1]).toMatchObject({ state: 'waiting', duplicate: false });
  });

  it('a refused file stays refused when retried', () => {
    const items = queue(video('empty.mp4', 0));
    expect(requeue(items, 1)[0]).toMatchObject({ state: 'failed', message: expect.stringMatching(/empty/) });
  });

  it('removes only rows that are not in flight; "clear" keeps failures', () => {
    let items = queue(video('a.mp4'), video('b.mp4'), video('c.mp4'));
    items = markDone(markStarted(items, 1), 1, { id: 5 });
    items = markStarted(items, 2);
    expect(removeItem(items, 2)).toEqual(items);
    expect(removeItem(items, 3)).toEqual(items);
    items = markFailed(items, 2, 'Not a video.');
    items = markCancelled(items, 3);
    expect(clearFinished(items).map((i) => i.name)).toEqual(['b.mp4']);
    expect(removeItem(items, 2).map((i) => i.name)).toEqual(['a.mp4', 'c.mp4']);
  });
});

describe('uploadErrorMessage', () => {
  const http = (status: number, error: unknown = null) => new HttpErrorResponse({ status, error });

  it("prefers the server's own message", () => {
    const body = { error: { code: 'too_large', message: 'Clips can be at most 500 MB.' } };
    expect(uploadErrorMessage(http(413, body))).toBe('Clips can be at most 500 MB.');
    const consent = { error: { code: 'consent_required', message: 'Record video consent first.' } };
    expect(uploadErrorMessage(http(409, consent))).toBe('Record video consent first.');
  });

  it('explains a bare status', () => {
    expect(uploadErrorMessage(http(413, '<html>Request Entity Too Large</html>'))).toBe('This file is larger than the upload limit.');
    expect(uploadErrorMessage(http(422))).toBe('This file is not a video the server can read.');
    expect(uploadErrorMessage(http(409))).toMatch(/consent/);
    expect(uploadErrorMessage(http(0))).toMatch(/interrupted/);
    expect(uploadErrorMessage(http(500))).toMatch(/server ran into a problem/);
  });
});
