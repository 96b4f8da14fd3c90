/**
 * Two or three key positions per demo exercise, as simple side-view figures (see `figure.ts`),
 * each with the one-line caption the athlete reads under it. Our own drawings of the movements
 * the library's instructions describe.
 */
import type { ArmPose, LegPose, Pose } from './figure';

const leg = (thigh: number, shank: number, foot = 90): LegPose => ({ thigh, shank, foot });
const arm = (upper: number, fore: number): ArmPose => ({ upper, fore });

/** Standing tall, arms by the sides. */
const STAND: Pose = { x: 75, trunk: 180, near: leg(2, 0), far: leg(-3, -2), nearArm: arm(8, 14), farArm: arm(-6, 2) };

/** A captioned key position. */
export interface KeyPosition {
  caption: string;
  pose: Pose;
}

const bridgeDown: Pose = {
  x: 85,
  trunk: -90,
  head: -18,
  near: leg(148, 32),
  far: leg(145, 28),
  nearArm: arm(90, 90),
  farArm: arm(92, 90),
};
const bridgeUp: Pose = {
  ...bridgeDown,
  trunk: -62,
  head: -28,
  near: leg(108, 14),
  far: leg(105, 10),
  nearArm: arm(88, 90),
  farArm: arm(90, 90),
};

const prone: Pose = {
  x: 70,
  trunk: -90,
  head: -12,
  near: leg(90, 90, 100),
  far: leg(91, 91, 100),
  nearArm: arm(-92, -92),
  farArm: arm(-90, -90),
};

const hingeUp: Pose = { ...STAND, nearArm: arm(2, 0), farArm: arm(-2, 0), props: [{ kind: 'weight' }] };
const hingeDown: Pose = {
  x: 70,
  trunk: 112,
  head: 12,
  near: leg(14, -2),
  far: leg(12, -3),
  nearArm: arm(2, 0),
  farArm: arm(-2, 0),
  props: [{ kind: 'weight' }],
};

const tiltUp: Pose = { ...STAND, far: leg(-14, -10, 80) };
const tiltDown: Pose = {
  x: 75,
  trunk: 100,
  head: 10,
  near: leg(6, -4),
  far: leg(-84, -86, -4),
  nearArm: arm(28, 30),
  farArm: arm(-10, -5),
};

const thrustDown: Pose = {
  x: 80,
  trunk: -118,
  head: 10,
  near: leg(148, 22),
  far: leg(146, 20),
  nearArm: arm(-40, -150),
  farArm: arm(-45, -150),
  props: [{ kind: 'bench', under: 'shoulder', width: 26 }],
};
const thrustUp: Pose = { ...thrustDown, trunk: -94, head: 18, near: leg(96, 8), far: leg(94, 6) };

const runContact: Pose = { x: 72, trunk: 172, near: leg(12, -4), far: leg(-40, -95, -20), nearArm: arm(-30, 60), farArm: arm(30, 120) };
const runFlight: Pose = { x: 72, trunk: 170, near: leg(-25, -70, 10), far: leg(45, 5), nearArm: arm(30, 120), farArm: arm(-30, 60) };
const skipUp: Pose = { x: 72, trunk: 176, near: leg(4, 2, 115), far: leg(80, 0), nearArm: arm(-35, 40), farArm: arm(40, 150) };

const kneeExtBent: Pose = {
  x: 80,
  trunk: -90,
  head: -18,
  near: leg(178, 85),
  far: leg(90, 90, 175),
  nearArm: arm(150, 175),
  farArm: arm(95, 90),
};
const kneeExtStraight: Pose = { ...kneeExtBent, near: leg(178, 176, 200) };

const splitStart: Pose = { ...STAND };
const splitDown: Pose = { x: 72, trunk: 178, near: leg(60, 5), far: leg(-35, -85, -10), nearArm: arm(10, 15), farArm: arm(-8, 5) };

const sideStand: Pose = { ...STAND, near: leg(10, 6), far: leg(-10, -6) };
const sideCross: Pose = { ...STAND, near: leg(-12, -6), far: leg(20, 10), nearArm: arm(30, 40), farArm: arm(-30, -10) };

const plankFront: Pose = {
  x: 75,
  trunk: -82,
  head: 5,
  near: leg(96, 96, 180),
  far: leg(96, 96, 180),
  nearArm: arm(0, -90),
  farArm: arm(2, -90),
};
const plankSide: Pose = { ...plankFront, nearArm: arm(178, 178), farArm: arm(2, -90) };

const nordicUp: Pose = {
  x: 75,
  trunk: 180,
  near: leg(0, -90, -180),
  far: leg(0, -92, -180),
  nearArm: arm(20, 110),
  farArm: arm(15, 110),
  props: [{ kind: 'anchor' }],
};
const nordicMid: Pose = {
  ...nordicUp,
  trunk: 138,
  head: 8,
  near: leg(-42, -90, -180),
  far: leg(-42, -92, -180),
  nearArm: arm(60, 80),
  farArm: arm(55, 80),
};
const nordicCatch: Pose = {
  ...nordicUp,
  trunk: 100,
  head: 15,
  near: leg(-80, -90, -180),
  far: leg(-80, -92, -180),
  nearArm: arm(10, 20),
  farArm: arm(5, 20),
};

const STEP = { kind: 'step', x: 56, width: 40, height: 8 } as const;
const onStep = (p: Partial<Pose>): Pose => ({
  ...STAND,
  ...p,
  restOn: STEP.height,
  restPoint: 'near-toe',
  props: [STEP, ...(p.props ?? [])],
});
const calfUp = onStep({ x: 84, near: leg(2, 0, 130), far: leg(-2, -1, 128), nearArm: arm(-25, -35) });
const calfDown = onStep({ x: 84, near: leg(2, 0, 62), far: leg(-2, -1, 60), nearArm: arm(-25, -35) });
const calfDownBent = onStep({ x: 84, trunk: 175, near: leg(28, -14, 58), far: leg(25, -16, 56), nearArm: arm(-25, -35) });
const calfUpBent = onStep({ x: 84, trunk: 175, near: leg(28, -14, 120), far: leg(25, -16, 118), nearArm: arm(-25, -35) });
const heavyUp: Pose = { ...calfUp, nearArm: arm(2, 0), props: [STEP, { kind: 'weight' }] };
const heavyDown: Pose = { ...calfDown, nearArm: arm(2, 0), props: [STEP, { kind: 'weight' }] };

const sideLying: Pose = {
  x: 85,
  trunk: -90,
  head: -20,
  near: leg(90, 90, 170),
  far: leg(91, 91, 170),
  nearArm: arm(90, 90),
  farArm: arm(-150, -170),
};
const sideLyingUp: Pose = { ...sideLying, near: leg(116, 116, 190) };

const stepDownTop = onStep({ x: 70, far: leg(10, 5, 90) });
const stepDownLow = onStep({ x: 70, trunk: 168, near: leg(45, -10, 90), far: leg(30, 20, 60), nearArm: arm(40, 60), farArm: arm(35, 55) });

const walk: Pose = { x: 72, trunk: 178, near: leg(15, 5), far: leg(-15, -20, 75), nearArm: arm(-15, -5), farArm: arm(15, 25) };

/** Key positions per demo exercise (by the library's name). */
export const DEMO_ILLUSTRATIONS: Record<string, KeyPosition[]> = {
  'Bent-knee bridge hold': [
    { caption: 'Lie on your back, knees bent, feet flat', pose: bridgeDown },
    { caption: 'Lift the hips and hold, knees still bent', pose: bridgeUp },
  ],
  'Prone hamstring hold': [
    { caption: 'Lie face down, legs long', pose: prone },
    { caption: 'Bend the knee a little and hold against the band', pose: { ...prone, near: leg(90, 140, 170) } },
  ],
  'Romanian deadlift': [
    { caption: 'Stand tall, weight close to the thighs', pose: hingeUp },
    { caption: 'Hinge at the hips, back flat, knees soft', pose: hingeDown },
    { caption: 'Drive the hips forward to stand tall again', pose: hingeUp },
  ],
  'Hip thrust': [
    { caption: 'Shoulder blades on the bench, hips low', pose: thrustDown },
    { caption: 'Drive the hips up until the body is flat', pose: thrustUp },
  ],
  'Springy skips': [
    { caption: 'Land on the ball of the foot, stiff ankle', pose: runContact },
    { caption: 'Spring up, drive the other knee', pose: skipUp },
  ],
  'Hip-flexed knee extension': [
    { caption: 'Hold the thigh upright, knee bent', pose: kneeExtBent },
    { caption: 'Straighten the knee slowly as far as it goes', pose: kneeExtStraight },
  ],
  'Single-leg forward tilt with reach': [
    { caption: 'Stand on one leg', pose: tiltUp },
    { caption: 'Tilt forward as one line, reaching ahead', pose: tiltDown },
  ],
  'Gliding split': [
    { caption: 'Stand tall, the back foot on a sliding pad', pose: splitStart },
    { caption: 'Slide the back foot away, front knee bends', pose: splitDown },
  ],
  'Side-step and grapevine': [
    { caption: 'Step to the side, hips level', pose: sideStand },
    { caption: 'Cross the trailing leg over, keep moving', pose: sideCross },
  ],
  'Rotating body bridge': [
    { caption: 'Hold a plank on the forearms', pose: plankFront },
    { caption: 'Turn onto one forearm, top arm up', pose: plankSide },
  ],
  'Single-leg windmill': [
    { caption: 'Stand on one leg', pose: tiltUp },
    { caption: 'Hinge and reach down across the standing foot', pose: { ...tiltDown, trunk: 96, nearArm: arm(6, 2) } },
  ],
  'Nordic hamstring lowering': [
    { caption: 'Kneel tall, heels held down', pose: nordicUp },
    { caption: 'Lower slowly, hips straight', pose: nordicMid },
    { caption: 'Catch yourself with the hands', pose: nordicCatch },
  ],
  'Isometric calf hold': [
    { caption: 'Rise onto the toes on the step edge', pose: calfUp },
    { caption: 'Hold just below the top, steady', pose: { ...calfUp, near: leg(2, 0, 115), far: leg(-2, -1, 113) } },
  ],
  'Heel drop from a step, straight knee': [
    { caption: 'Start up on the toes, knee straight', pose: calfUp },
    { caption: 'Lower the heel slowly below the step', pose: calfDown },
  ],
  'Heel drop from a step, bent knee': [
    { caption: 'Start up on the toes, knee bent', pose: calfUpBent },
    { caption: 'Lower the heel slowly, knee stays bent', pose: calfDownBent },
  ],
  'Heavy slow calf raise': [
    { caption: 'Heel low, weight in the hand', pose: heavyDown },
    { caption: 'Rise slowly to the top, lower slowly', pose: heavyUp },
  ],
  'Side-lying hip abduction': [
    { caption: 'Lie on your side, legs in line', pose: sideLying },
    { caption: 'Lift the top leg, toes forward', pose: sideLyingUp },
  ],
  'Forward step-down': [
    { caption: 'Stand on the step', pose: stepDownTop },
    { caption: 'Bend the standing knee, heel taps the floor', pose: stepDownLow },
  ],
  'Step-rate run': [
    { caption: 'Land under the hips, short quick steps', pose: runContact },
    { caption: 'Stay tall through the flight', pose: runFlight },
  ],
  'Walk-jog return intervals': [
    { caption: 'Walk briskly', pose: walk },
    { caption: 'Jog easily, then walk again', pose: runFlight },
  ],
};
