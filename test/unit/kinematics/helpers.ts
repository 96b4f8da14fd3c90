/**
 * Test helpers: place poses given in metres (y up, +x running direction) onto a 1280×720 frame at
 * 400 px per metre (REFERENCES.md scale example: 1 m over 400 px → 2.5 mm/px), in either running
 * direction, and build gait events. Fixtures only — no published data.
 */
import type { FrameLandmarks, FramePoint, GaitEventKind, GaitEventMark, LandmarkName, ScaleBar } from '../../../src/contracts/annotations';
import type { Direction, Side } from '../../../src/contracts/assessment';
import type { ClipMeasures, Measure, MeasureKey } from '../../../src/contracts/measures';
import { DEFAULT_REFERENCE_BANDS, type ClipMeasureInput } from '../../../src/kinematics';

export const W = 1280;
export const H = 720;
export const PX_PER_M = 400;
/** Hip column and ground row of the layout, px. */
const ORIGIN_X = 640;
const GROUND_Y = 680;

export type MetrePose = Partial<Record<LandmarkName, { x: number; y: number }>>;

/** Metres → frame fraction (origin top-left, y down), mirrored when running right to left. */
export function toFraction(p: { x: number; y: number }, direction: Direction, dxM = 0): FramePoint {
  const s = direction === 'left_to_right' ? 1 : -1;
  return { x: (ORIGIN_X + s * (p.x + dxM) * PX_PER_M) / W, y: (GROUND_Y - p.y * PX_PER_M) / H };
}

/** One side's landmarks on one frame from a metre pose. `dxM` shifts it forward (overground). */
export function landmarksAt(frame: number, side: Side, pose: MetrePose, direction: Direction, dxM = 0): FrameLandmarks {
  const points: FrameLandmarks['points'] = {};
  for (const [k, p] of Object.entries(pose) as [LandmarkName, { x: number; y: number }][]) points[k] = toFraction(p, direction, dxM);
  return { frame, side, points };
}

/** A 1 m scale bar spanning 400 px (horizontal, near the bottom of the frame). */
export const SCALE_1M_400PX: ScaleBar = { frame: 0, a: { x: 100 / W, y: 700 / H }, b: { x: 500 / W, y: 700 / H }, lengthM: 1 };

export const ev = (frame: number, side: Side, kind: GaitEventKind): GaitEventMark => ({ frame, side, kind });

/**
 * The REFERENCES.md timing example as events at 240 fps: stride 168 frames, step 84, contact 60.
 * Right IC at 0, right TO at 60, left IC at 84, left TO at 144, right IC at 168, … for `strides`
 * right strides, ending with a right IC.
 */
export function timingExampleEvents(strides: number, start = 0): GaitEventMark[] {
  const out: GaitEventMark[] = [];
  for (let k = 0; k < strides; k++) {
    const b = start + k * 168;
    out.push(
      ev(b, 'right', 'initial_contact'),
      ev(b + 60, 'right', 'toe_off'),
      ev(b + 84, 'left', 'initial_contact'),
      ev(b + 144, 'left', 'toe_off'),
    );
  }
  out.push(ev(start + strides * 168, 'right', 'initial_contact'));
  return out;
}

/** REFERENCES.md worked example, initial-contact frame (metres, y up). */
export const IC_POSE = {
  shoulder: { x: 0.1, y: 1.4 },
  hip: { x: 0, y: 0.9 },
  knee: { x: 0.2, y: 0.5 },
  ankle: { x: 0.3, y: 0.1 },
  heel: { x: 0.26, y: 0.05 },
  toe: { x: 0.45, y: 0.1 },
} as const;

/** REFERENCES.md worked example, toe-off frame (metres, y up; no heel/toe given). */
export const TO_POSE = {
  shoulder: { x: 0.09, y: 1.42 },
  hip: { x: 0, y: 0.92 },
  knee: { x: -0.17, y: 0.51 },
  ankle: { x: -0.45, y: 0.27 },
} as const;

/** Degrees from radians (independent of the module under test). */
export const deg = (r: number) => (r * 180) / Math.PI;

/**
 * A computeClipMeasures input at 240 fps on a 1280×720 frame, left to right, treadmill at 3.0 m/s
 * with the default bands and no scale bar unless overridden.
 */
export function clipInput(
  over: Partial<ClipMeasureInput> & { events?: GaitEventMark[]; landmarks?: FrameLandmarks[]; scale?: ScaleBar | null } = {},
): ClipMeasureInput {
  const { events = [], landmarks = [], scale = null, ...rest } = over;
  return {
    clipId: 7,
    annotations: { landmarks, events, scale },
    frameSize: { width: W, height: H },
    fps: 240,
    direction: 'left_to_right',
    surface: 'treadmill',
    beltSpeedMps: 3.0,
    bands: DEFAULT_REFERENCE_BANDS,
    ...rest,
  };
}

/** The one measure of a key and side (null: both-sides measures); throws when absent. */
export function measureOf(r: ClipMeasures, key: MeasureKey, side: Side | null = null): Measure {
  const m = r.measures.find((x) => x.key === key && x.side === side);
  if (!m) throw new Error(`no ${key} ${side}`);
  return m;
}
