/**
 * Which frames to hold as decoded bitmaps around the current one, which to fetch next, which
 * fetches to abort and which bitmaps to drop. Pure: the frame cache calls this after every move
 * and carries the plan out.
 */

export interface CacheWindowOptions {
  /** Frames to keep ready after the current one (playback and stepping go forward most). */
  ahead: number;
  /** Frames to keep ready before it. */
  behind: number;
  /** Most bitmaps held. */
  maxEntries: number;
  /** Most bytes held (approximate: width × height × 4 per bitmap). */
  maxBytes: number;
  /** Most fetches running at once. */
  maxInFlight: number;
}

export const DEFAULT_CACHE_WINDOW: CacheWindowOptions = {
  ahead: 30,
  behind: 10,
  maxEntries: 90,
  // About 69 decoded 1280 × 720 frames: the 41-frame window with room to step back.
  maxBytes: 256 * 1024 * 1024,
  maxInFlight: 6,
};

export interface CachedEntry {
  bytes: number;
  /** When the bitmap was last drawn or stored (any increasing number). */
  lastUsed: number;
}

export interface CachePlanInput {
  current: number;
  frameCount: number;
  cached: ReadonlyMap<number, CachedEntry>;
  inFlight: ReadonlySet<number>;
  /** Frames whose fetch failed; not fetched again until the user asks. */
  failed?: ReadonlySet<number>;
  options: CacheWindowOptions;
}

export interface CachePlan {
  /** Start these fetches, in this order. */
  fetch: number[];
  /** Abort these fetches (they fell out of the window). */
  abort: number[];
  /** Close and forget these bitmaps. */
  evict: number[];
}

/**
 * The frames of the window in the order they are wanted: the current frame, then forward and
 * backward frames by distance, where a frame behind counts as far as `ahead / behind` frames ahead
 * (so both ends of the window fill up at the same time).
 */
export function windowFrames(current: number, frameCount: number, ahead: number, behind: number): number[] {
  if (frameCount <= 0) return [];
  const c = Math.min(Math.max(0, Math.round(current)), frameCount - 1);
  const weight = behind > 0 ? Math.max(1, ahead / behind) : 1;
  const items: { frame: number; cost: number }[] = [{ frame: c, cost: 0 }];
  for (let d = 1; d <= ahead && c + d < frameCount; d++) items.push({ frame: c + d, cost: d });
  for (let d = 1; d <= behind && c - d >= 0; d++) items.push({ frame: c - d, cost: d * weight });
  return items.sort((a, b) => a.cost - b.cost || b.frame - a.frame).map((i) => i.frame);
}

/** What to fetch, abort and evict for the current frame. */
export function planCache(input: CachePlanInput): CachePlan {
  const { current, frameCount, cached, inFlight, options } = input;
  const failed = input.failed ?? new Set<number>();
  const wanted = windowFrames(current, frameCount, options.ahead, options.behind);
  const wantedSet = new Set(wanted);

  const abort = [...inFlight].filter((f) => !wantedSet.has(f)).sort((a, b) => a - b);
  const stillRunning = inFlight.size - abort.length;
  const room = Math.max(0, options.maxInFlight - stillRunning);
  const missing = wanted.filter((f) => !cached.has(f) && !inFlight.has(f) && !failed.has(f));
  // The frame on screen is fetched even when every slot is busy; the rest wait for room.
  const fetch = missing.length > 0 && missing[0] === wanted[0] && room === 0 ? [missing[0]] : missing.slice(0, room);

  // Evict: first frames outside the window, least recently used first; then, if still over, the
  // window frames farthest from the current one (never the current frame).
  let count = cached.size;
  let bytes = 0;
  for (const e of cached.values()) bytes += e.bytes;
  const evict: number[] = [];
  const over = () => count > options.maxEntries || bytes > options.maxBytes;
  const outside = [...cached.entries()].filter(([f]) => !wantedSet.has(f)).sort((a, b) => a[1].lastUsed - b[1].lastUsed || a[0] - b[0]);
  for (const [f, e] of outside) {
    if (!over()) break;
    evict.push(f);
    count -= 1;
    bytes -= e.bytes;
  }
  if (over()) {
    const inside = [...wanted].reverse().filter((f) => f !== Math.round(current) && cached.has(f));
    for (const f of inside) {
      if (!over()) break;
      evict.push(f);
      count -= 1;
      bytes -= cached.get(f)!.bytes;
    }
  }
  return { fetch, abort, evict };
}

/** Approximate bytes of a decoded RGBA bitmap. */
export function bitmapBytes(width: number, height: number): number {
  return Math.max(1, width) * Math.max(1, height) * 4;
}
