/**
 * Pure sagittal-plane kinematics shared by client and server (no Angular, no Node, no DOM):
 * - geometry: image fractions (`FramePoint`, y down) vs the y-up plane (`PlanePoint<'px' | 'm'>`,
 *   +x = running direction), conversion via frame size, direction and the scale bar;
 * - angles: signed segment and joint angles (DESIGN.md / REFERENCES.md conventions);
 * - pose: frame landmarks → plane poses → angles (one path for measures and overlay);
 * - events: validation, stances / flights / steps / strides, frame timing;
 * - measure-definitions: what each measure is (key, label, unit, event, per side), version, limits;
 * - measures: `computeClipMeasures` (every MeasureKey, mean ± sample SD, or not_enough_data), built
 *   from frame-angles (angles per frame, chart samples), angle-measures (per side at events and over
 *   stance), step-timing (cadence, times, lengths, oscillation) and measure-context (shared
 *   builders: mean ± SD and reference band per measure) — those four are internal;
 * - bands: cited default reference bands, `evaluateBand`, foot-strike classifier;
 * - visit-statistics: a visit's step-weighted means; comparison: verdicts and directions of a re-test;
 * - spring-mass: the spring-mass vertical-oscillation estimate;
 * - overlay: `drawOverlay` on any Canvas-2D-like context and its pure layout; overlay-ghost: the
 *   other visit's skeleton, dashed and lighter, for the Re-test comparison.
 * - angle-gauge: three-point included angles (the Angle gauge tool), drawn by overlay-gauges;
 * - event-names: the gait events on a frame in words ("Right toe-off · step 3").
 * - event-rules / event-proposals: proposed initial contacts and toe-offs from heel, toe, hip (and
 *   knee) positions over frames (coordinate method, refined for running); proposal-merge: adding
 *   them to a clip's events without touching placed or accepted ones;
 * - gait-cycle: angles normalised 0–100 % from initial contact to the next, mean ± SD per side.
 */
export * from './geometry';
export * from './angles';
export * from './pose';
export * from './stats';
export * from './events';
export * from './bands';
export * from './spring-mass';
export * from './measure-definitions';
export * from './measures';
export * from './overlay';
export * from './overlay-labels';
export * from './overlay-ghost';
export * from './visit-statistics';
export * from './comparison';
export * from './format';
export * from './angle-gauge';
export * from './overlay-gauges';
export * from './event-names';
export * from './event-rules';
export * from './event-proposals';
export * from './proposal-merge';
export * from './gait-cycle';
