import { CacheWindowOptions, CachedEntry, planCache, windowFrames } from './frame-cache-window';

const options: CacheWindowOptions = { ahead: 6, behind: 2, maxEntries: 100, maxBytes: 1e9, maxInFlight: 4 };

function cachedOf(frames: number[], bytes = 10, lastUsed = (f: number) => f): Map<number, CachedEntry> {
  return new Map(frames.map((f) => [f, { bytes, lastUsed: lastUsed(f) }]));
}

describe('windowFrames', () => {
  it('starts with the current frame and reaches both ends of the window together', () => {
    expect(windowFrames(10, 100, 6, 2)).toEqual([10, 11, 12, 13, 9, 14, 15, 16, 8]);
  });

  it('stays inside the clip', () => {
    expect(windowFrames(0, 5, 6, 2)).toEqual([0, 1, 2, 3, 4]);
    expect(windowFrames(4, 5, 6, 2)).toEqual([4, 3, 2]);
    expect(windowFrames(99, 5, 2, 2)).toEqual([4, 3, 2]);
    expect(windowFrames(0, 0, 6, 2)).toEqual([]);
  });
});

describe('planCache', () => {
  it('fetches the nearest missing frames first, up to the in-flight limit', () => {
    const plan = planCache({ current: 10, frameCount: 100, cached: cachedOf([10, 12]), inFlight: new Set([11]), options });
    expect(plan.fetch).toEqual([13, 9, 14]);
    expect(plan.abort).toEqual([]);
    expect(plan.evict).toEqual([]);
  });

  it('aborts fetches that fell out of the window and reuses their slots', () => {
    const plan = planCache({ current: 50, frameCount: 100, cached: new Map(), inFlight: new Set([11, 12, 51]), options });
    expect(plan.abort).toEqual([11, 12]);
    expect(plan.fetch).toEqual([50, 52, 53]);
  });

  it('fetches the frame on screen even when every slot is busy', () => {
    const plan = planCache({ current: 10, frameCount: 100, cached: new Map(), inFlight: new Set([11, 12, 13, 9]), options });
    expect(plan.fetch).toEqual([10]);
    const busy = planCache({ current: 10, frameCount: 100, cached: cachedOf([10]), inFlight: new Set([11, 12, 13, 9]), options });
    expect(busy.fetch).toEqual([]);
  });

  it('does not fetch frames that failed', () => {
    const plan = planCache({ current: 0, frameCount: 3, cached: new Map(), inFlight: new Set(), failed: new Set([0]), options });
    expect(plan.fetch).toEqual([1, 2]);
  });

  it('evicts least recently used frames outside the window when over the entry limit', () => {
    const cached = cachedOf([1, 2, 3, 40, 41], 10, (f) => (f === 1 ? 99 : f));
    const plan = planCache({ current: 40, frameCount: 100, cached, inFlight: new Set(), options: { ...options, maxEntries: 3 } });
    expect(plan.evict).toEqual([2, 3]);
  });

  it('evicts by approximate bytes too', () => {
    const cached = cachedOf([1, 2, 3, 40], 100);
    const plan = planCache({ current: 40, frameCount: 100, cached, inFlight: new Set(), options: { ...options, maxBytes: 250 } });
    expect(plan.evict).toEqual([1, 2]);
  });

  it('drops window frames farthest away when the window alone is too big, never the current one', () => {
    const cached = cachedOf([8, 9, 10, 11, 12, 13, 14, 15, 16]);
    const plan = planCache({ current: 10, frameCount: 100, cached, inFlight: new Set(), options: { ...options, maxEntries: 4 } });
    expect(plan.evict).toEqual([8, 16, 15, 14, 9]);
    expect(plan.evict).not.toContain(10);
  });
});
