/**
 * Frame timing, pixel layout and the ground-truth record of a synthetic runner clip. Pure.
 * The runner is a test fixture with known truth — not a real person or a published dataset.
 */
import { sideAngles, type SideAngles } from '../../src/kinematics/angles';
import { pixelToSagittal, type Facing, type Point } from '../../src/kinematics/geometry';
import { hiddenFarMarkers, shakeOffsetPx, type FarMarker, type RealismOptions } from './realism';
import { createRunnerModel, type RunnerModel, type RunnerPose } from './runner-model';

/** What to render: frame size and rate, length, the runner's hip extension and direction. */
export interface ClipSpec {
  fps: number;
  width: number;
  height: number;
  seconds: number;
  /** Hip extension at toe-off, degrees (positive = extension). */
  hipExtensionDeg: number;
  facing: Facing;
  /** Belt speed, m/s (default 3.0). */
  beltSpeedMps?: number;
  /** What a phone camera adds (texture, blur, noise, flicker, occlusion, shake); none by default. */
  realism?: RealismOptions;
  /** Whether tape markers are drawn on the joints (default true; false = a clip with no markers). */
  tapeMarkers?: boolean;
}

/** Where metres land in the image. */
export interface Layout {
  /** Pixels per metre: 400 at 1280×720, scaled with the frame (the smaller of width and height ratios). */
  pxPerMetre: number;
  /** Belt surface row, px from the top. */
  beltY: number;
  /** Column of the hip (x = 0 in metres), px from the left. */
  originX: number;
  facing: Facing;
}

/** Pixel layout for a frame size. */
export function layoutFor(width: number, height: number, facing: Facing): Layout {
  return {
    pxPerMetre: 400 * Math.min(width / 1280, height / 720),
    beltY: height - Math.round(0.03 * height),
    originX: width / 2,
    facing,
  };
}

/** Metres (y up, +x running direction) → pixels (origin top-left, y down), mirrored when facing left. */
export function toPixels(p: Point, layout: Layout): Point {
  const dir = layout.facing === 'right' ? 1 : -1;
  return { x: layout.originX + dir * p.x * layout.pxPerMetre, y: layout.beltY - p.y * layout.pxPerMetre };
}

/** Stride and contact rounded to whole frames (stride to an even count), so every event is a frame. */
export interface FrameTiming {
  strideFrames: number;
  contactFrames: number;
  /** Frames from the first near-leg initial contact (at or before frame 0) to frame 0. */
  startOffsetFrames: number;
  stridePeriodS: number;
  contactTimeS: number;
}

/** Default stride period and contact time before rounding: 0.7 s (171.43 steps/min) and 0.25 s. */
export const NOMINAL_STRIDE_S = 0.7;
export const NOMINAL_CONTACT_S = 0.25;

/** Rounds the nominal timing to whole frames at `fps`; exact at 60, 100, 120 and 240 fps. */
export function frameTiming(fps: number): FrameTiming {
  const strideFrames = 2 * Math.round((fps * NOMINAL_STRIDE_S) / 2);
  const contactFrames = Math.round(fps * NOMINAL_CONTACT_S);
  if (contactFrames < 1 || 2 * contactFrames >= strideFrames) throw new RangeError(`fps ${fps} is too low to show flight`);
  return {
    strideFrames,
    contactFrames,
    startOffsetFrames: Math.round(0.15 * strideFrames),
    stridePeriodS: strideFrames / fps,
    contactTimeS: contactFrames / fps,
  };
}

export type LandmarkName = 'shoulder' | 'hip' | 'knee' | 'ankle' | 'heel' | 'toe';
export type SideLandmarkSet = Record<LandmarkName, Point>;

export interface GroundTruthFrame {
  index: number;
  timeMs: number;
  /** Pixels, origin top-left, y down. The far side's hip and shoulder coincide with the near ones. */
  landmarks: { near: SideLandmarkSet; far: SideLandmarkSet };
  /** Fractions of width and height (0–1), as the app stores landmarks. */
  landmarksNormalised: { near: SideLandmarkSet; far: SideLandmarkSet };
  /** Far-side markers the near leg, arm or trunk covers on this frame (none when occlusion is off). */
  hiddenFar: FarMarker[];
  /** Camera shake offset already included in the landmarks, px. */
  cameraOffsetPx: Point;
}

export interface GroundTruth {
  version: 1;
  note: string;
  fps: number;
  width: number;
  height: number;
  frameCount: number;
  durationS: number;
  pxPerMetre: number;
  beltSpeedMps: number;
  beltLineY: number;
  facing: Facing;
  /** Body side nearer the camera: facing right shows the right side. */
  nearSide: 'left' | 'right';
  cadenceStepsPerMin: number;
  stridePeriodS: number;
  contactTimeS: number;
  flightTimeS: number;
  dutyFactor: number;
  hipExtensionRequestedDeg: number;
  /** Realism options the clip was rendered with. */
  realism: RealismOptions;
  /** −thigh angle at every toe-off frame in the clip, per side. */
  hipExtensionAtToeOffDeg: { near: number[]; far: number[] };
  conventions: string;
  frames: GroundTruthFrame[];
  /** Frame indices: initial contact = first frame on the belt; toe-off = last frame on the belt. */
  events: { near: { initialContact: number[]; toeOff: number[] }; far: { initialContact: number[]; toeOff: number[] } };
  angles: Array<{ index: number; near: SideAngles; far: SideAngles }>;
}

const round = (x: number, digits: number) => Math.round(x * 10 ** digits) / 10 ** digits;
const roundPoint = (p: Point, digits: number): Point => ({ x: round(p.x, digits), y: round(p.y, digits) });
const roundAngles = (a: SideAngles): SideAngles => ({
  thighDeg: round(a.thighDeg, 4),
  kneeFlexionDeg: round(a.kneeFlexionDeg, 4),
  shankDeg: round(a.shankDeg, 4),
  trunkDeg: round(a.trunkDeg, 4),
  footDeg: round(a.footDeg, 4),
});

/** The model and timing for a clip spec. */
export function modelForClip(spec: ClipSpec): { model: RunnerModel; timing: FrameTiming; layout: Layout; frameCount: number } {
  const timing = frameTiming(spec.fps);
  const model = createRunnerModel({
    hipExtensionDeg: spec.hipExtensionDeg,
    beltSpeedMps: spec.beltSpeedMps ?? 3.0,
    stridePeriodS: timing.stridePeriodS,
    contactTimeS: timing.contactTimeS,
  });
  return { model, timing, layout: layoutFor(spec.width, spec.height, spec.facing), frameCount: Math.round(spec.seconds * spec.fps) };
}

/** Model time of frame i (s); near-leg contacts at whole strides. */
export function frameTimeS(i: number, spec: ClipSpec, timing: FrameTiming): number {
  return (timing.startOffsetFrames + i) / spec.fps;
}

/** Landmarks of one side of a pose in pixels, moved by the camera offset (shake) when given. */
export function sideLandmarksPx(pose: RunnerPose, side: 'near' | 'far', layout: Layout, offset: Point = { x: 0, y: 0 }): SideLandmarkSet {
  const leg = pose[side];
  const at = (p: Point) => {
    const q = toPixels(p, layout);
    return { x: q.x + offset.x, y: q.y + offset.y };
  };
  return {
    shoulder: at(pose.shoulder),
    hip: at(pose.hip),
    knee: at(leg.knee),
    ankle: at(leg.ankle),
    heel: at(leg.heel),
    toe: at(leg.toe),
  };
}

/** Near-side marker radius in px (1.6 cm, at least 2.5 px); far-side markers are 75 % of it. */
export function markerRadiusPx(pxPerMetre: number): number {
  return Math.max(2.5, 0.016 * pxPerMetre);
}

function normalise(set: SideLandmarkSet, width: number, height: number): SideLandmarkSet {
  const out = {} as SideLandmarkSet;
  for (const [k, p] of Object.entries(set) as Array<[LandmarkName, Point]>)
    out[k] = { x: round(p.x / width, 6), y: round(p.y / height, 6) };
  return out;
}

function roundSet(set: SideLandmarkSet): SideLandmarkSet {
  const out = {} as SideLandmarkSet;
  for (const [k, p] of Object.entries(set) as Array<[LandmarkName, Point]>) out[k] = roundPoint(p, 3);
  return out;
}

/** Signed angles of a pixel landmark set, after normalising the running direction. */
export function anglesFromPixels(set: SideLandmarkSet, facing: Facing): SideAngles {
  const s = (p: Point) => pixelToSagittal(p, facing);
  return sideAngles({
    shoulder: s(set.shoulder),
    hip: s(set.hip),
    knee: s(set.knee),
    ankle: s(set.ankle),
    heel: s(set.heel),
    toe: s(set.toe),
  });
}

/** Builds the ground truth of a clip: landmarks, events and angles for every frame. */
export function buildGroundTruth(spec: ClipSpec): GroundTruth {
  const { model, timing, layout, frameCount } = modelForClip(spec);
  const frames: GroundTruthFrame[] = [];
  const angles: GroundTruth['angles'] = [];
  const events: GroundTruth['events'] = { near: { initialContact: [], toeOff: [] }, far: { initialContact: [], toeOff: [] } };
  const half = timing.strideFrames / 2;
  for (let i = 0; i < frameCount; i++) {
    const pose = model.pose(frameTimeS(i, spec, timing));
    const offset = shakeOffsetPx(i, spec.fps, spec.width, spec.realism);
    const near = sideLandmarksPx(pose, 'near', layout, offset);
    const far = sideLandmarksPx(pose, 'far', layout, offset);
    const occluded = spec.realism?.occlusion !== false;
    frames.push({
      index: i,
      timeMs: round((i * 1000) / spec.fps, 3),
      landmarks: { near: roundSet(near), far: roundSet(far) },
      landmarksNormalised: { near: normalise(near, spec.width, spec.height), far: normalise(far, spec.width, spec.height) },
      hiddenFar: occluded ? hiddenFarMarkers(pose, layout, 0.75 * markerRadiusPx(layout.pxPerMetre)) : [],
      cameraOffsetPx: roundPoint(offset, 3),
    });
    angles.push({ index: i, near: roundAngles(anglesFromPixels(near, spec.facing)), far: roundAngles(anglesFromPixels(far, spec.facing)) });
    const nearFrame = (timing.startOffsetFrames + i) % timing.strideFrames;
    const farFrame = (timing.startOffsetFrames + i + half) % timing.strideFrames;
    if (nearFrame === 0) events.near.initialContact.push(i);
    if (nearFrame === timing.contactFrames) events.near.toeOff.push(i);
    if (farFrame === 0) events.far.initialContact.push(i);
    if (farFrame === timing.contactFrames) events.far.toeOff.push(i);
  }
  return {
    version: 1,
    note: 'Synthetic runner generated by scripts/demo-clip: a test fixture with known truth, not a real person or a published dataset.',
    fps: spec.fps,
    width: spec.width,
    height: spec.height,
    frameCount,
    durationS: frameCount / spec.fps,
    pxPerMetre: layout.pxPerMetre,
    beltSpeedMps: model.beltSpeedMps,
    beltLineY: layout.beltY,
    facing: spec.facing,
    nearSide: spec.facing === 'right' ? 'right' : 'left',
    cadenceStepsPerMin: round(model.cadenceStepsPerMin, 3),
    stridePeriodS: model.stridePeriodS,
    contactTimeS: model.contactTimeS,
    flightTimeS: round(model.flightTimeS, 6),
    dutyFactor: round(model.dutyFactor, 6),
    hipExtensionRequestedDeg: spec.hipExtensionDeg,
    realism: spec.realism ?? {},
    hipExtensionAtToeOffDeg: {
      near: events.near.toeOff.map((i) => round(-angles[i]!.near.thighDeg, 4)),
      far: events.far.toeOff.map((i) => round(-angles[i]!.far.thighDeg, 4)),
    },
    conventions:
      'Angles in degrees from landmarks in a y-up plane with +x the running direction (REFERENCES.md): thigh = hip→knee from vertical (+ flexion), ' +
      'shank = knee→ankle from vertical (+ ankle ahead), knee flexion = thigh − shank, trunk = hip→shoulder from vertical (+ forward), foot = heel→toe from horizontal (+ toe up).',
    frames,
    events,
    angles,
  };
}
