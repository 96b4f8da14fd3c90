/**
 * The angle measures of one side (hip extension at toe-off, relative to the trunk, knee flexion at
 * contact and its peak in stance, shank and foot angle, trunk lean, heel ahead of hip) through
 * computeClipMeasures: values against angles recomputed with atan2 from REFERENCES.md's worked
 * example ([calc]) or poses chosen here, and the explanation texts the app and the PDF show, word for
 * word where they carry the definition (which landmarks, which event, which frames).
 */
import { describe, expect, it } from 'vitest';
import type { FrameLandmarks } from '../../../src/contracts/annotations';
import { computeClipMeasures } from '../../../src/kinematics';
import { angleMeasures } from '../../../src/kinematics/angle-measures';
import { buildGaitCycles, makeFrameClock } from '../../../src/kinematics/events';
import { FrameStore } from '../../../src/kinematics/frame-angles';
import { clipInput, deg, IC_POSE, landmarksAt, measureOf, SCALE_1M_400PX, TO_POSE, timingExampleEvents, type MetrePose } from './helpers';

const THIGH_NOTE =
  'Thigh = hip→knee from the global vertical (+ flexion, − extension), not from the pelvis: 2D thigh-from-vertical overstates hip extension relative to the pelvis by about the pelvic anterior tilt.';
const HIP_EXT = `Hip extension = −thigh angle on each toe-off frame, so extension reads positive and a hip that stays flexed reads negative. ${THIGH_NOTE} Mean ± SD (sample SD) over toe-offs.`;
const HIP_REL =
  'Hip extension relative to the trunk line = −(thigh + trunk lean) at toe-off (trunk = hip→shoulder from vertical, + forward). A forward lean lowers it; it does not see the pelvis, so pelvic tilt or lumbar arching under an upright trunk still counts as extension here.';
const KNEE_IC =
  'Knee flexion = thigh − shank on each initial-contact frame (0° = straight) = 180° − the included hip–knee–ankle angle. Mean ± SD over contacts.';
const SHANK_IC =
  'Shank = knee→ankle from vertical on each initial-contact frame, + when the ankle is ahead of the knee (0° = vertical tibia at landing).';
const FOOT_IC =
  'Foot angle = heel→toe from horizontal on each initial-contact frame, + toe up. Foot strike by the cut-offs of Mo et al. 2021 (forefoot ≤ −0.8°, rearfoot ≥ 7.4°, midfoot between), which assume the angle relative to standing posture; this angle is relative to the horizontal (marker offsets of a standing frame not removed).';
const HEEL =
  'Heel x − hip x on each initial-contact frame, metres along the running direction (+ = heel lands ahead of the hip), converted with the scale bar (m per pixel); assumes the foot lands in the calibrated plane.';
const PEAK =
  'Largest knee flexion (thigh − shank) over the frames of each stance, initial contact → toe-off; needs hip, knee and ankle marked at least every 10 % of the stance so the peak is not missed. Mean ± SD over stances.';
const trunkText = (side: string, frames: number) =>
  `Trunk lean = hip→shoulder from vertical (+ forward), averaged over the marked frames of each ${side} stance (initial contact → toe-off), then mean ± SD over stances (${frames} frames in all).`;

// Independent angles (metres, y up, +x running direction).
const thighOf = (p: MetrePose) => deg(Math.atan2(p.knee!.x - p.hip!.x, p.hip!.y - p.knee!.y));
const shankOf = (p: MetrePose) => deg(Math.atan2(p.ankle!.x - p.knee!.x, p.knee!.y - p.ankle!.y));
const trunkOf = (p: MetrePose) => deg(Math.atan2(p.shoulder!.x - p.hip!.x, p.shoulder!.y - p.hip!.y));
const footOf = (p: MetrePose) => deg(Math.atan2(p.toe!.y - p.heel!.y, p.toe!.x - p.heel!.x));

/**
 * Two strides of the REFERENCES.md timing example (right IC 0, 168, 336; right TO 60, 228; left IC
 * 84, 252; left TO 144, 312) with the worked example's IC pose on IC frames and TO pose on TO frames;
 * `pose` may replace a pose per event.
 */
function worked(
  pose: (frame: number, side: 'left' | 'right', kind: string) => MetrePose | null = (_f, _s, k) =>
    (k === 'initial_contact' ? IC_POSE : TO_POSE) as MetrePose,
  extra: FrameLandmarks[] = [],
) {
  const events = timingExampleEvents(2);
  const landmarks: FrameLandmarks[] = [];
  for (const e of events) {
    const p = pose(e.frame, e.side, e.kind);
    if (p) landmarks.push(landmarksAt(e.frame, e.side, p, 'left_to_right'));
  }
  return clipInput({ events, landmarks: [...landmarks, ...extra], scale: SCALE_1M_400PX });
}

describe('[calc] angle measures of the worked example: values and the texts users read', () => {
  it('hip extension at toe-off = −thigh = 22.521°, relative to the trunk −(thigh + trunk) = 12.317°, exact explanations', () => {
    const r = computeClipMeasures(worked());
    for (const side of ['left', 'right'] as const) {
      const hip = measureOf(r, 'hip_extension_toe_off', side);
      expect(hip.mean).toBeCloseTo(-thighOf(TO_POSE), 9);
      expect(hip.mean).toBeCloseTo(22.521, 3); // REFERENCES.md
      expect(hip.n).toBe(2);
      expect(hip.derivation).toBe(HIP_EXT);
      const rel = measureOf(r, 'hip_extension_toe_off_rel_trunk', side);
      expect(rel.mean).toBeCloseTo(-(thighOf(TO_POSE) + trunkOf(TO_POSE)), 9);
      expect(rel.mean).toBeCloseTo(12.317, 3); // REFERENCES.md
      expect(rel.derivation).toBe(HIP_REL);
    }
  });

  it('knee flexion 12.529°, shank 14.036°, foot 14.744° (3 rearfoot contacts), heel 0.260 m ahead of the hip at 2.50 mm/px', () => {
    const r = computeClipMeasures(worked());
    const knee = measureOf(r, 'knee_flexion_initial_contact', 'right');
    expect(knee).toMatchObject({ status: 'ok', n: 3, derivation: KNEE_IC });
    expect(knee.mean).toBeCloseTo(thighOf(IC_POSE) - shankOf(IC_POSE), 9);
    const shank = measureOf(r, 'shank_angle_initial_contact', 'right');
    expect(shank).toMatchObject({ status: 'ok', n: 3, derivation: SHANK_IC });
    expect(shank.mean).toBeCloseTo(shankOf(IC_POSE), 9);
    const foot = measureOf(r, 'foot_angle_initial_contact', 'right');
    expect(foot.mean).toBeCloseTo(footOf(IC_POSE), 9);
    expect(foot.derivation).toBe(`${FOOT_IC} Contacts: 3 rearfoot; the mean classifies as rearfoot.`);
    const heel = measureOf(r, 'heel_ahead_of_hip_initial_contact', 'right');
    // Heel x 0.26 m − hip x 0 m; the 1 m bar spans 400 px → 1000 ÷ 400 = 2.50 mm/px.
    expect(heel.mean).toBeCloseTo(0.26 - 0, 9);
    expect(heel.derivation).toBe(`${HEEL} Scale 2.50 mm/px.`);
  });

  it('trunk lean = mean over each stance of its marked frames (IC 11.310°, TO 10.204°), one value per stance of that side only', () => {
    const r = computeClipMeasures(worked());
    const t = measureOf(r, 'trunk_lean', 'right');
    expect(t).toMatchObject({ status: 'ok', n: 2, derivation: trunkText('right', 4) });
    expect(t.mean).toBeCloseTo((trunkOf(IC_POSE) + trunkOf(TO_POSE)) / 2, 9);
    expect(t.values).toHaveLength(2);
    // One right stance with no shoulder marked: one value from the other stance, 2 frames counted.
    const noShoulder = (f: number, s: 'left' | 'right', k: string): MetrePose => {
      const p = (k === 'initial_contact' ? IC_POSE : TO_POSE) as MetrePose;
      if (s === 'right' && f >= 168) {
        const { shoulder: _drop, ...rest } = p;
        return rest;
      }
      return p;
    };
    const one = measureOf(computeClipMeasures(worked(noShoulder)), 'trunk_lean', 'right');
    expect(one).toMatchObject({ status: 'ok', n: 1, derivation: trunkText('right', 2) });
    expect(one.mean).toBeCloseTo((trunkOf(IC_POSE) + trunkOf(TO_POSE)) / 2, 9);
  });
});

describe('the trunk from the other side (fallback)', () => {
  it("[calc] right toe-offs without a right shoulder take the left side's shoulder and hip on the same frame, said so", () => {
    const { shoulder: _s, ...toNoShoulder } = TO_POSE;
    const { shoulder: _t, ...icNoShoulder } = IC_POSE;
    // The left side's trunk on the right toe-off frames: hip (0, 0.9), shoulder (0.15, 1.4) → atan2(0.15, 0.5) = 16.699°.
    const leftTrunk: MetrePose = { hip: { x: 0, y: 0.9 }, shoulder: { x: 0.15, y: 1.4 } };
    const extra = [60, 228].map((f) => landmarksAt(f, 'left', leftTrunk, 'left_to_right'));
    const c = worked(
      (_f, s, k) => (s === 'right' ? (k === 'initial_contact' ? icNoShoulder : toNoShoulder) : k === 'initial_contact' ? IC_POSE : TO_POSE),
      extra,
    );
    const r = computeClipMeasures(c);
    const rel = measureOf(r, 'hip_extension_toe_off_rel_trunk', 'right');
    const trunk = deg(Math.atan2(0.15, 0.5));
    expect(trunk).toBeCloseTo(16.699, 3);
    expect(rel.mean).toBeCloseTo(-(thighOf(TO_POSE) + trunk), 9);
    expect(rel.derivation).toBe(`${HIP_REL} The trunk came from the left side's shoulder and hip where this side's were not marked.`);
    // The right stances: the two TO frames have the left trunk; the IC frames have no trunk at all.
    const lean = measureOf(r, 'trunk_lean', 'right');
    expect(lean).toMatchObject({
      n: 2,
      derivation: `${trunkText('right', 2)} The left side's shoulder and hip stood in where this side's were not marked.`,
    });
    expect(lean.mean).toBeCloseTo(trunk, 9);
    // Only the first right toe-off borrows the trunk: still said.
    const once = computeClipMeasures(
      worked(
        (f, s, k) => (s === 'right' && f === 60 ? toNoShoulder : k === 'initial_contact' ? IC_POSE : (TO_POSE as MetrePose)),
        extra.slice(0, 1),
      ),
    );
    expect(measureOf(once, 'hip_extension_toe_off_rel_trunk', 'right').derivation).toBe(
      `${HIP_REL} The trunk came from the left side's shoulder and hip where this side's were not marked.`,
    );
    // The left side has its own trunk: no fallback sentence.
    expect(measureOf(r, 'hip_extension_toe_off_rel_trunk', 'left').derivation).toBe(HIP_REL);
    expect(measureOf(r, 'trunk_lean', 'left').derivation).toBe(trunkText('left', 4));
  });
});

describe('missing landmarks and missing events', () => {
  it('no landmarks: each measure names the landmarks it needs, the side, the event and its frames', () => {
    const r = computeClipMeasures(clipInput({ events: timingExampleEvents(2), scale: SCALE_1M_400PX }));
    const missing = (k: Parameters<typeof measureOf>[1]) => measureOf(r, k, 'right');
    expect(missing('hip_extension_toe_off')).toMatchObject({
      status: 'not_enough_data',
      derivation: `${HIP_EXT} 0 of 2 toe-offs had hip and knee marked (missing on frames 60, 228).`,
      missing: 'Hip and knee not marked on the right side at any toe-off (frames 60, 228).',
    });
    expect(missing('hip_extension_toe_off_rel_trunk').missing).toBe(
      'Hip, knee and shoulder not marked on the right side at any toe-off (frames 60, 228).',
    );
    expect(missing('knee_flexion_initial_contact').missing).toBe(
      'Hip, knee and ankle not marked on the right side at any initial contact (frames 0, 168, 336).',
    );
    expect(missing('shank_angle_initial_contact').missing).toBe(
      'Knee and ankle not marked on the right side at any initial contact (frames 0, 168, 336).',
    );
    expect(missing('foot_angle_initial_contact')).toMatchObject({
      derivation: `${FOOT_IC} 0 of 3 initial contacts had heel and toe marked (missing on frames 0, 168, 336).`,
      missing: 'Heel and toe not marked on the right side at any initial contact (frames 0, 168, 336).',
    });
    expect(missing('heel_ahead_of_hip_initial_contact')).toMatchObject({
      derivation: `${HEEL} Scale 2.50 mm/px. 0 of 3 initial contacts had heel and hip marked (missing on frames 0, 168, 336).`,
      missing: 'Heel and hip not marked on the right side at any initial contact (frames 0, 168, 336).',
    });
    expect(missing('trunk_lean')).toMatchObject({
      derivation: trunkText('right', 0),
      missing: 'Shoulder and hip not marked on any frame of a right stance.',
    });
    expect(missing('knee_flexion_peak_stance')).toMatchObject({
      derivation: PEAK,
      missing: 'Hip, knee and ankle not marked on any frame of a right stance.',
    });
  });

  it('some event frames without the landmarks: the value comes from the others and the text lists the frames left out', () => {
    const r = computeClipMeasures(worked((f, _s, k) => (f === 228 ? null : k === 'initial_contact' ? IC_POSE : (TO_POSE as MetrePose))));
    const hip = measureOf(r, 'hip_extension_toe_off', 'right');
    expect(hip).toMatchObject({ status: 'ok', n: 1 });
    expect(hip.derivation).toBe(`${HIP_EXT} 1 of 2 toe-offs had hip and knee marked (missing on frames 228).`);
    expect(measureOf(r, 'hip_extension_toe_off_rel_trunk', 'right').derivation).toBe(
      `${HIP_REL} 1 of 2 toe-offs had hip, knee and shoulder marked (missing on frames 228).`,
    );
  });

  it('no events: no stance, no event of that side; without a scale bar heel-ahead-of-hip says it needs one', () => {
    const r = computeClipMeasures(clipInput({ landmarks: [landmarksAt(0, 'right', IC_POSE, 'left_to_right')] }));
    expect(measureOf(r, 'hip_extension_toe_off', 'right').missing).toBe('No right toe-off marked.');
    expect(measureOf(r, 'knee_flexion_initial_contact', 'left').missing).toBe('No left initial contact marked.');
    expect(measureOf(r, 'trunk_lean', 'right')).toMatchObject({
      derivation: trunkText('right', 0),
      missing: 'No complete right stance (initial contact followed by toe-off) marked.',
    });
    expect(measureOf(r, 'knee_flexion_peak_stance', 'left')).toMatchObject({
      derivation: PEAK,
      missing: 'No complete left stance (initial contact followed by toe-off) marked.',
    });
    const heel = measureOf(r, 'heel_ahead_of_hip_initial_contact', 'right');
    expect(heel).toMatchObject({
      status: 'not_enough_data',
      n: 0,
      derivation: HEEL,
      missing: 'Needs a scale bar to turn pixels into metres.',
    });
    expect(heel.label).toBe('Heel ahead of hip at initial contact');
    expect(heel.unit).toBe('m');
    expect(heel.event).toBe('initial_contact');
    expect(heel.side).toBe('right');
  });
});

describe('foot strike counts', () => {
  it('[calc] contacts at 14.744° (rearfoot), 3° (midfoot) and −5° (forefoot): each counted, the mean 4.25° classifies as midfoot', () => {
    // Toe 0.19 m ahead of the heel, raised by 0.19·tan(θ).
    const footAt = (thetaDeg: number): MetrePose => ({
      ...IC_POSE,
      toe: { x: IC_POSE.heel.x + 0.19, y: IC_POSE.heel.y + 0.19 * Math.tan((thetaDeg * Math.PI) / 180) },
    });
    const byFrame: Record<number, MetrePose> = { 0: IC_POSE, 168: footAt(3), 336: footAt(-5) };
    const r = computeClipMeasures(worked((f, _s, k) => (k === 'initial_contact' ? (byFrame[f] ?? IC_POSE) : (TO_POSE as MetrePose))));
    const foot = measureOf(r, 'foot_angle_initial_contact', 'right');
    const expectedMean = (footOf(IC_POSE) + 3 - 5) / 3;
    expect(foot.mean).toBeCloseTo(expectedMean, 9);
    expect(expectedMean).toBeGreaterThan(-0.8); // Mo et al. 2021 cut-offs [pub]: midfoot between −0.8° and 7.4°
    expect(expectedMean).toBeLessThan(7.4);
    expect(foot.derivation).toBe(`${FOOT_IC} Contacts: 1 rearfoot, 1 midfoot, 1 forefoot; the mean classifies as midfoot.`);
    // Two forefoot contacts of the left side, no other kind: only the kind present is listed.
    const left = computeClipMeasures(
      worked((_f, s, k) => (k === 'initial_contact' ? (s === 'left' ? footAt(-5) : IC_POSE) : (TO_POSE as MetrePose))),
    );
    expect(measureOf(left, 'foot_angle_initial_contact', 'left').derivation).toBe(
      `${FOOT_IC} Contacts: 2 forefoot; the mean classifies as forefoot.`,
    );
  });
});

describe('[calc] peak knee flexion over stance', () => {
  /**
   * Right stances of timingExampleEvents(strides) marked every `step` frames (IC to TO included when
   * on the grid) with the thigh vertical and the shank at −φ, so knee flexion = thigh − shank = φ,
   * φ = 20° + 25°·sin(π·(f − IC)/60). `skipStance` leaves one stance marked only on its event frames.
   */
  function dense(strides: number, step: number, skipStance?: number) {
    const events = timingExampleEvents(strides);
    const landmarks: FrameLandmarks[] = [];
    for (let k = 0; k < strides; k++) {
      for (let phase = 0; phase <= 60; phase += step) {
        if (k === skipStance && phase !== 0 && phase !== 60) continue;
        const phi = 20 + 25 * Math.sin((Math.PI * phase) / 60);
        const r = (phi * Math.PI) / 180;
        const pose = { hip: { x: 0, y: 0.9 }, knee: { x: 0, y: 0.45 }, ankle: { x: -0.43 * Math.sin(r), y: 0.45 - 0.43 * Math.cos(r) } };
        landmarks.push(landmarksAt(k * 168 + phase, 'right', pose, 'left_to_right'));
      }
    }
    return clipInput({ events, landmarks });
  }

  it('marked every 5 frames (under the 10 % of a 60-frame stance = 6 frames): peak 20° + 25° = 45° per stance', () => {
    const m = measureOf(computeClipMeasures(dense(2, 5)), 'knee_flexion_peak_stance', 'right');
    expect(m).toMatchObject({ status: 'ok', n: 2, derivation: PEAK });
    expect(m.mean).toBeCloseTo(20 + 25, 9);
    expect(m.values).toEqual([expect.closeTo(45, 9), expect.closeTo(45, 9)]);
  });

  it('one stance marked only at its events: left out and counted in the text; the other gives the peak', () => {
    const m = measureOf(computeClipMeasures(dense(2, 5, 1)), 'knee_flexion_peak_stance', 'right');
    expect(m).toMatchObject({ status: 'ok', n: 1 });
    expect(m.mean).toBeCloseTo(45, 9);
    expect(m.derivation).toBe(`${PEAK} 1 of 2 stances were marked too sparsely and left out.`);
  });

  it('every stance too sparse: not enough data, with the number of stances checked (singular and plural)', () => {
    const two = measureOf(computeClipMeasures(dense(2, 30, 0)), 'knee_flexion_peak_stance', 'right');
    expect(two).toMatchObject({
      status: 'not_enough_data',
      derivation: PEAK,
      missing:
        'Hip, knee and ankle are not marked densely enough through any right stance (need at least every 10 % of stance, 2 stances checked).',
    });
    const one = measureOf(computeClipMeasures(dense(1, 60)), 'knee_flexion_peak_stance', 'right');
    expect(one.missing).toBe(
      'Hip, knee and ankle are not marked densely enough through any right stance (need at least every 10 % of stance, 1 stance checked).',
    );
    // One stance marked at its events only, the other not at all: still "not densely enough".
    const half = dense(2, 30, 0);
    half.annotations.landmarks = half.annotations.landmarks.filter((l) => l.frame < 168);
    expect(measureOf(computeClipMeasures(half), 'knee_flexion_peak_stance', 'right').missing).toBe(
      'Hip, knee and ankle are not marked densely enough through any right stance (need at least every 10 % of stance, 2 stances checked).',
    );
    // The left side has stances but no marks at all.
    expect(measureOf(computeClipMeasures(dense(2, 5)), 'knee_flexion_peak_stance', 'left').missing).toBe(
      'Hip, knee and ankle not marked on any frame of a left stance.',
    );
  });
});

describe('angleMeasures itself', () => {
  it('returns the eight angle measures of the side, measures only, in their order', () => {
    const c = worked();
    const events = c.annotations.events;
    const out = angleMeasures(
      {
        input: c,
        clock: makeFrameClock(240),
        mPerPx: 0.0025,
        cycles: buildGaitCycles(events),
        events,
        store: new FrameStore(c.annotations.landmarks, { frameSize: c.frameSize, direction: c.direction }),
        timingNote: '',
      },
      'left',
    );
    expect(out.map((m) => `${m.key} ${m.side}`)).toEqual(
      [
        'hip_extension_toe_off',
        'hip_extension_toe_off_rel_trunk',
        'knee_flexion_initial_contact',
        'knee_flexion_peak_stance',
        'shank_angle_initial_contact',
        'foot_angle_initial_contact',
        'trunk_lean',
        'heel_ahead_of_hip_initial_contact',
      ].map((k) => `${k} left`),
    );
  });
});
