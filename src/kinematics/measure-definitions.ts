/**
 * What each measure is, independent of any clip: key, label, unit, the gait event it is read at,
 * whether it is per side; plus the version and limits every clip's measures share. Pure.
 */
import type { FrameLandmarks, GaitEventKind, GaitEventMark, ScaleBar } from '../contracts/annotations';
import type { Direction, FilmSurface, Side } from '../contracts/assessment';
import type { MeasureKey, ReferenceBand } from '../contracts/measures';
import { UNITS } from './bands';

/** Version of this implementation, stored with every measures snapshot. */
export const KINEMATICS_VERSION = '1.1.0';

/** Fewer steps than this behind a mean earn a note (Dingenen et al. 2018 averaged ≥ 7 steps). */
export const MIN_STEPS_FOR_RELIABLE_MEAN = 7;

/** Peak knee flexion needs the knee angle at least every this fraction of stance. */
export const PEAK_KNEE_MAX_GAP_FRACTION = 0.1;
/** Vertical oscillation needs the hip marked at least every this fraction of the stride. */
export const OSCILLATION_MAX_GAP_FRACTION = 0.05;

/** Everything {@link computeClipMeasures} needs about one clip. */
export interface ClipMeasureInput {
  clipId: number;
  annotations: { landmarks: FrameLandmarks[]; events: GaitEventMark[]; scale: ScaleBar | null };
  /** Working frame size in pixels (the frames the coach marked). */
  frameSize: { width: number; height: number };
  /** Frames per second of the working frames (used when `timestampsMs` is absent or unusable). */
  fps: number;
  /** Per-frame presentation times, ms (the manifest's `timestampsMs`), index = frame. */
  timestampsMs?: number[];
  direction: Direction;
  surface: FilmSurface;
  /** Treadmill belt speed, m/s (null when unknown or overground). */
  beltSpeedMps: number | null;
  /** Bands to evaluate against; the first band with the measure's key and unit applies. */
  bands: ReferenceBand[];
  /** Frames in the clip, to reject events past the end (optional; `timestampsMs.length` otherwise). */
  frameCount?: number;
}

/** What a measure is, independent of any clip. */
export interface MeasureDefinition {
  key: MeasureKey;
  label: string;
  unit: string;
  event: GaitEventKind | null;
  /** One measure per side (left, right) rather than one for both. */
  perSide: boolean;
}

const def = (key: MeasureKey, label: string, unit: string, event: GaitEventKind | null, perSide: boolean): MeasureDefinition => ({
  key,
  label,
  unit,
  event,
  perSide,
});

/** Every measure, in display order. */
export const MEASURE_DEFINITIONS: Readonly<Record<MeasureKey, MeasureDefinition>> = {
  hip_extension_toe_off: def('hip_extension_toe_off', 'Hip extension at toe-off (thigh from vertical)', UNITS.deg, 'toe_off', true),
  hip_extension_toe_off_rel_trunk: def(
    'hip_extension_toe_off_rel_trunk',
    'Hip extension at toe-off relative to the trunk',
    UNITS.deg,
    'toe_off',
    true,
  ),
  knee_flexion_initial_contact: def('knee_flexion_initial_contact', 'Knee flexion at initial contact', UNITS.deg, 'initial_contact', true),
  knee_flexion_peak_stance: def('knee_flexion_peak_stance', 'Peak knee flexion in stance', UNITS.deg, null, true),
  shank_angle_initial_contact: def('shank_angle_initial_contact', 'Shank angle at initial contact', UNITS.deg, 'initial_contact', true),
  foot_angle_initial_contact: def('foot_angle_initial_contact', 'Foot angle at initial contact', UNITS.deg, 'initial_contact', true),
  trunk_lean: def('trunk_lean', 'Trunk lean over stance', UNITS.deg, null, true),
  heel_ahead_of_hip_initial_contact: def(
    'heel_ahead_of_hip_initial_contact',
    'Heel ahead of hip at initial contact',
    UNITS.m,
    'initial_contact',
    true,
  ),
  cadence: def('cadence', 'Cadence', UNITS.stepsPerMin, null, false),
  step_time: def('step_time', 'Step time', UNITS.s, null, false),
  stride_time: def('stride_time', 'Stride time', UNITS.s, null, false),
  step_length: def('step_length', 'Step length', UNITS.m, null, false),
  stride_length: def('stride_length', 'Stride length', UNITS.m, null, false),
  contact_time: def('contact_time', 'Contact time', UNITS.s, null, true),
  flight_time: def('flight_time', 'Flight time', UNITS.s, null, false),
  duty_factor: def('duty_factor', 'Duty factor', UNITS.pct, null, true),
  vertical_oscillation: def('vertical_oscillation', 'Vertical oscillation of the hip', UNITS.cm, null, false),
  symmetry_contact_time: def('symmetry_contact_time', 'Left/right symmetry of contact time', UNITS.pct, null, false),
  symmetry_hip_extension_toe_off: def(
    'symmetry_hip_extension_toe_off',
    'Left/right symmetry of hip extension at toe-off',
    UNITS.pct,
    'toe_off',
    false,
  ),
};

/** Measure keys in display order. */
export const MEASURE_KEYS = Object.keys(MEASURE_DEFINITIONS) as MeasureKey[];

/** Sides in display order: left, then right. */
export const SIDE_ORDER: readonly Side[] = ['left', 'right'];
