/**
 * Frames marker following could not follow a marker on, as the review shows them, pure: which are
 * still to check (a marker placed by hand since clears its frame at once, before the save comes
 * back), the summary per marker, stepping to the next one, what is missing on a frame in words a
 * clinician reads, and the gait events whose measures leave that step out.
 */
import {
  GAIT_EVENT_LABELS,
  type FrameLandmarks,
  type GaitEventMark,
  type LandmarkName,
  type LandmarkPoint,
  type NotFollowedPoint,
  type NotFollowedReason,
} from '../../../contracts/annotations';
import type { Side } from '../../../contracts/assessment';

/** Short names of the landmarks for the summary ("Right ankle"). */
const NAMES: Record<LandmarkName, string> = {
  shoulder: 'shoulder',
  hip: 'hip',
  knee: 'knee',
  ankle: 'ankle',
  heel: 'heel',
  toe: 'toe',
};

/** Why a marker was not followed, in a clinician's words. */
export const NOT_FOLLOWED_WORDS: Record<NotFollowedReason, string> = {
  not_found: 'the marker could not be seen here (hidden by a limb, blurred, or out of the picture)',
  broke_links: 'what was found sat too far from the other markers of the same thigh, shank or foot to be this marker',
  on_other_marker: 'what was found was another marker',
};

const sideWord = (side: Side) => (side === 'left' ? 'Left' : 'Right');

/** "Right ankle". */
export const markerName = (side: Side, landmark: LandmarkName): string => `${sideWord(side)} ${NAMES[landmark]}`;

/** Whether a person decided this point: placed by hand (no origin = placed) or a proposal accepted. */
const byHand = (p: LandmarkPoint | undefined): boolean => !!p && p.origin !== 'followed' && p.origin !== 'proposed';

/** One marker not followed, with its frames still to check. */
export interface MarkerToCheck {
  side: Side;
  landmark: LandmarkName;
  frames: number[];
  /** "Right ankle not followed on 7 frames — check them". */
  text: string;
}

/** What the review has to check after following. */
export interface ToCheck {
  /** The entries still open, in frame order. */
  points: NotFollowedPoint[];
  /** Their frames, ascending, each once. */
  frames: number[];
  /** Per marker, in the order of the first frame each was lost on. */
  markers: MarkerToCheck[];
}

/**
 * The frames still to check: the server's list without those where the marks as shown now carry
 * that marker placed (or accepted) by hand.
 */
export function framesToCheck(notFollowed: readonly NotFollowedPoint[] | undefined, landmarks: readonly FrameLandmarks[]): ToCheck {
  const rows = new Map<string, FrameLandmarks>();
  for (const row of landmarks) rows.set(`${row.frame}:${row.side}`, row);
  const points = (notFollowed ?? [])
    .filter((p) => !byHand(rows.get(`${p.frame}:${p.side}`)?.points[p.landmark]))
    .sort((a, b) => a.frame - b.frame);
  const frames = [...new Set(points.map((p) => p.frame))];
  const byMarker = new Map<string, MarkerToCheck>();
  for (const p of points) {
    const key = `${p.side} ${p.landmark}`;
    let m = byMarker.get(key);
    if (!m) byMarker.set(key, (m = { side: p.side, landmark: p.landmark, frames: [], text: '' }));
    m.frames.push(p.frame);
  }
  const markers = [...byMarker.values()].map((m) => ({
    ...m,
    text: `${markerName(m.side, m.landmark)} not followed on ${m.frames.length} frame${m.frames.length === 1 ? '' : 's'} — check ${m.frames.length === 1 ? 'it' : 'them'}`,
  }));
  return { points, frames, markers };
}

/**
 * The frame to check after `frame` (`dir` 1) or before it (−1), wrapping round the clip; null when
 * there is none other than `frame`.
 */
export function nextToCheck(frames: readonly number[], frame: number, dir: -1 | 1 = 1): number | null {
  if (!frames.length) return null;
  if (dir === 1) {
    const after = frames.find((f) => f > frame);
    const next = after ?? frames[0]!;
    return next === frame ? null : next;
  }
  const before = [...frames].reverse().find((f) => f < frame);
  const prev = before ?? frames[frames.length - 1]!;
  return prev === frame ? null : prev;
}

/** A marker missing on the frame shown, with why in words. */
export interface MissingHere {
  side: Side;
  landmark: LandmarkName;
  /** "Right ankle: the marker could not be seen here (…). Place it by hand, or leave it out." */
  text: string;
}

/** The markers to place on `frame`, with why each was not followed. */
export function missingOnFrame(toCheck: ToCheck, frame: number): MissingHere[] {
  return toCheck.points
    .filter((p) => p.frame === frame)
    .map((p) => ({
      side: p.side,
      landmark: p.landmark,
      text: `${markerName(p.side, p.landmark)} needs placing: ${NOT_FOLLOWED_WORDS[p.reason]}.`,
    }));
}

/**
 * Gait events (placed, accepted or proposed) on a frame where a marker of their side was not
 * followed. The measures read landmarks only where they are: a measure read at such an event that
 * needs the missing marker leaves that step out (its note names the frames), it never fills the
 * marker in. One line per event: "Right toe-off on frame 40: no ankle — measures that need it
 * leave this step out until you place it."
 */
export function eventsMissingMarkers(toCheck: ToCheck, events: readonly GaitEventMark[]): string[] {
  const out: string[] = [];
  for (const e of [...events].sort((a, b) => a.frame - b.frame)) {
    const missing = toCheck.points.filter((p) => p.frame === e.frame && p.side === e.side).map((p) => NAMES[p.landmark]);
    if (!missing.length) continue;
    const list = missing.length === 1 ? missing[0]! : `${missing.slice(0, -1).join(', ')} and ${missing[missing.length - 1]!}`;
    out.push(
      `${sideWord(e.side)} ${GAIT_EVENT_LABELS[e.kind].toLowerCase()} on frame ${e.frame}: no ${list} — measures that need ${
        missing.length === 1 ? 'it' : 'them'
      } leave this step out until you place ${missing.length === 1 ? 'it' : 'them'}.`,
    );
  }
  return out;
}
