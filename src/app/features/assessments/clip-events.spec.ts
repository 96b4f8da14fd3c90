import type { Clip } from '../../../contracts/api';
import type { ProcessingEvent } from '../../../contracts/processing';
import { clipListStep } from './clip-events';

const clip = (id: number, over: Partial<Clip> = {}) => ({ id, status: 'queued', progress: null, error: null, ...over }) as Clip;
const event = (over: Partial<ProcessingEvent>): ProcessingEvent => ({
  subject: 'clip',
  id: 1,
  kind: 'extract_frames',
  state: 'running',
  progress: null,
  error: null,
  ...over,
});

describe('clipListStep', () => {
  it('patches the progress of a shown clip in place', () => {
    const step = clipListStep([clip(1)], event({ progress: { done: 12, total: 240 } }));
    expect(step).toEqual({ kind: 'patch', clip: clip(1, { status: 'extracting', progress: { done: 12, total: 240 } }) });
  });

  it('fetches the clip on any other change, and a clip it does not show yet', () => {
    expect(clipListStep([clip(1)], event({ state: 'ready' }))).toEqual({ kind: 'fetch', id: 1 });
    expect(clipListStep([clip(1)], event({ state: 'failed', error: 'damaged' }))).toEqual({ kind: 'fetch', id: 1 });
    expect(clipListStep([clip(1)], event({ state: 'running' }))).toEqual({ kind: 'fetch', id: 1 });
    expect(clipListStep([clip(1)], event({ id: 2, progress: { done: 1, total: 2 } }))).toEqual({ kind: 'fetch', id: 2 });
  });

  it('drops a clip whose processing was cancelled (it is being deleted) and ignores other subjects', () => {
    expect(clipListStep([clip(1)], event({ state: 'cancelled' }))).toEqual({ kind: 'drop', id: 1 });
    expect(clipListStep([clip(1)], event({ subject: 'still' }))).toEqual({ kind: 'ignore' });
  });
});
