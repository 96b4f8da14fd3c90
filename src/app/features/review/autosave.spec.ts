import { conflictMessage, isRetryableStatus, retryDelayMs } from './autosave';

describe('retryDelayMs', () => {
  it('backs off exponentially up to 30 s', () => {
    const none = () => 0;
    expect([1, 2, 3, 4, 5, 6, 7].map((a) => retryDelayMs(a, none))).toEqual([1000, 2000, 4000, 8000, 16000, 30000, 30000]);
  });

  it('adds at most 20 % jitter', () => {
    expect(retryDelayMs(1, () => 0.999)).toBeLessThanOrEqual(1200);
    expect(retryDelayMs(1, () => 0.5)).toBe(1100);
  });
});

describe('isRetryableStatus', () => {
  it('retries network failures, rate limits and server faults only', () => {
    expect([0, null, 408, 429, 500, 502, 503].every(isRetryableStatus)).toBe(true);
    expect([400, 401, 403, 404, 409, 422].some(isRetryableStatus)).toBe(false);
  });
});

describe('conflictMessage', () => {
  it('says who saved and what happened to the local edits', () => {
    expect(conflictMessage('Robin Coach', 1, 0)).toBe('Robin Coach saved this clip meanwhile; your edit was put on top of theirs.');
    expect(conflictMessage(null, 3, 2)).toBe(
      'This clip was saved elsewhere meanwhile; your 3 edits were put on top of theirs. 2 of them replaced marks they changed too.',
    );
    expect(conflictMessage('Sam', 0, 0)).toBe('Sam saved this clip meanwhile; their marks are shown now.');
    expect(conflictMessage('Sam', 1, 0, true)).toBe(
      'You saved this clip in another tab or window meanwhile; your edit was put on top of that save.',
    );
  });
});
