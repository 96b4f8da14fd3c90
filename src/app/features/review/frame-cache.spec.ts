import { Observable, Subject } from 'rxjs';
import { FrameCache } from './frame-cache';

class FakeBitmap {
  closed = false;
  constructor(
    readonly frame: number,
    readonly width = 4,
    readonly height = 2,
  ) {}
  close(): void {
    this.closed = true;
  }
}

function setup(frameCount = 100, options = { ahead: 3, behind: 1, maxInFlight: 2, maxEntries: 6 }) {
  const requests = new Map<number, Subject<Blob>>();
  const aborted: number[] = [];
  const cache = new FrameCache<FakeBitmap>({
    frameCount,
    width: 4,
    height: 2,
    fetch: (n) => {
      const s = new Subject<Blob>();
      requests.set(n, s);
      return new Observable<Blob>((subscriber) => {
        let settled = false;
        const inner = s.subscribe({
          next: (b) => subscriber.next(b),
          error: (e) => {
            settled = true;
            subscriber.error(e);
          },
          complete: () => {
            settled = true;
            subscriber.complete();
          },
        });
        return () => {
          if (!settled) aborted.push(n);
          inner.unsubscribe();
        };
      });
    },
    decode: (blob) => Promise.resolve(new FakeBitmap(Number(blob.type.split('/')[1]))),
    options,
  });
  const answer = async (n: number) => {
    const s = requests.get(n)!;
    s.next(new Blob([], { type: `image/${n}` }));
    s.complete();
    await Promise.resolve();
    await Promise.resolve();
  };
  return { cache, requests, aborted, answer };
}

describe('FrameCache', () => {
  it('fetches the current frame first and hands out decoded frames synchronously', async () => {
    const { cache, requests, answer } = setup();
    cache.setCurrent(10);
    expect([...requests.keys()]).toEqual([10, 11]);
    expect(cache.get(10)).toBeNull();
    await answer(10);
    expect(cache.get(10)?.frame).toBe(10);
    expect(cache.version()).toBe(1);
    // Finishing one fetch starts the next in the window.
    expect([...requests.keys()]).toEqual([10, 11, 12]);
  });

  it('aborts fetches that fall out of the window', async () => {
    const { cache, aborted } = setup();
    cache.setCurrent(10);
    cache.setCurrent(60);
    expect(aborted.sort()).toEqual([10, 11]);
    expect(cache.isLoading(60)).toBe(true);
  });

  it('closes bitmaps beyond the entry limit, least recently used first', async () => {
    const { cache, answer } = setup(100, { ahead: 1, behind: 0, maxInFlight: 2, maxEntries: 2 });
    cache.setCurrent(0);
    await answer(0);
    await answer(1);
    const first = cache.get(0)!;
    cache.setCurrent(50);
    await answer(50);
    await answer(51);
    expect(first.closed).toBe(true);
    expect(cache.size).toBe(2);
  });

  it('remembers failed frames until asked to retry', async () => {
    const { cache, requests } = setup();
    cache.setCurrent(5);
    requests.get(5)!.error(new Error('offline'));
    expect(cache.isFailed(5)).toBe(true);
    expect(cache.version()).toBe(1);
    requests.clear();
    cache.setCurrent(5);
    expect(requests.has(5)).toBe(false);
    cache.retry(5);
    expect(requests.has(5)).toBe(true);
  });

  it('finds the nearest cached frame to show while one loads', async () => {
    const { cache, answer } = setup();
    cache.setCurrent(10);
    await answer(10);
    expect(cache.nearest(12)?.frame).toBe(10);
  });

  it('closes everything on destroy', async () => {
    const { cache, answer, aborted } = setup();
    cache.setCurrent(10);
    await answer(10);
    const bitmap = cache.get(10)!;
    cache.destroy();
    expect(bitmap.closed).toBe(true);
    expect(aborted).toContain(11);
  });
});
