import type { Dose, ExerciseWrite } from '../src/contracts/plans';

/**
 * The demo clinic's exercise library. Each exercise is taken from a published rehabilitation
 * programme listed in REFERENCES.md ("Published exercise programmes") and written for Trailframe in
 * our own words: purpose, set-up and how (the steps), dose, progression (the last step), what to
 * watch (cautions), and the programme it comes from (`source`). The citations are quoted from
 * memory [mem] and their sources say so — all but Heiderscheit et al. 2011, read in the
 * publication [pub].
 */

/** A library exercise as the API takes it, with its source always given. */
export type DemoExercise = Required<ExerciseWrite>;

const dose = (d: Partial<Dose> & Pick<Dose, 'sets' | 'daysPerWeek'>): Dose => ({
  reps: null,
  holdSeconds: null,
  tempo: null,
  load: null,
  restSeconds: null,
  ...d,
});

const FROM_MEMORY = 'Quoted from memory; check before clinical use.';

/** The published programmes the library is written from, cited as REFERENCES.md cites them. */
const SOURCES = {
  goom: `Goom, Malliaras, Reiman & Purdam 2016, J Orthop Sports Phys Ther 46(6):483–493 (proximal hamstring tendinopathy: isometric, then isotonic, then energy-storage loading). ${FROM_MEMORY}`,
  askling: `Askling et al. 2013, Br J Sports Med 47:953–959 (lengthening "L-protocol" after acute hamstring strain). ${FROM_MEMORY}`,
  sherryBest: `Sherry & Best 2004, J Orthop Sports Phys Ther 34:116–125; Silder et al. 2013, J Orthop Sports Phys Ther 43:284–299 (progressive agility and trunk stabilisation after hamstring strain). ${FROM_MEMORY}`,
  nordic: `Petersen et al. 2011, Am J Sports Med 39:2296–2303; van der Horst et al. 2015, Am J Sports Med 43:1316–1323 (Nordic hamstring programmes). ${FROM_MEMORY}`,
  rio: `Rio et al. 2015, Br J Sports Med 49:1277–1283 (isometric holds eased tendon pain in the short term; the study loaded the knee extensors, applied here to the calf). ${FROM_MEMORY}`,
  alfredson: `Alfredson et al. 1998, Am J Sports Med 26:360–366 (eccentric calf loading for mid-portion Achilles tendinopathy, 3 × 15 twice daily for 12 weeks). ${FROM_MEMORY}`,
  beyer: `Beyer et al. 2015, Am J Sports Med 43:1704–1711 (heavy slow resistance for mid-portion Achilles tendinopathy). ${FROM_MEMORY}`,
  stepRate:
    'Heiderscheit et al. 2011, Med Sci Sports Exerc 43(2):296–302 (a step rate 5–10 % above preferred lowered knee and hip loading).',
  crossley: `Crossley et al. 2016, Br J Sports Med 50:839–843 (patellofemoral pain consensus: combined hip and knee exercise; this is one common example). ${FROM_MEMORY}`,
  heiderscheit2010: `Heiderscheit et al. 2010, J Orthop Sports Phys Ther 40(2):67–81 (criteria-based progression back to running after hamstring strain). ${FROM_MEMORY}`,
} as const;

export const DEMO_EXERCISES: DemoExercise[] = [
  // ─── Proximal hamstring tendinopathy (Goom et al. 2016) ───────────────────────────────────
  {
    name: 'Bent-knee bridge hold',
    purpose:
      'Steady hamstring and buttock work with the hip only a little bent, so the tendon takes load without being pressed against the bone.',
    region: 'hamstring',
    kind: 'isometric',
    dose: dose({ sets: 5, holdSeconds: 30, load: 'Body weight', restSeconds: 60, daysPerWeek: 4 }),
    instructions: [
      'Set-up: lie on your back, knees bent to a right angle, feet flat and hip-width apart, arms resting beside you.',
      'Press down through both heels and raise the hips until knees, hips and shoulders form one line.',
      'Hold that height without letting the hips drift down; breathe evenly.',
      'Come down slowly and rest before the next hold.',
      'To progress: hold on one leg with the other foot lifted, then place the feet a little further from the hips.',
    ],
    cautions:
      'Pain during the holds should stay within the plan’s limit and ease by the next morning. If the pain sits high in the back of the thigh, raise the hips a little less.',
    source: SOURCES.goom,
  },
  {
    name: 'Prone hamstring hold',
    purpose:
      'Loads the hamstring with the hip straight, where the tendon is under little compression — a way in while bridges are still sore.',
    region: 'hamstring',
    kind: 'isometric',
    dose: dose({ sets: 4, holdSeconds: 30, load: 'Light band', restSeconds: 60, daysPerWeek: 3 }),
    instructions: [
      'Set-up: lie face down with a pillow under the hips and a resistance band round the working ankle, fixed low behind your feet (or a helper’s hand at the heel).',
      'Bend the knee to about 30° against the band and keep it there; the front of the thigh stays on the floor.',
      'Hold steadily, then straighten the knee slowly and rest.',
      'To progress: a firmer band first, then a deeper knee bend (towards 90°).',
    ],
    cautions: 'The effort should build slowly, never snatch. Stop if the back of the knee or thigh gives a sharp pain.',
    source: SOURCES.goom,
  },
  {
    name: 'Romanian deadlift',
    purpose: 'Strengthens hamstrings and buttocks through a hip hinge whose depth grows over the weeks.',
    region: 'hamstring',
    kind: 'isotonic',
    dose: dose({
      sets: 3,
      reps: 8,
      tempo: '3 s down, 2 s up',
      load: 'Moderate: 2–3 reps left in reserve',
      restSeconds: 120,
      daysPerWeek: 3,
    }),
    instructions: [
      'Set-up: stand with feet hip-width apart, knees softly bent, a weight in each hand resting against the front of the thighs.',
      'Push the hips backwards so the weights slide down the front of the legs; keep the spine long and the knees at the same small bend.',
      'Stop at the depth the plan allows, before the back starts to round.',
      'Drive the hips forward to stand tall again.',
      'To progress: a deeper hinge over the weeks, then more weight, then on one leg.',
    ],
    cautions: 'Keep the hinge shallow early on: deep hip bending with the hamstring on stretch is what irritates this tendon most.',
    source: SOURCES.goom,
  },
  {
    name: 'Hip thrust',
    purpose: 'Strong hip extension work for the buttocks and hamstrings with the hip moving through a mid range.',
    region: 'hip',
    kind: 'isotonic',
    dose: dose({
      sets: 3,
      reps: 10,
      tempo: '2 s up, 1 s pause, 2 s down',
      load: 'Body weight, then a loaded bar',
      restSeconds: 90,
      daysPerWeek: 3,
    }),
    instructions: [
      'Set-up: sit on the floor with your shoulder blades against the edge of a bench, knees bent, feet flat; a padded weight across the hips once body weight is easy.',
      'Tuck the chin and push through the heels to lift the hips until thighs and trunk are level.',
      'Pause at the top, then lower under control until the hips almost touch the floor.',
      'To progress: add weight, then work one leg at a time, then move the feet further out to give the hamstrings more of the work.',
    ],
    cautions:
      'Finish the lift with the hips, not by leaning the ribs back. Ease off if the movement brings on pain high in the back of the thigh.',
    source: SOURCES.goom,
  },
  {
    name: 'Springy skips',
    purpose: 'Brings back quick stretch-and-recoil loading of the leg (the energy-storage stage) before running at pace returns.',
    region: 'whole_leg',
    kind: 'ballistic',
    dose: dose({ sets: 4, reps: 10, tempo: 'About 20 m, quick contacts', restSeconds: 60, daysPerWeek: 2 }),
    instructions: [
      'Set-up: mark out about 20 m of flat, even ground and warm up with easy jogging.',
      'Skip forward, pushing the ground away so each skip rises a little; arms swing opposite to the legs.',
      'Keep each ground contact short and land with the foot under the hips.',
      'Walk back to the start as your rest.',
      'To progress: longer and higher skips, then bounding strides.',
    ],
    cautions:
      'Start only when the strength work is easy and the mornings after are quiet. End the set if the back of the thigh pulls on take-off.',
    source: SOURCES.goom,
  },

  // ─── Acute hamstring strain, lengthening programme (Askling et al. 2013) ──────────────────
  {
    name: 'Hip-flexed knee extension',
    purpose: 'Lengthens the hamstring under control by straightening the knee while the hip is held bent.',
    region: 'hamstring',
    kind: 'eccentric',
    dose: dose({ sets: 3, reps: 12, tempo: 'Slow at first, quicker later', restSeconds: 30, daysPerWeek: 4 }),
    instructions: [
      'Set-up: lie on your back, bend the injured-side hip until the thigh points straight up, and hold the back of the thigh with both hands.',
      'Straighten the knee slowly as far as it goes without pain; the thigh stays where your hands hold it.',
      'Bend the knee again and repeat.',
      'To progress: straighten faster (still in control), then hold the hip a little more bent.',
    ],
    cautions: 'A strong stretch is expected; sharp pain is not. If the thigh is sore the next day, slow down again.',
    source: SOURCES.askling,
  },
  {
    name: 'Single-leg forward tilt with reach',
    purpose: 'Lengthens the hamstring of the standing leg as the body tips forward, with balance and reach.',
    region: 'hamstring',
    kind: 'eccentric',
    dose: dose({ sets: 3, reps: 6, tempo: 'Slow at first, quicker later', restSeconds: 45, daysPerWeek: 3 }),
    instructions: [
      'Set-up: stand on the injured-side leg with a small bend in the knee.',
      'Tip forward from the hip as the free leg swings back and both arms reach ahead, so arms, trunk and free leg move as one line.',
      'Keep the small knee bend of the standing leg the same throughout.',
      'Rise back to standing tall and repeat.',
      'To progress: reach further, then move faster, then hold light weights.',
    ],
    cautions: 'Balance is hard at first: rest a fingertip on a chair back. Stop if the pull in the standing leg turns sharp.',
    source: SOURCES.askling,
  },
  {
    name: 'Gliding split',
    purpose: 'Lengthens the front leg’s hamstring as the back foot glides away, with the arms taking the way back.',
    region: 'hamstring',
    kind: 'eccentric',
    dose: dose({ sets: 3, reps: 4, tempo: 'Slow glide, arms pull back', restSeconds: 45, daysPerWeek: 2 }),
    instructions: [
      'Set-up: stand upright holding a firm support, the injured-side leg in front with its knee a little bent and your weight on its heel; the back foot in a sock on a smooth floor or on a sliding disc.',
      'Let the back foot glide away so the legs split, keeping the trunk upright.',
      'Stop before it hurts.',
      'Come back by pulling with the arms on the support, not by dragging with the front leg.',
      'To progress: a longer glide, then a quicker one.',
    ],
    cautions: 'The front leg only controls the lowering; the arms do the return. Stop the set if the front thigh gives a sharp pull.',
    source: SOURCES.askling,
  },

  // ─── Agility and trunk stabilisation after hamstring strain (Sherry & Best 2004) ───────────
  {
    name: 'Side-step and grapevine',
    purpose: 'Low-speed agility that moves hips and trunk together, used from the first days after a hamstring strain.',
    region: 'whole_leg',
    kind: 'running_drill',
    dose: dose({ sets: 3, reps: 2, tempo: '10 m each way', restSeconds: 30, daysPerWeek: 4 }),
    instructions: [
      'Set-up: a straight, clear line about 10 m long.',
      'Side-step along it with soft knees, feet coming close but not touching.',
      'Come back with a grapevine: the trailing foot crosses in front, then behind, and the hips turn with it.',
      'Lead with the other side on the next length.',
      'To progress: from walking pace to a light jog, then longer steps.',
    ],
    cautions: 'Keep it pain-free; slow down if the back of the thigh pulls.',
    source: SOURCES.sherryBest,
  },
  {
    name: 'Rotating body bridge',
    purpose: 'Trunk and pelvic control: a front plank that turns into a side plank and back.',
    region: 'trunk',
    kind: 'isometric',
    dose: dose({ sets: 2, reps: 5, holdSeconds: 5, restSeconds: 45, daysPerWeek: 4 }),
    instructions: [
      'Set-up: a front plank on forearms and toes, body in one line.',
      'Hold for a few seconds, then turn onto one forearm into a side plank with the hips up.',
      'Hold, turn back through the front plank and on to the other side.',
      'Each turn to a side counts as one repetition.',
      'To progress: longer holds, then on straight arms.',
    ],
    cautions: 'Turn the whole body as one piece. If the hips sag, do it from the knees.',
    source: SOURCES.sherryBest,
  },
  {
    name: 'Single-leg windmill',
    purpose: 'Balance and hip control on one leg while the trunk bends and turns.',
    region: 'hip',
    kind: 'isotonic',
    dose: dose({ sets: 3, reps: 8, tempo: 'Slow and steady', restSeconds: 45, daysPerWeek: 4 }),
    instructions: [
      'Set-up: stand on one leg with a soft knee, arms out to the sides.',
      'Bend and turn the trunk so one hand reaches towards the floor in front of the standing foot while the other arm points up.',
      'Return to standing tall, then reach with the other hand.',
      'To progress: hold light weights, then stand on a folded mat.',
    ],
    cautions: 'Keep the standing knee over the middle of the foot. Stop if the back of the thigh tightens sharply.',
    source: SOURCES.sherryBest,
  },
  {
    name: 'Nordic hamstring lowering',
    purpose: 'Heavy lengthening work for the hamstrings, the core of published injury-prevention programmes.',
    region: 'hamstring',
    kind: 'eccentric',
    dose: dose({ sets: 2, reps: 5, tempo: 'As slowly as you can', restSeconds: 120, daysPerWeek: 2 }),
    instructions: [
      'Set-up: kneel on a mat, trunk upright, with a partner holding your ankles down or the heels hooked under a fixed support.',
      'Keeping hips straight and the body in one line from knees to head, lean forward as slowly as you can.',
      'When you can hold no longer, catch yourself on your hands.',
      'Push back up with the hands to the start.',
      'To progress: lower further before the catch, then add repetitions and sets over the weeks.',
    ],
    cautions:
      'Expect sore hamstrings for a day or two after the first sessions, so begin with few repetitions. After a strain, only once lengthening work is easy.',
    source: SOURCES.nordic,
  },

  // ─── Achilles tendon (Rio et al. 2015; Alfredson et al. 1998; Beyer et al. 2015) ──────────
  {
    name: 'Isometric calf hold',
    purpose: 'Heavy, steady holds that can ease tendon pain for a while and keep the calf loaded.',
    region: 'calf_achilles',
    kind: 'isometric',
    dose: dose({ sets: 5, holdSeconds: 45, load: 'Body weight, then added weight', restSeconds: 120, daysPerWeek: 4 }),
    instructions: [
      'Set-up: stand on the painful-side leg on a step or a calf-raise machine, fingertips on a rail for balance.',
      'Rise about halfway onto the ball of the foot.',
      'Hold that height without the ankle rolling in or out.',
      'Lower slowly and rest two minutes before the next hold.',
      'To progress: add weight (a loaded backpack or the machine) once the hold feels easy.',
    ],
    cautions: 'The hold should feel hard, not painful, and the tendon no worse afterwards than before.',
    source: SOURCES.rio,
  },
  {
    name: 'Heel drop from a step, straight knee',
    purpose: 'Slow lowering of the heel below the step, loading the calf and Achilles tendon through their full length.',
    region: 'calf_achilles',
    kind: 'eccentric',
    dose: dose({
      sets: 3,
      reps: 15,
      tempo: '3 s down, other leg lifts',
      load: 'Body weight, then a backpack',
      restSeconds: 60,
      daysPerWeek: 7,
    }),
    instructions: [
      'Set-up: stand on the ball of the painful-side foot on the edge of a step, heel free, knee straight, a hand on a rail.',
      'Start at the top (use the other leg to rise).',
      'Lower the heel below the step over about three seconds.',
      'Go back up with the help of the other leg: the painful side only lowers.',
      'To progress: when the drops no longer hurt, add weight in a backpack.',
    ],
    cautions: 'Some discomfort during the drops is accepted in this programme; sharp pain, or a tendon worse the next morning, is not.',
    source: SOURCES.alfredson,
  },
  {
    name: 'Heel drop from a step, bent knee',
    purpose: 'The same slow lowering with the knee bent, so the deep calf muscle takes more of the load.',
    region: 'calf_achilles',
    kind: 'eccentric',
    dose: dose({
      sets: 3,
      reps: 15,
      tempo: '3 s down, other leg lifts',
      load: 'Body weight, then a backpack',
      restSeconds: 60,
      daysPerWeek: 7,
    }),
    instructions: [
      'Set-up: as for the straight-knee drop, but bend the knee a little and keep that bend all the way down.',
      'Lower the heel below the step over about three seconds.',
      'Rise with the help of the other leg.',
      'To progress: add weight in a backpack once the drops are comfortable.',
    ],
    cautions: 'Keep the knee bend the same throughout. Stop for the day if the pain turns sharp.',
    source: SOURCES.alfredson,
  },
  {
    name: 'Heavy slow calf raise',
    purpose: 'Slow, heavy raises and lowering that build calf and tendon strength, getting heavier as the repetitions fall.',
    region: 'calf_achilles',
    kind: 'isotonic',
    dose: dose({
      sets: 3,
      reps: 15,
      tempo: '3 s up, 3 s down',
      load: '15-rep maximum, heavier as reps fall',
      restSeconds: 120,
      daysPerWeek: 3,
    }),
    instructions: [
      'Set-up: a seated calf-raise machine, or sit with a heavy weight across the knees and the balls of the feet on a block.',
      'Rise onto the balls of the feet over three seconds.',
      'Lower over three seconds to a full heel drop.',
      'To progress: over the weeks, go from 15 repetitions to 6 and add load each time the number falls, with a fourth and fifth set later.',
    ],
    cautions:
      'Pain may reach the plan’s limit during a set but should settle by the next morning; if it does not, keep the load the same next time.',
    source: SOURCES.beyer,
  },

  // ─── Runner's knee and step rate (Crossley et al. 2016; Heiderscheit et al. 2011) ────────
  {
    name: 'Side-lying hip abduction',
    purpose: 'Strengthens the side of the hip that keeps the pelvis level and the knee tracking over the foot.',
    region: 'hip',
    kind: 'isotonic',
    dose: dose({ sets: 3, reps: 12, tempo: '2 s up, 2 s down', restSeconds: 60, daysPerWeek: 3 }),
    instructions: [
      'Set-up: lie on your side with the bottom knee bent, the top leg straight and in line with the trunk, toes facing forward.',
      'Lift the top leg, slightly behind the line of the body, to about a hand’s width above hip height.',
      'Lower it over two seconds without the pelvis rolling back.',
      'To progress: an ankle weight, or a band just above the knees.',
    ],
    cautions: 'If the leg drifts forward, the front of the hip is doing the work: roll the pelvis slightly forward and lift less high.',
    source: SOURCES.crossley,
  },
  {
    name: 'Forward step-down',
    purpose: 'Slow single-leg lowering for knee and thigh control, as on long descents.',
    region: 'knee',
    kind: 'eccentric',
    dose: dose({ sets: 3, reps: 10, tempo: '3 s down', restSeconds: 60, daysPerWeek: 3 }),
    instructions: [
      'Set-up: stand on the working leg on a low step (10–15 cm), the other foot just over the front edge.',
      'Bend the standing knee so the free heel lowers towards the floor over three seconds, the knee pointing over the second toe.',
      'Touch the heel down lightly and straighten up again.',
      'To progress: a higher step, then a slower lowering, then holding weights.',
    ],
    cautions: 'Knee pain during the set should stay within the plan’s limit; use a lower step if it does not.',
    source: SOURCES.crossley,
  },
  {
    name: 'Step-rate run',
    purpose: 'Easy running with a step rate 5–10 % above your own, which lowers the load at the knee and hip.',
    region: 'whole_leg',
    kind: 'running_drill',
    dose: dose({ sets: 4, reps: 1, tempo: '4 min blocks, metronome +5–10 %', restSeconds: 60, daysPerWeek: 3 }),
    instructions: [
      'Set-up: take your step rate from your assessment (or count steps for a minute on an easy run) and set a metronome 5–10 % higher.',
      'Run easy with each step on a beat, at your usual pace: the steps become shorter, not faster.',
      'Run each block with the metronome, then jog a minute without it.',
      'To progress: longer blocks, until the new rhythm comes without the metronome.',
    ],
    cautions: 'Do not speed up. The calves may feel the change in the first week.',
    source: SOURCES.stepRate,
  },

  // ─── Back to running after hamstring strain (Heiderscheit et al. 2010) ────────────────────
  {
    name: 'Walk-jog return intervals',
    purpose:
      'Brings running back in small steps — jog, steady running, then faster strides — once walking, lengthening work and agility are pain-free.',
    region: 'whole_leg',
    kind: 'running_drill',
    dose: dose({ sets: 1, reps: 5, tempo: '4 min jog, 1 min walk', daysPerWeek: 3 }),
    instructions: [
      'Set-up: flat, even ground, after the agility drill as a warm-up.',
      'Alternate easy jogging with a minute of walking.',
      'Change one thing at a time, and only after a pain-free session and a quiet next morning: a longer jog, or a higher pace.',
      'To progress: add a few 60–80 m accelerations at about three-quarter pace, then near full pace, before any sprinting or racing.',
    ],
    cautions:
      'Pain or tightness in the back of the thigh means going back one step. Full pace, hills and racing wait for the clinician’s go-ahead.',
    source: SOURCES.heiderscheit2010,
  },
];
