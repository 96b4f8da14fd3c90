/**
 * Proposed gait events from landmark positions over frames. Pure.
 *
 * Per side: the coordinate method finds one contact window and one toe-off window per cycle, the
 * running refinements place the events inside them (rules in `event-rules.ts`): initial contact at
 * the heel's vertical minimum, toe-off at peak knee extension — or, without knee and ankle, at the
 * coordinate-method toe-off itself (`rule: 'coordinate'`). A side without its own hip on a frame
 * uses the other side's (one pelvis, seen from the side). Positions are plane pixels (y up, +x the
 * running direction), so a clip of a runner going left gives the same events as one going right.
 */
import type { FrameLandmarks, GaitEventMark, LandmarkName } from '../contracts/annotations';
import { SIDES, type Side } from '../contracts/assessment';
import { coordinateContacts, coordinateToeOffs, heelStrikeFrame, kneeExtensionToeOff } from './event-rules';
import { isFinitePoint, planeScale, type PlaneFrame, type Point } from './geometry';
import { kneeFlexionDeg } from './angles';

/** Frames of hip, heel and toe in a row a side needs, in seconds of clip: one slow stride (150 steps/min). */
export const PROPOSAL_MIN_SECONDS = 0.8;
/** Half-width of the window an extremum must dominate, s: one per cycle at any running cadence. */
export const EXTREMUM_HALF_WINDOW_S = 0.2;

/** Which rule placed a proposed event. */
export type ProposalRule = 'heel_minimum' | 'knee_extension' | 'coordinate';

/** Knee flexion gained since peak extension that shows a clip's last frames are in swing, degrees. */
export const SWING_FLEXION_DEG = 5;

/** A proposed event and the rule that placed it. */
export interface ProposedEvent extends GaitEventMark {
  rule: ProposalRule;
}

/** One side's series over frames 0 … frameCount−1 (plane pixels; NaN where a landmark is missing). */
export interface SideTracks {
  /** heel.x − hip.x. */
  heelRel: number[];
  /** toe.x − hip.x. */
  toeRel: number[];
  /** heel.y (up). */
  heelHeight: number[];
  /** Knee flexion, degrees (hip, knee, ankle). */
  kneeFlexion: number[];
}

/** What {@link proposeGaitEvents} found. */
export interface GaitEventProposals {
  /** Proposed events of both sides, by frame. */
  events: ProposedEvent[];
  /** Per side, the longest run of consecutive frames with hip, heel and toe. */
  usableRun: Record<Side, number>;
}

/** Frames in a row with hip, heel and toe a side needs for proposals at `fps`. */
export function minProposalFrames(fps: number): number {
  return Math.max(3, Math.ceil(PROPOSAL_MIN_SECONDS * fps));
}

type PlanePts = Partial<Record<LandmarkName, Point>>;

function toPlane(points: FrameLandmarks['points'] | undefined, s: { x: number; y: number }): PlanePts {
  const out: PlanePts = {};
  if (!points) return out;
  for (const name of ['hip', 'knee', 'ankle', 'heel', 'toe'] as const) {
    const p = points[name];
    if (isFinitePoint(p)) out[name] = { x: p.x * s.x, y: p.y * s.y };
  }
  return out;
}

/** Both sides' series from landmarks (frames past `frameCount` are ignored). */
export function sideTracks(landmarks: readonly FrameLandmarks[], plane: PlaneFrame, frameCount: number): Record<Side, SideTracks> {
  const n = Math.max(0, Math.floor(frameCount));
  const s = planeScale(plane);
  const by: Record<Side, (PlanePts | undefined)[]> = { left: new Array(n), right: new Array(n) };
  for (const l of landmarks) {
    if (!Number.isInteger(l.frame) || l.frame < 0 || l.frame >= n || !(SIDES as readonly string[]).includes(l.side)) continue;
    by[l.side][l.frame] = toPlane(l.points, s);
  }
  const tracks = {} as Record<Side, SideTracks>;
  for (const side of SIDES) {
    const other = side === 'left' ? 'right' : 'left';
    const t: SideTracks = { heelRel: [], toeRel: [], heelHeight: [], kneeFlexion: [] };
    for (let f = 0; f < n; f++) {
      const p = by[side][f];
      const hip = p?.hip ?? by[other][f]?.hip;
      t.heelRel.push(p?.heel && hip ? p.heel.x - hip.x : NaN);
      t.toeRel.push(p?.toe && hip ? p.toe.x - hip.x : NaN);
      t.heelHeight.push(p?.heel ? p.heel.y : NaN);
      t.kneeFlexion.push(p?.hip && p.knee && p.ankle ? kneeFlexionDeg(p.hip, p.knee, p.ankle) : NaN);
    }
    tracks[side] = t;
  }
  return tracks;
}

/** Longest run of consecutive frames where heel.x − hip.x, toe.x − hip.x and heel height are all known. */
export function longestUsableRun(t: SideTracks): number {
  let best = 0;
  let run = 0;
  for (let f = 0; f < t.heelRel.length; f++) {
    run = Number.isFinite(t.heelRel[f]!) && Number.isFinite(t.toeRel[f]!) && Number.isFinite(t.heelHeight[f]!) ? run + 1 : 0;
    if (run > best) best = run;
  }
  return best;
}

/**
 * Proposed initial contacts and toe-offs of one side (see the file header). Events alternate
 * contact → toe-off → contact; a second event of the same kind in a row is dropped.
 */
export function proposeSideEvents(t: SideTracks, fps: number, side: Side): ProposedEvent[] {
  const w = Math.max(2, Math.round(EXTREMUM_HALF_WINDOW_S * fps));
  const ics = coordinateContacts(t.heelRel, w);
  const tos = coordinateToeOffs(t.toeRel, w);
  const found: ProposedEvent[] = [];
  const strikes: number[] = [];
  for (const c of ics) {
    const nextTo = tos.find((d) => d > c) ?? t.heelHeight.length;
    const f = heelStrikeFrame(t.heelHeight, c, nextTo);
    if (f === null) continue;
    strikes.push(f);
    found.push({ frame: f, side, kind: 'initial_contact', rule: 'heel_minimum' });
  }
  for (const d of tos) {
    const lastStrike = [...strikes].reverse().find((f) => f < d);
    const after = lastStrike ?? d - 2 * w;
    const knee = kneeExtensionToeOff(t.kneeFlexion, d, after);
    found.push(
      knee === null
        ? { frame: d, side, kind: 'toe_off', rule: 'coordinate' }
        : { frame: knee, side, kind: 'toe_off', rule: 'knee_extension' },
    );
  }
  // The clip may end after a toe-off but before the toe's rearmost position: look back from the last
  // frame when the knee has clearly flexed into swing since its last peak extension.
  const lastStrike = strikes[strikes.length - 1];
  const last = t.kneeFlexion.length - 1;
  if (lastStrike !== undefined && !tos.some((d) => d > lastStrike)) {
    const knee = kneeExtensionToeOff(t.kneeFlexion, last, lastStrike);
    if (
      knee !== null &&
      knee < last - 1 &&
      t.kneeFlexion[last]! - Math.min(t.kneeFlexion[knee]!, t.kneeFlexion[knee + 1]!) >= SWING_FLEXION_DEG
    )
      found.push({ frame: knee, side, kind: 'toe_off', rule: 'knee_extension' });
  }
  found.sort((a, b) => a.frame - b.frame);
  const out: ProposedEvent[] = [];
  for (const e of found) {
    const prev = out[out.length - 1];
    if (prev && (prev.kind === e.kind || prev.frame === e.frame)) continue;
    out.push(e);
  }
  return out;
}

/** Proposed events of both sides from a clip's landmarks (see the file header). */
export function proposeGaitEvents(
  landmarks: readonly FrameLandmarks[],
  plane: PlaneFrame,
  fps: number,
  frameCount: number,
): GaitEventProposals {
  const tracks = sideTracks(landmarks, plane, frameCount);
  const need = minProposalFrames(fps);
  const events: ProposedEvent[] = [];
  const usableRun = {} as Record<Side, number>;
  for (const side of SIDES) {
    usableRun[side] = longestUsableRun(tracks[side]);
    if (usableRun[side] >= need) events.push(...proposeSideEvents(tracks[side], fps, side));
  }
  events.sort((a, b) => a.frame - b.frame || a.side.localeCompare(b.side));
  return { events, usableRun };
}
