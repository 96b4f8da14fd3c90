import type { Clip } from '../../contracts/api';
import {
  clipFacts,
  clipStatusView,
  formatBytes,
  formatDuration,
  imageBox,
  isProcessing,
  isReviewable,
  readCaptureFps,
} from './clip-status';

function clip(overrides: Partial<Clip> = {}): Clip {
  return {
    id: 1,
    assessmentId: 2,
    athleteId: 3,
    originalName: 'run.mov',
    sizeBytes: 14_200_000,
    status: 'ready',
    progress: null,
    error: null,
    nearSide: 'left',
    direction: 'left_to_right',
    captureFps: null,
    fps: 30,
    effectiveFps: 30,
    width: 1280,
    height: 720,
    frameCount: 300,
    durationS: 10,
    rotation: 0,
    codec: 'h264',
    thumbCount: 30,
    thumbEvery: 10,
    uploadedByName: 'Robin Coach',
    uploadedById: 3,
    marked: false,
    createdAt: '2025-03-01T10:00:00Z',
    ...overrides,
  };
}

describe('clipStatusView', () => {
  it('walks queued → probing → extracting n/N → ready', () => {
    expect(clipStatusView(clip({ status: 'queued' }))).toMatchObject({ label: 'Queued', tone: 'working', bar: { mode: 'query' } });
    expect(clipStatusView(clip({ status: 'probing' }))).toMatchObject({ label: 'Checking video', bar: { mode: 'indeterminate' } });
    expect(clipStatusView(clip({ status: 'extracting', progress: { done: 120, total: 480 } }))).toEqual({
      label: 'Extracting frames',
      detail: 'Frame 120 of 480 (25 %)',
      tone: 'working',
      bar: { mode: 'determinate', percent: 25 },
    });
    expect(clipStatusView(clip({ status: 'ready', frameCount: 2400 }))).toEqual({
      label: 'Ready',
      detail: '2,400 frames ready',
      tone: 'ready',
      bar: null,
    });
  });

  it('shows extraction without a known total as indeterminate and clamps odd counts', () => {
    expect(clipStatusView(clip({ status: 'extracting', progress: null })).bar).toEqual({ mode: 'indeterminate' });
    expect(clipStatusView(clip({ status: 'extracting', progress: { done: 0, total: 0 } })).bar).toEqual({ mode: 'indeterminate' });
    expect(clipStatusView(clip({ status: 'extracting', progress: { done: 510, total: 500 } })).bar).toEqual({
      mode: 'determinate',
      percent: 100,
    });
  });

  it("gives a failure the server's reason, or a plain fallback", () => {
    expect(clipStatusView(clip({ status: 'failed', error: 'The video has no frames we can read.' }))).toMatchObject({
      label: 'Failed',
      detail: 'The video has no frames we can read.',
      tone: 'failed',
      bar: null,
    });
    expect(clipStatusView(clip({ status: 'failed', error: null })).detail).toBe('Processing failed.');
  });

  it('opens the review once the first frames exist, before extraction ends', () => {
    expect(isReviewable(clip({ status: 'ready' }))).toBe(true);
    expect(isReviewable(clip({ status: 'extracting', progress: { done: 1, total: 240 } }))).toBe(true);
    expect(isReviewable(clip({ status: 'extracting', progress: { done: 0, total: 240 } }))).toBe(false);
    expect(isReviewable(clip({ status: 'queued' }))).toBe(false);
    expect(isReviewable(clip({ status: 'failed' }))).toBe(false);
  });

  it('knows which states are still processing', () => {
    expect(['queued', 'probing', 'extracting', 'ready', 'failed'].map((s) => isProcessing(s as Clip['status']))).toEqual([
      true,
      true,
      true,
      false,
      false,
    ]);
  });
});

describe('clip facts', () => {
  it('formats sizes and durations for people', () => {
    expect(formatBytes(820)).toBe('820 B');
    expect(formatBytes(14_200_000)).toBe('14.2 MB');
    expect(formatBytes(1_310_000_000)).toBe('1.31 GB');
    expect(formatDuration(8.44)).toBe('8.4 s');
    expect(formatDuration(62.5)).toBe('1:02.5 min');
  });

  it('names the timing rate only when it differs from the file', () => {
    const plain = clipFacts(clip()).map((f) => f.label);
    expect(plain).toEqual(['File frame rate', 'Frames', 'Duration', 'Frame size', 'File size']);
    const slowMotion = clipFacts(clip({ fps: 30, captureFps: 240, effectiveFps: 240 }));
    expect(slowMotion.slice(0, 2)).toEqual([
      { label: 'File frame rate', value: '30 fps' },
      { label: 'Timing uses', value: '240 fps' },
    ]);
  });

  it('leaves out what is not probed yet', () => {
    const early = clipFacts(
      clip({ status: 'queued', fps: null, effectiveFps: null, frameCount: null, durationS: null, width: null, height: null }),
    );
    expect(early).toEqual([{ label: 'File size', value: '14.2 MB' }]);
  });

  it('sizes images to the clip aspect, 16:9 until probed', () => {
    expect(imageBox(clip({ width: 720, height: 1280 }), 160)).toEqual({ width: 90, height: 160 });
    expect(imageBox(clip({ width: null, height: null }), 90)).toEqual({ width: 160, height: 90 });
  });
});

describe('readCaptureFps', () => {
  it('reads an override within the limits, or none when empty', () => {
    expect(readCaptureFps('240')).toEqual({ value: 240 });
    expect(readCaptureFps(' 119,88 ')).toEqual({ value: 119.88 });
    expect(readCaptureFps('')).toEqual({ value: null });
  });

  it('explains what is wrong', () => {
    expect(readCaptureFps('fast')).toEqual({ error: 'Enter a number of frames per second, e.g. 240' });
    expect(readCaptureFps('0')).toEqual({ error: 'Enter 1 to 1000 fps' });
    expect(readCaptureFps('1200')).toEqual({ error: 'Enter 1 to 1000 fps' });
  });
});
