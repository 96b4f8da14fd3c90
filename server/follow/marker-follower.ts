/**
 * Follows high-contrast tape markers from the frame where a coach placed them, forward and
 * backward over a frame range. Each step: pyramidal Lucas–Kanade optical flow (OpenCV) on a patch
 * around the marker, checked by flowing back (forward–backward error), then refined on the
 * marker's own patch: template match against the marker as placed (normalised cross-correlation)
 * and the centroid of the dot. Every point gets a confidence 0–1; a marker that stops looking like
 * itself (covered by the other leg, out of frame) gets a low confidence or none at all, never a
 * confident wrong point, and is searched for again around where it should be. Points a person
 * placed inside the range are never replaced: following re-anchors on them. Pure apart from
 * OpenCV (no files, no database).
 */
import type { Point } from '../../src/kinematics/geometry';
import { copyPatch, dotCentroid, patchOrigin, scorePeak, type DotFit, type GrayFrame } from './gray-frame';
import type { CvMat, OpenCv } from './opencv';

/** Reads decoded grey frames by index (sequentially forward, then backward, in practice). */
export interface FrameReader {
  frameCount: number;
  width: number;
  height: number;
  read(index: number): Promise<GrayFrame>;
}

/** One marker to follow and where it is on the start frame, px. */
export interface FollowMarker {
  key: string;
  start: Point;
}

/** What to follow and over which frames. */
export interface FollowRequest {
  /** Frame on which `markers` are given (inside the range). */
  startFrame: number;
  /** First and last frame to follow over, inclusive. */
  from: number;
  to: number;
  markers: FollowMarker[];
  /** Points a person placed, per marker key and frame, px: never replaced; following re-anchors on them. */
  placed?: ReadonlyMap<string, ReadonlyMap<number, Point>>;
  /**
   * Pairs of markers on one rigid segment (thigh, shank, foot): their distance stays within
   * {@link LINK_TOLERANCE} of the start frame's in a side view. A point that breaks more of its
   * links to well-followed markers than it keeps is taken as lost (it jumped to something else).
   */
  links?: ReadonlyArray<readonly [string, string]>;
  /**
   * Presentation time of every frame of the clip, ms (the manifest's decoded `timestampsMs`, index =
   * frame). A marker's motion is predicted per millisecond, so on a variable-frame-rate clip (a
   * phone's frame intervals vary, and it drops frames) a longer interval predicts a longer move.
   * Absent, or not strictly increasing: every interval counts as one frame.
   */
  timesMs?: readonly number[];
  /** Called after each frame with frames done and frames to do. */
  onProgress?: (done: number, total: number) => void;
  /** Stops following (the result so far is thrown away by the caller). */
  signal?: AbortSignal;
}

/** A followed point, px, with its confidence (0–1). */
export interface FollowedPoint {
  frame: number;
  x: number;
  y: number;
  confidence: number;
}

/** Result of {@link followMarkers}: per marker key the followed points (placed frames and the start frame left out). */
export interface FollowResult {
  points: Map<string, FollowedPoint[]>;
  /** Markers whose starting point is not on a high-contrast dot: followed as a plain patch, every point low confidence. */
  notOnDot: string[];
  /** Frames where at least one marker was below {@link LOW_CONFIDENCE} or not found, ascending. */
  lowConfidenceFrames: number[];
  /**
   * Every frame of the range where a marker got no point (apart from the start frame and frames a
   * person placed it on), with why: per marker key, ascending by frame. With `points`, every frame
   * of the range is accounted for: followed, placed, or lost here.
   */
  lost: Map<string, LostPoint[]>;
  /**
   * Frames whose picture repeats the frame next to them in the direction followed (a phone repeats a
   * frame when the sensor is late): after the start frame the later of two equal pictures, before
   * it the earlier; ascending.
   */
  repeatedFrames: number[];
}

/** Why a marker has no point on a frame. */
export type LostReason = 'not_found' | 'broke_links' | 'on_other_marker';

/** A frame where a marker was not followed, and why. */
export interface LostPoint {
  frame: number;
  reason: LostReason;
}

/**
 * A frame repeats the one before when their grey levels differ by less than this on average (of
 * 255). Encoders store a repeated frame as "nothing changed", so it decodes within a level or two
 * of the frame before, while any moving runner or sensor noise changes far more than this.
 */
export const REPEATED_FRAME_MEAN_DIFF = 0.5;

/** Whether `b` shows the same picture as `a` (mean absolute grey difference under {@link REPEATED_FRAME_MEAN_DIFF}). */
export function isRepeatedPicture(a: GrayFrame, b: GrayFrame): boolean {
  if (a.width !== b.width || a.height !== b.height) return false;
  const n = a.data.length;
  const limit = REPEATED_FRAME_MEAN_DIFF * n;
  let sum = 0;
  for (let i = 0; i < n; i++) {
    sum += Math.abs(a.data[i]! - b.data[i]!);
    if (sum >= limit) return false;
  }
  return true;
}

/**
 * Milliseconds between frames `a` and `b` from `timesMs` when they are usable (one per frame of
 * the clip, finite and strictly increasing), else the number of frames between them.
 */
export function frameClock(timesMs: readonly number[] | undefined, frameCount: number): (a: number, b: number) => number {
  let ok = !!timesMs && timesMs.length >= frameCount && frameCount > 0;
  for (let i = 0; ok && i < frameCount; i++) ok = Number.isFinite(timesMs![i]) && (i === 0 || timesMs![i]! > timesMs![i - 1]!);
  if (!ok) return (a, b) => Math.abs(b - a);
  const nominal = (timesMs![frameCount - 1]! - timesMs![0]!) / Math.max(1, frameCount - 1);
  // In units of the clip's mean interval, so the tracker's tuning per frame still applies.
  return (a, b) => (nominal > 0 ? Math.abs(timesMs![b]! - timesMs![a]!) / nominal : Math.abs(b - a));
}

/** Below this a followed point is flagged for the coach to check. */
export const LOW_CONFIDENCE = 0.5;
/** Below this a marker counts as not found on the frame: no point is given. */
export const LOST_CONFIDENCE = 0.2;
/** How much a linked pair's distance may change from the start frame (share of it). */
export const LINK_TOLERANCE = 0.12;
/** A marker found by the wide search (the flow lost it) is confident only with at least this template match score. */
export const WIDE_CONFIDENT_SCORE = 0.85;
/** A starting point is on a tape dot when its centre stands out from around it by at least this many grey levels. */
export const MIN_DOT_CONTRAST = 40;

/** Sizes in px for a frame width (tuned at 1280 wide, scaled with the frame). */
interface Sizes {
  patch: number;
  lkWindow: number;
  template: number;
  search: number;
  maxSearch: number;
}

function sizesFor(width: number): Sizes {
  const s = width / 1280;
  const odd = (n: number) => 2 * Math.round(n / 2) + 1;
  return {
    patch: Math.max(41, odd(64 * s)),
    lkWindow: Math.max(9, odd(19 * s)),
    template: Math.max(9, odd(17 * s)),
    search: Math.max(3, Math.round(4 * s)),
    maxSearch: Math.max(12, Math.round(40 * s)),
  };
}

const clamp01 = (v: number) => Math.max(0, Math.min(1, v));
const dist = (a: Point, b: Point) => Math.hypot(a.x - b.x, a.y - b.y);

/** OpenCV matrices reused for every step (allocated once per run, freed at the end). */
class Workspace {
  readonly a: CvMat;
  readonly b: CvMat;
  readonly p0: CvMat;
  readonly p1: CvMat;
  readonly back: CvMat;
  readonly status: CvMat;
  readonly err: CvMat;
  readonly scores: CvMat;
  readonly window: unknown;
  readonly criteria: unknown;
  readonly searchMats = new Map<number, CvMat>();

  constructor(
    readonly cv: OpenCv,
    readonly sizes: Sizes,
  ) {
    this.a = new cv.Mat(sizes.patch, sizes.patch, cv.CV_8UC1);
    this.b = new cv.Mat(sizes.patch, sizes.patch, cv.CV_8UC1);
    this.p0 = new cv.Mat(1, 1, cv.CV_32FC2);
    this.p1 = new cv.Mat(1, 1, cv.CV_32FC2);
    this.back = new cv.Mat(1, 1, cv.CV_32FC2);
    this.status = new cv.Mat();
    this.err = new cv.Mat();
    this.scores = new cv.Mat();
    this.window = new cv.Size(sizes.lkWindow, sizes.lkWindow);
    this.criteria = new cv.TermCriteria(cv.TermCriteria_EPS | cv.TermCriteria_COUNT, 20, 0.03);
  }

  /** A square grey matrix of `size` px for search windows (one per size). */
  searchMat(size: number): CvMat {
    let m = this.searchMats.get(size);
    if (!m) {
      m = new this.cv.Mat(size, size, this.cv.CV_8UC1);
      this.searchMats.set(size, m);
    }
    return m;
  }

  /** Lucas–Kanade from `from` in patch a to patch b (start guess `guess`); null when the flow fails. */
  flow(src: CvMat, dst: CvMat, from: Point, guess: Point, out: CvMat): Point | null {
    const { cv } = this;
    this.p0.data32F[0] = from.x;
    this.p0.data32F[1] = from.y;
    out.data32F[0] = guess.x;
    out.data32F[1] = guess.y;
    cv.calcOpticalFlowPyrLK(src, dst, this.p0, out, this.status, this.err, this.window, 2, this.criteria, cv.OPTFLOW_USE_INITIAL_FLOW);
    if (this.status.data[0] !== 1) return null;
    const p = { x: out.data32F[0]!, y: out.data32F[1]! };
    return Number.isFinite(p.x) && Number.isFinite(p.y) ? p : null;
  }

  delete(): void {
    for (const m of [this.a, this.b, this.p0, this.p1, this.back, this.status, this.err, this.scores, ...this.searchMats.values()])
      m.delete();
    (this.window as { delete?: () => void }).delete?.();
  }
}

/** The state of one marker while it is followed in one direction. */
class MarkerTrack {
  pos: Point;
  /** Motion per unit of time (one mean frame interval of the clip; see {@link frameClock}). */
  velocity: Point = { x: 0, y: 0 };
  lostFor = 0;
  /** Where the last step looked for the marker (its place if that step's point is judged wrong). */
  private stepFrom: Point | null = null;
  readonly template: CvMat;
  /**
   * The marker as last seen clearly (updated only on confident points on the dot): motion blur
   * streaks a fast foot's dot differently from the start frame, and changes little frame to frame.
   */
  readonly recent: CvMat;
  readonly polarity: 1 | -1;
  readonly dotRadius: number;
  readonly startContrast: number;
  /**
   * Whether the marker is known to be itself: true from the start; false after it was lost and
   * found again, until a rigid link to a well-followed marker confirms it (low confidence meanwhile).
   */
  verified = true;
  /** Whether the starting point is on a high-contrast tape dot (otherwise every point stays low confidence). */
  readonly onDot: boolean;

  constructor(
    readonly key: string,
    private readonly ws: Workspace,
    frame: GrayFrame,
    start: Point,
  ) {
    const { cv, sizes } = ws;
    const look = lookOfDot(frame, start, sizes.template);
    this.polarity = look.polarity;
    this.dotRadius = look.radius;
    const fit = dotCentroid(frame, start, this.dotRadius + 1, this.polarity);
    // Follow the dot's own centre when the coach clicked on a dot; the patch itself otherwise.
    this.pos = fit && dist(fit, start) <= this.dotRadius ? { x: fit.x, y: fit.y } : start;
    this.startContrast = Math.max(1, fit?.contrast ?? look.contrast);
    this.onDot = !!fit && fit.contrast >= MIN_DOT_CONTRAST && dist(fit, start) <= this.dotRadius;
    this.template = new cv.Mat(sizes.template, sizes.template, cv.CV_8UC1);
    copyPatch(frame, patchOrigin(frame, this.pos, sizes.template), sizes.template, this.template.data);
    this.recent = new cv.Mat(sizes.template, sizes.template, cv.CV_8UC1);
    this.recent.data.set(this.template.data);
  }

  /** Moves the marker to a point a person placed (not reported; resets the motion when it was lost). */
  anchor(p: Point, frame: GrayFrame, dt = 1): void {
    const fit = dotCentroid(frame, p, this.dotRadius + 1, this.polarity);
    const at = fit && dist(fit, p) <= this.dotRadius ? { x: fit.x, y: fit.y } : p;
    this.velocity = this.lostFor ? { x: 0, y: 0 } : { x: (at.x - this.pos.x) / dt, y: (at.y - this.pos.y) / dt };
    this.pos = at;
    this.lostFor = 0;
  }

  /**
   * One step from `prev` to `next`, `dt` apart (in mean frame intervals): returns the point and its
   * confidence, or null when the marker is not found. `others` are where the other markers are (a
   * lost marker is not re-found on them). `carried`: where the markers of its segment put a lost
   * marker ({@link carriedBySegment}); it is looked for there, and stays with them while not found.
   */
  step(
    prev: GrayFrame,
    next: GrayFrame,
    others: Point[],
    dt = 1,
    carried?: Point,
    breaks: (p: Point) => boolean = () => false,
  ): { p: Point; confidence: number } | null {
    // Predicted over at most one mean interval: over a longer one (a phone's dropped frame) going
    // on at the same speed overshoots wherever the limb turns (a foot landing, the heel lifting).
    const ahead = Math.min(dt, 1);
    const at = (k: number): Point => ({ x: this.pos.x + this.velocity.x * k, y: this.pos.y + this.velocity.y * k });
    const guess = carried ?? at(ahead);
    let found = this.look(prev, next, others, guess, !!carried);
    // A look is better when it keeps the marker's rigid links to the markers already found on this
    // frame (neighbouring dots look alike), then when it is more confident.
    const rank = (l: ReturnType<MarkerTrack['look']>) => (l ? (breaks(l.p) ? 0 : 2) + l.confidence : -1);
    const better = (again: ReturnType<MarkerTrack['look']>) => {
      if (rank(again) > rank(found)) found = again;
    };
    const unsure = () => !found || found.confidence < LOW_CONFIDENCE || breaks(found.p);
    // Over a longer interval (a phone's dropped frame) the limb may have kept its speed, or turned:
    // look from the whole interval's motion too, and keep the better look.
    if (this.lostFor === 0 && !carried && dt > 1 + 1e-6) better(this.look(prev, next, others, at(dt)));
    // Not found from the motion so far: the limb stopped or turned; look from where it was.
    if (this.lostFor === 0 && !carried && unsure()) better(this.look(prev, next, others, at(0)));
    return this.settle(next, found, guess, others, dt);
  }

  /**
   * Looks for the marker on `next` starting from `guess` (the flow from where it was on `prev`,
   * then its look around where the flow put it; a wide search around `guess` when that is unsure).
   * Changes nothing of the track.
   */
  private look(
    prev: GrayFrame,
    next: GrayFrame,
    others: Point[],
    guess: Point,
    carried = false,
  ): { p: Point; confidence: number; score: number; contrast: number } | null {
    const ws = this.ws;
    const { sizes } = ws;
    const scale = next.width / 1280;
    let candidate: Point = guess;
    let flowScore = 1;
    if (this.lostFor === 0) {
      // Centred between where the marker was and where it should be, so a fast marker stays inside the patch on both frames.
      const origin = patchOrigin(prev, { x: (this.pos.x + guess.x) / 2, y: (this.pos.y + guess.y) / 2 }, sizes.patch);
      copyPatch(prev, origin, sizes.patch, ws.a.data);
      copyPatch(next, origin, sizes.patch, ws.b.data);
      const local = (p: Point) => ({ x: p.x - origin.x, y: p.y - origin.y });
      const from = local(this.pos);
      const fwd = ws.flow(ws.a, ws.b, from, local(guess), ws.p1);
      const bwd = fwd && ws.flow(ws.b, ws.a, fwd, from, ws.back);
      if (fwd && bwd) {
        candidate = { x: fwd.x + origin.x, y: fwd.y + origin.y };
        const fb = dist(bwd, from) / scale;
        flowScore = 1 / (1 + (fb / 1.5) ** 2);
      } else flowScore = 0.3;
    }
    const radius =
      this.lostFor === 0 ? sizes.search : carried ? sizes.maxSearch : Math.min(sizes.maxSearch, sizes.search + 4 * this.lostFor);
    let found = this.judge(next, this.matchNear(next, candidate, radius), this.lostFor === 0 ? candidate : null, flowScore, scale);
    if (this.lostFor === 0 && this.onDot && (!found || found.confidence < LOW_CONFIDENCE)) {
      // Fast limbs at low frame rates (a knee moves ~15 px a frame at 60 fps) outrun the flow on a
      // small dot over a moving leg: look for the dot itself around where it should be, and keep it
      // only when it clearly is the marker (as when a lost marker is found again).
      // A dot found this way is confident only when it matches very well: a marker coming out from
      // behind a limb (half covered, ghosted by motion blur) matches less and stays to be checked.
      const wide = this.judge(next, this.matchNear(next, guess, sizes.maxSearch), null, 1, scale);
      if (wide && wide.score >= 0.8 && wide.contrast >= 0.8 && !others.some((o) => dist(o, wide.p) < 2 * this.dotRadius)) {
        if (wide.score < WIDE_CONFIDENT_SCORE) wide.confidence = Math.min(wide.confidence, LOW_CONFIDENCE - 0.01);
        if (!found || wide.confidence > found.confidence) found = wide;
      }
    }
    return found;
  }

  /** Takes what {@link look} found as the marker's point (or the marker as lost) and moves the track on. */
  private settle(
    next: GrayFrame,
    found: { p: Point; confidence: number; score: number; contrast: number } | null,
    guess: Point,
    others: Point[],
    dt: number,
  ): { p: Point; confidence: number } | null {
    const { sizes } = this.ws;
    if (!found) return this.lose(guess);
    const { p: refined, contrast } = found;
    let confidence = found.confidence;
    if (!this.onDot) confidence = Math.min(confidence, LOW_CONFIDENCE - 0.01);
    if (this.lostFor > 0) {
      // Found again only when it clearly looks like the marker and is not another marker.
      const taken = others.some((o) => dist(o, refined) < 2 * this.dotRadius);
      if (taken || found.score < 0.8 || contrast < 0.8) return this.lose(guess);
      this.verified = false;
    }
    if (confidence < LOST_CONFIDENCE) return this.lose(guess);
    const moved = { x: (refined.x - this.pos.x) / dt, y: (refined.y - this.pos.y) / dt };
    this.velocity = confidence >= LOW_CONFIDENCE ? moved : { x: moved.x * 0.5, y: moved.y * 0.5 };
    this.stepFrom = guess;
    this.pos = refined;
    this.lostFor = 0;
    if (confidence >= 0.8 && contrast >= 0.9) copyPatch(next, patchOrigin(next, refined, sizes.template), sizes.template, this.recent.data);
    return { p: refined, confidence };
  }

  /**
   * Refines a template match on the dot's centroid and scores it: how well it looks like the marker
   * (match score, dot contrast against the start's) times the flow's own forward–backward score
   * and how well it agrees with `expected` (where the flow put it; null: not checked).
   */
  private judge(
    next: GrayFrame,
    match: (Point & { score: number }) | null,
    expected: Point | null,
    flowScore: number,
    scale: number,
  ): { p: Point; confidence: number; score: number; contrast: number } | null {
    if (!match) return null;
    const fit = dotCentroid(next, match, this.dotRadius + 1, this.polarity);
    const p: Point = fit && dist(fit, match) <= this.dotRadius * 0.75 ? { x: fit.x, y: fit.y } : match;
    const appearance = clamp01((match.score - 0.45) / 0.4);
    const contrast = clamp01((fit?.contrast ?? 0) / (0.55 * this.startContrast));
    const agree = expected ? 1 / (1 + (dist(p, expected) / (3 * Math.max(scale, 0.5))) ** 2) : 1;
    return { p, confidence: appearance * contrast * Math.min(flowScore, agree), score: match.score, contrast };
  }

  /** Takes the marker as lost from here on (its last point was judged wrong). */
  markLost(): void {
    this.lostFor = Math.max(1, this.lostFor);
    this.velocity = { x: 0, y: 0 };
    // Not where the judged-wrong point was (another marker's dot, which that marker could then not
    // be found on again), but where this one was looked for.
    if (this.stepFrom) this.pos = this.stepFrom;
    this.stepFrom = null;
  }

  private lose(guess: Point): null {
    this.lostFor++;
    this.pos = guess;
    this.velocity = { x: this.velocity.x * 0.9, y: this.velocity.y * 0.9 };
    return null;
  }

  /** Template match (normalised cross-correlation, the marker as placed and as last seen) within ±radius of `centre`; best position and score. */
  private matchNear(frame: GrayFrame, centre: Point, radius: number): (Point & { score: number }) | null {
    const { cv, sizes } = this.ws;
    const size = sizes.template + 2 * radius;
    if (size > frame.width || size > frame.height) return null;
    const origin = patchOrigin(frame, centre, size);
    const area = this.ws.searchMat(size);
    copyPatch(frame, origin, size, area.data);
    const n = size - sizes.template + 1;
    let peak = { x: 0, y: 0, score: Number.NaN };
    for (const template of [this.template, this.recent]) {
      cv.matchTemplate(area, template, this.ws.scores, cv.TM_CCOEFF_NORMED);
      const p = scorePeak(this.ws.scores.data32F, n, n);
      if (Number.isFinite(p.score) && !(p.score <= peak.score)) peak = p;
    }
    if (!Number.isFinite(peak.score)) return null;
    const half = (sizes.template - 1) / 2;
    return { x: origin.x + peak.x + half, y: origin.y + peak.y + half, score: peak.score };
  }

  delete(): void {
    this.template.delete();
    this.recent.delete();
  }
}

/** Whether the dot is lighter or darker than around it, its radius and contrast (grey levels). */
function lookOfDot(frame: GrayFrame, p: Point, template: number): { polarity: 1 | -1; radius: number; contrast: number } {
  const half = (template - 1) / 2;
  const at = (x: number, y: number) => {
    const cx = Math.max(0, Math.min(frame.width - 1, Math.round(x)));
    const cy = Math.max(0, Math.min(frame.height - 1, Math.round(y)));
    return frame.data[cy * frame.width + cx]!;
  };
  const ring = (r: number) => {
    let s = 0;
    for (let k = 0; k < 16; k++) s += at(p.x + r * Math.cos((k * Math.PI) / 8), p.y + r * Math.sin((k * Math.PI) / 8));
    return s / 16;
  };
  const centre = (at(p.x, p.y) + ring(1)) / 2;
  const outside = ring(half);
  const polarity: 1 | -1 = centre >= outside ? 1 : -1;
  let radius = 2;
  for (let r = 1; r <= half; r++) {
    if (polarity * (ring(r) - outside) < 0.5 * polarity * (centre - outside)) break;
    radius = r + 0.5;
  }
  return { polarity, radius: Math.max(2, radius), contrast: Math.abs(centre - outside) };
}

/** Whether a point (px) sits on a high-contrast tape dot, as following needs to give confident points. */
export function isOnTapeDot(frame: GrayFrame, p: Point): boolean {
  const look = lookOfDot(frame, p, sizesFor(frame.width).template);
  const fit = dotCentroid(frame, p, look.radius + 1, look.polarity);
  return !!fit && fit.contrast >= MIN_DOT_CONTRAST && dist(fit, p) <= look.radius;
}

/**
 * Two markers cannot sit on one dot: when two followed points come closer than the larger dot's
 * diameter, the less confident one (never a placed one) is taken as lost.
 */
function dropCollisions(found: Map<MarkerTrack, { p: Point; confidence: number; placed: boolean }>): void {
  const entries = [...found.entries()];
  for (let i = 0; i < entries.length; i++)
    for (let j = i + 1; j < entries.length; j++) {
      const [ta, a] = entries[i]!;
      const [tb, b] = entries[j]!;
      if (!found.has(ta) || !found.has(tb)) continue;
      if (dist(a.p, b.p) >= 2 * Math.max(ta.dotRadius, tb.dotRadius)) continue;
      const loser = a.placed ? tb : b.placed ? ta : a.confidence >= b.confidence ? tb : ta;
      if (found.get(loser)!.placed) continue;
      loser.markLost();
      found.delete(loser);
    }
}

/** Where a marker was last seen clearly, and where its linked markers were then. */
interface LastSeen {
  p: Point;
  linked: Map<MarkerTrack, Point>;
}

/**
 * Where a lost marker is now if it moved with its segment: the markers rigidly linked to it that
 * are well followed on this frame carry it from where they all were when it was last seen — two
 * of them by the rotation, scale and shift that takes their old places to their new ones (a rigid
 * segment turning in the side view), one by its shift. Null when none is followed now.
 */
export function carriedBySegment(last: { p: Point; linked: ReadonlyMap<unknown, Point> }, now: ReadonlyMap<unknown, Point>): Point | null {
  const pairs = [...last.linked].filter(([k]) => now.has(k)).map(([k, was]) => ({ was, is: now.get(k)! }));
  if (pairs.length === 0) return null;
  const [a, b] = pairs;
  if (!b || dist(a!.was, b.was) < 1) return { x: last.p.x + a!.is.x - a!.was.x, y: last.p.y + a!.is.y - a!.was.y };
  // Complex-number similarity: z ↦ a.is + (z − a.was)·(b.is − a.is)/(b.was − a.was).
  const ux = b.was.x - a!.was.x;
  const uy = b.was.y - a!.was.y;
  const vx = b.is.x - a!.is.x;
  const vy = b.is.y - a!.is.y;
  const d = ux * ux + uy * uy;
  const rx = (vx * ux + vy * uy) / d;
  const ry = (vy * ux - vx * uy) / d;
  const zx = last.p.x - a!.was.x;
  const zy = last.p.y - a!.was.y;
  return { x: a!.is.x + zx * rx - zy * ry, y: a!.is.y + zx * ry + zy * rx };
}

/** How many links of a new point to well-followed, verified markers (or placed ones) hold and break. */
function linkCounts(
  track: MarkerTrack,
  p: Point,
  found: ReadonlyMap<MarkerTrack, { p: Point; confidence: number }>,
  tracks: readonly MarkerTrack[],
  lengths: ReadonlyMap<string, number>,
): { kept: number; broken: number } {
  let broken = 0;
  let kept = 0;
  for (const [pair, length] of lengths) {
    const [a, b] = pair.split('|');
    const otherKey = a === track.key ? b : b === track.key ? a : null;
    if (!otherKey || length <= 0) continue;
    const other = tracks.find((t) => t.key === otherKey);
    const at = other && found.get(other);
    if (!other || !at || at.confidence < LOW_CONFIDENCE || !other.verified) continue;
    if (Math.abs(dist(p, at.p) - length) > LINK_TOLERANCE * length) broken++;
    else kept++;
  }
  return { kept, broken };
}

/** Whether a new point breaks more links than it keeps (it jumped to something else). */
function breaksLinks(...args: Parameters<typeof linkCounts>): boolean {
  const { kept, broken } = linkCounts(...args);
  return broken > kept;
}

/** Whether a marker found again is confirmed: at least one link holds and none breaks. */
function confirmsLinks(...args: Parameters<typeof linkCounts>): boolean {
  const { kept, broken } = linkCounts(...args);
  return kept > 0 && broken === 0;
}

/** Checks a request against the clip; throws a RangeError naming what is wrong. */
export function checkFollowRequest(req: FollowRequest, reader: Pick<FrameReader, 'frameCount' | 'width' | 'height'>): void {
  if (req.markers.length === 0) throw new RangeError('no starting points: place the markers on one frame first');
  if (!(req.from >= 0 && req.to < reader.frameCount && req.from <= req.to))
    throw new RangeError(`frame range ${req.from}–${req.to} is outside the clip (frames 0–${reader.frameCount - 1})`);
  if (req.startFrame < req.from || req.startFrame > req.to) throw new RangeError('the start frame is outside the range');
  for (const m of req.markers)
    if (!(m.start.x >= 0 && m.start.x < reader.width && m.start.y >= 0 && m.start.y < reader.height))
      throw new RangeError(`marker ${m.key} is outside the frame`);
}

/**
 * Follows every marker from `startFrame` forward to `to` and backward to `from`.
 * The start frame and frames where a person placed a marker are not in the result for that marker;
 * every other frame of the range has the marker's point in `points` or the reason it has none in
 * `lost`. Motion is predicted over each frame's real interval (`timesMs`), and a frame whose
 * picture repeats the one before keeps the points of that one (the phone showed nothing new), the
 * next new picture being predicted over the time since the picture changed.
 */
export async function followMarkers(cv: OpenCv, reader: FrameReader, req: FollowRequest): Promise<FollowResult> {
  checkFollowRequest(req, reader);
  const ws = new Workspace(cv, sizesFor(reader.width));
  const points = new Map<string, FollowedPoint[]>(req.markers.map((m) => [m.key, []]));
  const lost = new Map<string, LostPoint[]>(req.markers.map((m) => [m.key, []]));
  const low = new Set<number>();
  const repeated = new Set<number>();
  const notOnDot = new Set<string>();
  const clock = frameClock(req.timesMs, reader.frameCount);
  const total = req.to - req.from;
  let done = 0;
  try {
    const startImage = await reader.read(req.startFrame);
    for (const direction of [1, -1] as const) {
      const last = direction === 1 ? req.to : req.from;
      if (last === req.startFrame) continue;
      const tracks = req.markers.map((m) => new MarkerTrack(m.key, ws, startImage, m.start));
      const linkLengths = new Map<string, number>();
      for (const [a, b] of req.links ?? []) {
        const ta = tracks.find((t) => t.key === a);
        const tb = tracks.find((t) => t.key === b);
        if (ta && tb) linkLengths.set(`${a}|${b}`, dist(ta.pos, tb.pos));
      }
      for (const t of tracks) if (!t.onDot) notOnDot.add(t.key);
      const neighbours = new Map<MarkerTrack, MarkerTrack[]>(tracks.map((t) => [t, []]));
      for (const pair of linkLengths.keys()) {
        const [a, b] = pair.split('|').map((k) => tracks.find((t) => t.key === k)!);
        neighbours.get(a!)!.push(b!);
        neighbours.get(b!)!.push(a!);
      }
      const lastSeen = new Map<MarkerTrack, LastSeen>(
        tracks.map((t) => [t, { p: t.pos, linked: new Map(neighbours.get(t)!.map((n) => [n, n.pos])) }]),
      );
      /** What each marker got on the frame before (a repeated picture gets the same). */
      const before = new Map<MarkerTrack, { p: Point; confidence: number } | LostReason | null>(tracks.map((t) => [t, null]));
      const record = (t: MarkerTrack, f: number, got: { p: Point; confidence: number } | LostReason) => {
        before.set(t, got);
        if (typeof got === 'string') {
          lost.get(t.key)!.push({ frame: f, reason: got });
          low.add(f);
          return;
        }
        points.get(t.key)!.push({ frame: f, x: got.p.x, y: got.p.y, confidence: Math.round(got.confidence * 1000) / 1000 });
        if (got.confidence < LOW_CONFIDENCE) low.add(f);
      };
      try {
        let prev = startImage;
        /** The frame `prev` is: the last frame whose picture was new. */
        let prevFrame = req.startFrame;
        for (let f = req.startFrame + direction; direction === 1 ? f <= last : f >= last; f += direction) {
          if (req.signal?.aborted) throw req.signal.reason ?? new Error('aborted');
          const next = await reader.read(f);
          const anyPlaced = tracks.some((t) => req.placed?.get(t.key)?.has(f));
          if (!anyPlaced && isRepeatedPicture(prev, next)) {
            // The same picture again: every marker is where it was; motion resumes on the next new picture.
            repeated.add(f);
            for (const t of tracks) {
              const was = before.get(t);
              if (was) record(t, f, was);
              else if (was === null) record(t, f, { p: t.pos, confidence: 1 }); // right after the start frame
            }
            req.onProgress?.(++done, total);
            continue;
          }
          const dt = clock(prevFrame, f);
          const here: Point[] = [];
          const found = new Map<MarkerTrack, { p: Point; confidence: number; placed: boolean }>();
          const why = new Map<MarkerTrack, LostReason>();
          // Markers being followed first, then lost ones, which their segment's markers can carry.
          const order = [...tracks.filter((t) => t.lostFor === 0), ...tracks.filter((t) => t.lostFor > 0)];
          for (const t of order) {
            const placed = req.placed?.get(t.key)?.get(f);
            if (placed) {
              t.anchor(placed, next, dt);
              here.push(t.pos);
              found.set(t, { p: t.pos, confidence: 1, placed: true });
              continue;
            }
            const others = [...here, ...tracks.filter((o) => o !== t && o.lostFor === 0).map((o) => o.pos)];
            let carried: Point | undefined;
            if (t.lostFor > 0) {
              const sure = new Map<MarkerTrack, Point>();
              for (const n of neighbours.get(t)!) {
                const at = found.get(n);
                if (at && (at.placed || (at.confidence >= LOW_CONFIDENCE && n.verified))) sure.set(n, at.p);
              }
              carried = carriedBySegment(lastSeen.get(t)!, sure) ?? undefined;
            }
            const step = t.step(prev, next, others, dt, carried, (p) => breaksLinks(t, p, found, tracks, linkLengths));
            if (step) {
              here.push(step.p);
              found.set(t, { ...step, placed: false });
            } else why.set(t, 'not_found');
          }
          const beforeCollisions = new Set(found.keys());
          dropCollisions(found);
          for (const t of beforeCollisions) if (!found.has(t)) why.set(t, 'on_other_marker');
          for (const t of tracks) {
            const got = found.get(t);
            if (got && !got.placed && breaksLinks(t, got.p, found, tracks, linkLengths)) {
              t.markLost();
              found.delete(t);
              why.set(t, 'broke_links');
            }
            if (got?.placed) {
              before.set(t, { p: got.p, confidence: 1 });
              continue;
            }
            const kept = found.get(t);
            if (kept && !t.verified) {
              if (confirmsLinks(t, kept.p, found, tracks, linkLengths)) t.verified = true;
              else kept.confidence = Math.min(kept.confidence, LOW_CONFIDENCE - 0.01);
            }
            record(t, f, kept ? { p: kept.p, confidence: kept.confidence } : (why.get(t) ?? 'not_found'));
          }
          for (const t of tracks) {
            const at = found.get(t);
            if (!at || (!at.placed && (at.confidence < LOW_CONFIDENCE || !t.verified))) continue;
            const linked = new Map<MarkerTrack, Point>();
            for (const n of neighbours.get(t)!) {
              const there = found.get(n);
              if (there && (there.placed || (there.confidence >= LOW_CONFIDENCE && n.verified))) linked.set(n, there.p);
            }
            lastSeen.set(t, { p: at.p, linked });
          }
          prev = next;
          prevFrame = f;
          req.onProgress?.(++done, total);
        }
      } finally {
        for (const t of tracks) t.delete();
      }
    }
  } finally {
    ws.delete();
  }
  for (const list of points.values()) list.sort((a, b) => a.frame - b.frame);
  for (const list of lost.values()) list.sort((a, b) => a.frame - b.frame);
  return {
    points,
    notOnDot: [...notOnDot],
    lowConfidenceFrames: [...low].sort((a, b) => a - b),
    lost,
    repeatedFrames: [...repeated].sort((a, b) => a - b),
  };
}

export type { DotFit, GrayFrame };
