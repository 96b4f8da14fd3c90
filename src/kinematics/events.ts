/**
 * Gait events → stances, flights, steps and strides; event validation; frame timing. Pure.
 *
 * Definitions (per side; frames are 0-based indices as stored):
 * - stance (contact)  = initial contact (IC) → toe-off (TO) of the same side;
 * - flight            = TO of one side → the next IC of the other side;
 * - step              = IC of one side → the next IC of the other side (named by the landing side:
 *                       a "right step" ends with right initial contact);
 * - stride            = IC → the next IC of the same side (two steps).
 * Only clean patterns count: a stride needs exactly one TO of its side between its two ICs; a step
 * needs nothing but (at most) the first side's TO between the two ICs; a flight needs nothing
 * between the TO and the IC. Midstance marks are optional and never used for timing.
 */
import { GAIT_EVENT_LABELS, type GaitEventKind, type GaitEventMark } from '../contracts/annotations';
import { SIDES, type Side } from '../contracts/assessment';
import { median } from './stats';

/** One stance phase (foot on the ground). */
export interface Stance {
  side: Side;
  icFrame: number;
  toFrame: number;
  /** The side's midstance mark inside this stance, when marked. */
  midstanceFrame: number | null;
}

/** One flight phase: toe-off of `fromSide` → initial contact of the other side. */
export interface Flight {
  fromSide: Side;
  toFrame: number;
  icFrame: number;
}

/** One step: IC of `fromSide` → IC of `side` (the landing side). */
export interface Step {
  fromSide: Side;
  side: Side;
  icFrame: number;
  nextIcFrame: number;
}

/** One stride of `side`: IC → TO → next IC of the same side. */
export interface Stride {
  side: Side;
  icFrame: number;
  toFrame: number;
  nextIcFrame: number;
}

/** Everything {@link buildGaitCycles} found, in time order, and what it left out and why. */
export interface GaitCycles {
  stances: Stance[];
  flights: Flight[];
  steps: Step[];
  strides: Stride[];
  /** Plain-language reasons for candidates that were not counted (e.g. a cycle left unmarked). */
  excluded: string[];
}

/** Longest list of messages returned; the rest are summarised in one line. */
export const MAX_EVENT_PROBLEMS = 50;

/** Strides or steps longer than this × the median are left out (a cycle is probably unmarked). */
export const OUTLIER_RATIO = 1.5;

const SIDE_WORD: Record<Side, string> = { left: 'Left', right: 'Right' };
const eventWord = (k: GaitEventKind): string => GAIT_EVENT_LABELS[k].toLowerCase();
/** Sort order of events on one frame: toe-off before midstance before initial contact. */
const KIND_ORDER: Record<GaitEventKind, number> = { toe_off: 0, midstance: 1, initial_contact: 2 };

/** Events sorted by frame, then toe-off < midstance < initial contact on a shared frame. */
export function sortEvents(events: readonly GaitEventMark[]): GaitEventMark[] {
  return [...events].sort((a, b) => a.frame - b.frame || KIND_ORDER[a.kind] - KIND_ORDER[b.kind] || a.side.localeCompare(b.side));
}

/**
 * Checks marked gait events and lists every problem in words (empty list = valid), so a server can
 * answer 422 with them. Never throws. Checks: whole frame numbers inside the clip (0 … frameCount−1;
 * pass `Infinity` when the length is unknown); known side and kind; per side no two events on one
 * frame; per side the order initial contact → (midstance) → toe-off → initial contact …: no two
 * initial contacts without a toe-off between, no two toe-offs without an initial contact between,
 * midstance only inside a stance and once per stance. A clip may start or end anywhere in the cycle.
 */
export function validateEvents(events: readonly GaitEventMark[], frameCount: number): string[] {
  const problems: string[] = [];
  const valid: GaitEventMark[] = [];
  for (const e of events) {
    const sideOk = (SIDES as readonly string[]).includes(e?.side);
    const kindOk = Object.prototype.hasOwnProperty.call(KIND_ORDER, e?.kind);
    if (!sideOk || !kindOk) {
      problems.push(
        `Unknown gait event ${JSON.stringify({ side: e?.side, kind: e?.kind })}: side must be left or right, kind initial_contact, midstance or toe_off.`,
      );
      continue;
    }
    const where = `${SIDE_WORD[e.side]} ${eventWord(e.kind)}`;
    if (!Number.isInteger(e.frame)) {
      problems.push(`${where} at frame ${e.frame}: the frame must be a whole number.`);
      continue;
    }
    if (e.frame < 0 || e.frame >= frameCount) {
      const range = Number.isFinite(frameCount) ? `0–${frameCount - 1}` : '0 or later';
      problems.push(`${where} at frame ${e.frame} is outside the clip (frames ${range}).`);
      continue;
    }
    valid.push(e);
  }
  for (const side of SIDES) {
    const seq = sortEvents(valid.filter((e) => e.side === side));
    const S = SIDE_WORD[side];
    // Same frame twice for one side.
    for (let i = 1; i < seq.length; i++) {
      const a = seq[i - 1]!;
      const b = seq[i]!;
      if (a.frame !== b.frame) continue;
      problems.push(
        a.kind === b.kind
          ? `${S} ${eventWord(a.kind)} is marked twice on frame ${a.frame}.`
          : `${S} side has two events on frame ${a.frame} (${eventWord(a.kind)} and ${eventWord(b.kind)}); one side can have only one event per frame.`,
      );
    }
    // Order: state machine over distinct frames.
    type State = 'start' | 'stance' | 'stance_ms' | 'swing';
    let state: State = 'start';
    let last: GaitEventMark | null = null;
    let lastIc: GaitEventMark | null = null;
    let lastTo: GaitEventMark | null = null;
    for (const e of seq) {
      if (last && last.frame === e.frame) continue; // reported above
      if (e.kind === 'initial_contact') {
        if ((state === 'stance' || state === 'stance_ms') && lastIc)
          problems.push(`${S} side: two initial contacts (frames ${lastIc.frame} and ${e.frame}) without a toe-off between.`);
        state = 'stance';
        lastIc = e;
      } else if (e.kind === 'toe_off') {
        if (state === 'swing' && lastTo)
          problems.push(`${S} side: two toe-offs (frames ${lastTo.frame} and ${e.frame}) without an initial contact between.`);
        state = 'swing';
        lastTo = e;
      } else {
        if (state === 'swing')
          problems.push(
            `${S} midstance at frame ${e.frame} falls after toe-off (frame ${lastTo!.frame}) and before the next initial contact: midstance belongs inside a stance.`,
          );
        else if (state === 'stance_ms') problems.push(`${S} side: two midstances in one stance (frames ${last!.frame} and ${e.frame}).`);
        else state = 'stance_ms';
      }
      last = e;
    }
  }
  if (problems.length > MAX_EVENT_PROBLEMS) {
    const more = problems.length - MAX_EVENT_PROBLEMS;
    return [...problems.slice(0, MAX_EVENT_PROBLEMS), `…and ${more} more problem${more === 1 ? '' : 's'}.`];
  }
  return problems;
}

/**
 * Cross-side observations that are not errors but deserve a look: left and right initial contacts
 * on one frame, and stances that overlap (double support — running has none, so a side label may be
 * swapped). Plain-language, for measure notes.
 */
export function eventWarnings(events: readonly GaitEventMark[]): string[] {
  const out: string[] = [];
  const ics = sortEvents(events.filter((e) => e.kind === 'initial_contact'));
  for (let i = 1; i < ics.length; i++) {
    const a = ics[i - 1]!;
    const b = ics[i]!;
    if (a.frame === b.frame && a.side !== b.side) out.push(`Left and right initial contact are both on frame ${a.frame}.`);
  }
  const { stances } = buildGaitCycles(events);
  const bySide = (s: Side) => stances.filter((x) => x.side === s);
  const overlaps: string[] = [];
  for (const l of bySide('left'))
    for (const r of bySide('right'))
      if (l.icFrame < r.toFrame && r.icFrame < l.toFrame)
        overlaps.push(`${Math.max(l.icFrame, r.icFrame)}–${Math.min(l.toFrame, r.toFrame)}`);
  if (overlaps.length)
    out.push(
      `Left and right stance overlap at frames ${overlaps.slice(0, 5).join(', ')}${overlaps.length > 5 ? ', …' : ''} (both feet down). Running has no double support: check the sides of those events.`,
    );
  return out;
}

/** Drops values above OUTLIER_RATIO × median (only when there are ≥ 3); returns kept indices. */
function keepNonOutliers(durations: number[]): { keep: boolean[]; med: number | null } {
  if (durations.length < 3) return { keep: durations.map(() => true), med: null };
  const med = median(durations)!;
  return { keep: durations.map((d) => d <= OUTLIER_RATIO * med), med };
}

/**
 * Builds stances, flights, steps and strides from gait events (see the file header for the rules).
 * Invalid or out-of-order marks simply do not form a pattern; run {@link validateEvents} to say why.
 * Strides whose other side has two or more initial contacts inside, and strides or steps longer
 * than 1.5 × the median (with ≥ 3 of them), are left out and listed in `excluded`.
 */
export function buildGaitCycles(events: readonly GaitEventMark[]): GaitCycles {
  const usable = events.filter(
    (e) => Number.isInteger(e.frame) && e.frame >= 0 && (SIDES as readonly string[]).includes(e.side) && e.kind in KIND_ORDER,
  );
  const sorted = sortEvents(usable);
  // Merged IC/TO sequence (midstance ignored for timing), one entry per side/frame/kind.
  const timing: GaitEventMark[] = [];
  for (const e of sorted) {
    if (e.kind === 'midstance') continue;
    const prev = timing[timing.length - 1];
    if (prev && prev.frame === e.frame && prev.side === e.side && prev.kind === e.kind) continue;
    timing.push(e);
  }
  const excluded: string[] = [];
  const stances: Stance[] = [];
  const strides: Stride[] = [];
  const bySide: Record<Side, GaitEventMark[]> = { left: [], right: [] };
  for (const e of timing) bySide[e.side].push(e);
  const icsOf: Record<Side, number[]> = {
    left: bySide.left.filter((e) => e.kind === 'initial_contact').map((e) => e.frame),
    right: bySide.right.filter((e) => e.kind === 'initial_contact').map((e) => e.frame),
  };

  for (const side of SIDES) {
    const seq = bySide[side];
    const other: Side = side === 'left' ? 'right' : 'left';
    const ms = sorted.filter((e) => e.side === side && e.kind === 'midstance').map((e) => e.frame);
    for (let i = 0; i < seq.length; i++) {
      const ic = seq[i]!;
      if (ic.kind !== 'initial_contact') continue;
      const to = seq[i + 1];
      if (!to || to.kind !== 'toe_off' || to.frame <= ic.frame) continue;
      stances.push({ side, icFrame: ic.frame, toFrame: to.frame, midstanceFrame: ms.find((f) => f > ic.frame && f < to.frame) ?? null });
      const next = seq[i + 2];
      if (!next || next.kind !== 'initial_contact' || next.frame <= to.frame) continue;
      const otherIcs = icsOf[other].filter((f) => f > ic.frame && f < next.frame).length;
      if (otherIcs >= 2) {
        excluded.push(
          `${SIDE_WORD[side]} stride at frames ${ic.frame}–${next.frame} left out: the ${other} side lands ${otherIcs} times inside it, so a ${side} cycle is probably unmarked.`,
        );
        continue;
      }
      strides.push({ side, icFrame: ic.frame, toFrame: to.frame, nextIcFrame: next.frame });
    }
  }

  const steps: Step[] = [];
  const flights: Flight[] = [];
  for (let i = 0; i < timing.length; i++) {
    const e = timing[i]!;
    if (e.kind === 'initial_contact') {
      let j = i + 1;
      let tos = 0;
      let clean = true;
      for (; j < timing.length && timing[j]!.kind !== 'initial_contact'; j++) {
        const between = timing[j]!;
        if (between.side === e.side && between.kind === 'toe_off') tos++;
        else clean = false;
      }
      const next = timing[j];
      if (next && clean && tos <= 1 && next.side !== e.side && next.frame > e.frame)
        steps.push({ fromSide: e.side, side: next.side, icFrame: e.frame, nextIcFrame: next.frame });
    } else {
      const next = timing[i + 1];
      if (next && next.kind === 'initial_contact' && next.side !== e.side && next.frame >= e.frame)
        flights.push({ fromSide: e.side, toFrame: e.frame, icFrame: next.frame });
    }
  }

  const strideCheck = keepNonOutliers(strides.map((s) => s.nextIcFrame - s.icFrame));
  const keptStrides = strides.filter((s, i) => {
    if (strideCheck.keep[i]) return true;
    excluded.push(
      `${SIDE_WORD[s.side]} stride at frames ${s.icFrame}–${s.nextIcFrame} left out: ${s.nextIcFrame - s.icFrame} frames is more than ${OUTLIER_RATIO} × the median stride (${strideCheck.med} frames); a cycle is probably unmarked.`,
    );
    return false;
  });
  const stepCheck = keepNonOutliers(steps.map((s) => s.nextIcFrame - s.icFrame));
  const keptSteps = steps.filter((s, i) => {
    if (stepCheck.keep[i]) return true;
    excluded.push(
      `Step at frames ${s.icFrame}–${s.nextIcFrame} left out: ${s.nextIcFrame - s.icFrame} frames is more than ${OUTLIER_RATIO} × the median step (${stepCheck.med} frames); a contact is probably unmarked.`,
    );
    return false;
  });

  const byFrame = <T extends { icFrame: number }>(a: T, b: T) => a.icFrame - b.icFrame;
  return {
    stances: stances.sort(byFrame),
    flights: flights.sort((a, b) => a.toFrame - b.toFrame),
    steps: keptSteps.sort(byFrame),
    strides: keptStrides.sort(byFrame),
    excluded,
  };
}

// ─── Time ────────────────────────────────────────────────────────────────────────────────────

/** Maps frame indices to milliseconds. */
export interface FrameClock {
  /** Time of a frame, ms from the clip start. */
  timeMs(frame: number): number;
  /** Where the times come from: the manifest's per-frame timestamps, or frame ÷ fps. */
  source: 'timestamps' | 'fps';
  fps: number;
  /** Why timestamps were not used although given (null when used or not given). */
  fallbackReason: string | null;
}

/**
 * A clock from per-frame timestamps (ms, the manifest's `timestampsMs`) when they are usable —
 * finite, strictly increasing and covering `lastFrame` — otherwise frame ÷ fps × 1000.
 */
export function makeFrameClock(fps: number, timestampsMs?: readonly number[] | null, lastFrame = 0): FrameClock {
  const byFps: FrameClock = { timeMs: (f) => (f / fps) * 1000, source: 'fps', fps, fallbackReason: null };
  if (!timestampsMs || timestampsMs.length === 0) return byFps;
  let ok = timestampsMs.length > lastFrame;
  let why = ok ? '' : `timestamps cover frames 0–${timestampsMs.length - 1} but events or landmarks reach frame ${lastFrame}`;
  for (let i = 0; ok && i < timestampsMs.length; i++) {
    const t = timestampsMs[i]!;
    if (!Number.isFinite(t) || (i > 0 && t <= timestampsMs[i - 1]!)) {
      ok = false;
      why = `timestamp of frame ${i} is not a finite number later than the previous frame's`;
    }
  }
  if (!ok) return { ...byFps, fallbackReason: why };
  const ts = timestampsMs;
  return { timeMs: (f) => ts[f]!, source: 'timestamps', fps, fallbackReason: null };
}

/** Duration between two frames in seconds on a clock. */
export function secondsBetween(clock: FrameClock, from: number, to: number): number {
  return (clock.timeMs(to) - clock.timeMs(from)) / 1000;
}

/** ±1 frame of event quantisation in ms: 1000 ÷ fps (REFERENCES.md: 16.7 ms at 60 fps, 4.2 at 240). */
export function frameQuantisationMs(fps: number): number {
  return 1000 / fps;
}
