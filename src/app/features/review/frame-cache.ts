import { signal } from '@angular/core';
import { Observable, Subscription } from 'rxjs';
import { CacheWindowOptions, CachedEntry, DEFAULT_CACHE_WINDOW, bitmapBytes, planCache } from './frame-cache-window';

/** Something that can be drawn and closed (an `ImageBitmap` in the browser). */
export interface DrawableFrame {
  readonly width: number;
  readonly height: number;
  close(): void;
}

export interface FrameCacheConfig<B extends DrawableFrame> {
  frameCount: number;
  /** Working frame size, for the approximate byte count. */
  width: number;
  height: number;
  /** Fetches frame n; unsubscribing aborts the request. */
  fetch: (n: number) => Observable<Blob>;
  /** Turns a fetched JPEG into a drawable bitmap. */
  decode: (blob: Blob) => Promise<B>;
  options?: Partial<CacheWindowOptions>;
}

interface Entry<B> extends CachedEntry {
  bitmap: B;
}

/**
 * Decoded frames around the current one. `setCurrent(n)` plans the window (see
 * `frame-cache-window.ts`): fetches the missing frames nearest first, aborts fetches that fell out
 * of the window and closes bitmaps beyond the limits. `get(n)` is synchronous, so stepping onto a
 * cached frame never waits for the network. `version` changes whenever a frame arrives or fails,
 * so the viewer knows to draw again.
 */
export class FrameCache<B extends DrawableFrame = ImageBitmap> {
  private readonly entries = new Map<number, Entry<B>>();
  /** Frames being fetched or decoded, each with the token of its attempt. */
  private readonly inFlight = new Map<number, { token: object; sub: Subscription | null }>();
  private readonly failed = new Set<number>();
  private readonly options: CacheWindowOptions;
  private readonly bytesPerFrame: number;
  private readonly version$ = signal(0);
  private clock = 0;
  private current = 0;
  private destroyed = false;
  /** Frames 0 … available − 1 exist on the server (fewer than `frameCount` while extraction runs). */
  private available: number;

  /** Changes whenever a frame arrives or fails to load. */
  readonly version = this.version$.asReadonly();

  constructor(private readonly config: FrameCacheConfig<B>) {
    this.options = { ...DEFAULT_CACHE_WINDOW, ...config.options };
    this.bytesPerFrame = bitmapBytes(config.width, config.height);
    this.available = config.frameCount;
  }

  /**
   * How many frames exist so far (they arrive in order while the clip is extracted), and the
   * clip's frame count once known for sure. Frames past them are never asked for.
   */
  setAvailable(available: number, frameCount = this.config.frameCount): void {
    this.config.frameCount = frameCount;
    this.available = Math.max(0, Math.min(available, frameCount));
    this.plan();
  }

  /** The decoded frame, or null when it is not cached yet. Marks it as just used. */
  get(n: number): B | null {
    const entry = this.entries.get(n);
    if (!entry) return null;
    entry.lastUsed = ++this.clock;
    return entry.bitmap;
  }

  has(n: number): boolean {
    return this.entries.has(n);
  }

  /** The cached frame nearest to `n`, preferring earlier frames (to show while `n` loads). */
  nearest(n: number): { frame: number; bitmap: B } | null {
    let best: number | null = null;
    for (const f of this.entries.keys()) {
      if (best === null || Math.abs(f - n) < Math.abs(best - n) || (Math.abs(f - n) === Math.abs(best - n) && f < best)) best = f;
    }
    return best === null ? null : { frame: best, bitmap: this.entries.get(best)!.bitmap };
  }

  isFailed(n: number): boolean {
    return this.failed.has(n);
  }

  isLoading(n: number): boolean {
    return this.inFlight.has(n);
  }

  /** How many frames are decoded and held. */
  get size(): number {
    return this.entries.size;
  }

  /** Moves the window to frame `n`. */
  setCurrent(n: number): void {
    this.current = n;
    this.plan();
  }

  /** Tries frames that failed again (all, or just `n`). */
  retry(n?: number): void {
    if (n === undefined) this.failed.clear();
    else this.failed.delete(n);
    this.plan();
  }

  /** Aborts every fetch and closes every bitmap. */
  destroy(): void {
    this.destroyed = true;
    for (const { sub } of this.inFlight.values()) sub?.unsubscribe();
    this.inFlight.clear();
    for (const e of this.entries.values()) e.bitmap.close();
    this.entries.clear();
  }

  private plan(): void {
    if (this.destroyed) return;
    const plan = planCache({
      current: Math.min(this.current, Math.max(0, this.available - 1)),
      frameCount: this.available,
      cached: this.entries,
      inFlight: new Set(this.inFlight.keys()),
      failed: this.failed,
      options: this.options,
    });
    for (const n of plan.abort) {
      this.inFlight.get(n)?.sub?.unsubscribe();
      this.inFlight.delete(n);
    }
    for (const n of plan.evict) {
      this.entries.get(n)?.bitmap.close();
      this.entries.delete(n);
    }
    for (const n of plan.fetch) this.start(n);
  }

  private start(n: number): void {
    const token = {};
    const attempt: { token: object; sub: Subscription | null } = { token, sub: null };
    this.inFlight.set(n, attempt);
    const stillWanted = () => !this.destroyed && this.inFlight.get(n)?.token === token;
    attempt.sub = this.config.fetch(n).subscribe({
      next: (blob) => {
        this.config.decode(blob).then(
          (bitmap) => {
            if (!stillWanted()) {
              bitmap.close();
              return;
            }
            this.inFlight.delete(n);
            this.entries.set(n, { bitmap, bytes: this.bytesPerFrame, lastUsed: ++this.clock });
            this.version$.update((v) => v + 1);
            this.plan();
          },
          () => this.fail(n, token),
        );
      },
      error: () => this.fail(n, token),
    });
  }

  private fail(n: number, token: object): void {
    if (this.destroyed || this.inFlight.get(n)?.token !== token) return;
    this.inFlight.delete(n);
    this.failed.add(n);
    this.version$.update((v) => v + 1);
    this.plan();
  }
}
