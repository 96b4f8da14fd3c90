/**
 * Angle measures of one side: hip extension at toe-off (from vertical and relative to the trunk),
 * knee flexion at initial contact and its peak in stance, shank and foot angle at initial contact,
 * trunk lean over stance, heel ahead of hip. Internal to `src/kinematics`. Pure.
 */
import type { Side } from '../contracts/assessment';
import type { Measure } from '../contracts/measures';
import { classifyFootStrike, type FootStrike } from './bands';
import { MEASURE_DEFINITIONS, PEAK_KNEE_MAX_GAP_FRACTION } from './measure-definitions';
import { angleAt, atEvent, build, coverage, eventFrames, fmt, otherWord, poseAt, type Ctx } from './measure-context';
import { mean } from './stats';

const THIGH_NOTE =
  'Thigh = hip→knee from the global vertical (+ flexion, − extension), not from the pelvis: 2D thigh-from-vertical overstates hip extension relative to the pelvis by about the pelvic anterior tilt.';

export function angleMeasures(ctx: Ctx, side: Side): Measure[] {
  const out: Measure[] = [];
  const a = (f: number) => angleAt(ctx, f, side);
  const fallbackUsed = (frames: number[]) => frames.some((f) => a(f)?.trunkFromFallback);

  out.push(
    atEvent(
      ctx,
      'hip_extension_toe_off',
      side,
      'toe_off',
      'hip and knee',
      (f) => {
        const t = a(f)?.thighDeg;
        return t === undefined ? undefined : -t;
      },
      `Hip extension = −thigh angle on each toe-off frame, so extension reads positive and a hip that stays flexed reads negative. ${THIGH_NOTE} Mean ± SD (sample SD) over toe-offs.`,
    ),
  );

  const toFrames = eventFrames(ctx, side, 'toe_off');
  out.push(
    atEvent(
      ctx,
      'hip_extension_toe_off_rel_trunk',
      side,
      'toe_off',
      'hip, knee and shoulder',
      (f) => {
        const h = a(f)?.hipRelTrunkDeg;
        return h === undefined ? undefined : -h;
      },
      `Hip extension relative to the trunk line = −(thigh + trunk lean) at toe-off (trunk = hip→shoulder from vertical, + forward). A forward lean lowers it; it does not see the pelvis, so pelvic tilt or lumbar arching under an upright trunk still counts as extension here.${
        fallbackUsed(toFrames)
          ? ` The trunk came from the ${otherWord(side)} side's shoulder and hip where this side's were not marked.`
          : ''
      }`,
    ),
  );

  out.push(
    atEvent(
      ctx,
      'knee_flexion_initial_contact',
      side,
      'initial_contact',
      'hip, knee and ankle',
      (f) => a(f)?.kneeFlexionDeg,
      'Knee flexion = thigh − shank on each initial-contact frame (0° = straight) = 180° − the included hip–knee–ankle angle. Mean ± SD over contacts.',
    ),
  );

  out.push(peakKneeFlexion(ctx, side));

  out.push(
    atEvent(
      ctx,
      'shank_angle_initial_contact',
      side,
      'initial_contact',
      'knee and ankle',
      (f) => a(f)?.shankDeg,
      'Shank = knee→ankle from vertical on each initial-contact frame, + when the ankle is ahead of the knee (0° = vertical tibia at landing).',
    ),
  );

  out.push(footAngle(ctx, side));
  out.push(trunkLean(ctx, side));

  const mpp = ctx.mPerPx;
  const heelDerivation =
    'Heel x − hip x on each initial-contact frame, metres along the running direction (+ = heel lands ahead of the hip), converted with the scale bar (m per pixel); assumes the foot lands in the calibrated plane.';
  if (mpp === null) {
    const d = MEASURE_DEFINITIONS.heel_ahead_of_hip_initial_contact;
    out.push({
      key: d.key,
      label: d.label,
      unit: d.unit,
      side,
      event: d.event,
      status: 'not_enough_data',
      mean: null,
      sd: null,
      n: 0,
      values: [],
      derivation: heelDerivation,
      missing: 'Needs a scale bar to turn pixels into metres.',
    });
  } else {
    out.push(
      atEvent(
        ctx,
        'heel_ahead_of_hip_initial_contact',
        side,
        'initial_contact',
        'heel and hip',
        (f) => {
          const p = poseAt(ctx, f, side);
          return p?.heel && p.hip ? (p.heel.x - p.hip.x) * mpp : undefined;
        },
        `${heelDerivation} Scale ${fmt(mpp * 1000, 2)} mm/px.`,
      ),
    );
  }
  return out;
}

function peakKneeFlexion(ctx: Ctx, side: Side): Measure {
  const stances = ctx.cycles.stances.filter((s) => s.side === side);
  const derivation = `Largest knee flexion (thigh − shank) over the frames of each stance, initial contact → toe-off; needs hip, knee and ankle marked at least every ${PEAK_KNEE_MAX_GAP_FRACTION * 100} % of the stance so the peak is not missed. Mean ± SD over stances.`;
  if (stances.length === 0)
    return build(
      ctx,
      'knee_flexion_peak_stance',
      side,
      [],
      derivation,
      `No complete ${side} stance (initial contact followed by toe-off) marked.`,
    );
  const values: number[] = [];
  let sparse = 0;
  for (const s of stances) {
    const maxGap = Math.max(1, Math.floor(PEAK_KNEE_MAX_GAP_FRACTION * (s.toFrame - s.icFrame)));
    const { frames, covered } = coverage(s.icFrame, s.toFrame, maxGap, (f) => angleAt(ctx, f, side)?.kneeFlexionDeg !== undefined);
    if (!covered) {
      sparse++;
      continue;
    }
    let peak = -Infinity;
    for (const f of frames) peak = Math.max(peak, angleAt(ctx, f, side)!.kneeFlexionDeg!);
    values.push(peak);
  }
  return build(
    ctx,
    'knee_flexion_peak_stance',
    side,
    values,
    derivation + (sparse && values.length ? ` ${sparse} of ${stances.length} stances were marked too sparsely and left out.` : ''),
    stances.some(
      (s) => coverage(s.icFrame, s.toFrame, Infinity, (f) => angleAt(ctx, f, side)?.kneeFlexionDeg !== undefined).frames.length > 0,
    )
      ? `Hip, knee and ankle are not marked densely enough through any ${side} stance (need at least every ${PEAK_KNEE_MAX_GAP_FRACTION * 100} % of stance, ${stances.length} stance${stances.length === 1 ? '' : 's'} checked).`
      : `Hip, knee and ankle not marked on any frame of a ${side} stance.`,
  );
}

function footAngle(ctx: Ctx, side: Side): Measure {
  const base =
    'Foot angle = heel→toe from horizontal on each initial-contact frame, + toe up. Foot strike by the cut-offs of Mo et al. 2021 (forefoot ≤ −0.8°, rearfoot ≥ 7.4°, midfoot between), which assume the angle relative to standing posture; this angle is relative to the horizontal (marker offsets of a standing frame not removed).';
  const m = atEvent(
    ctx,
    'foot_angle_initial_contact',
    side,
    'initial_contact',
    'heel and toe',
    (f) => angleAt(ctx, f, side)?.footDeg,
    base,
  );
  if (m.status === 'ok') {
    const counts: Record<FootStrike, number> = { rearfoot: 0, midfoot: 0, forefoot: 0 };
    for (const v of m.values) counts[classifyFootStrike(v)]++;
    const parts = (['rearfoot', 'midfoot', 'forefoot'] as const).filter((k) => counts[k]).map((k) => `${counts[k]} ${k}`);
    m.derivation += ` Contacts: ${parts.join(', ')}; the mean classifies as ${classifyFootStrike(m.mean!)}.`;
  }
  return m;
}

function trunkLean(ctx: Ctx, side: Side): Measure {
  const stances = ctx.cycles.stances.filter((s) => s.side === side);
  let frameCount = 0;
  let fallback = false;
  const values: number[] = [];
  for (const s of stances) {
    const vs: number[] = [];
    for (let f = s.icFrame; f <= s.toFrame; f++) {
      const a = angleAt(ctx, f, side);
      if (a?.trunkDeg === undefined) continue;
      vs.push(a.trunkDeg);
      if (a.trunkFromFallback) fallback = true;
    }
    if (vs.length) {
      values.push(mean(vs)!);
      frameCount += vs.length;
    }
  }
  const derivation = `Trunk lean = hip→shoulder from vertical (+ forward), averaged over the marked frames of each ${side} stance (initial contact → toe-off), then mean ± SD over stances (${frameCount} frames in all).${
    fallback ? ` The ${otherWord(side)} side's shoulder and hip stood in where this side's were not marked.` : ''
  }`;
  return build(
    ctx,
    'trunk_lean',
    side,
    values,
    derivation,
    stances.length === 0
      ? `No complete ${side} stance (initial contact followed by toe-off) marked.`
      : `Shoulder and hip not marked on any frame of a ${side} stance.`,
  );
}
