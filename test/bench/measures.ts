/**
 * Benchmark: computeClipMeasures on a long, fully marked clip. Target ≤ 10 ms per run (the client
 * recomputes on every edit). Prints numbers only; it is not a timed test.
 *
 *   npx tsx test/bench/measures.ts [--runs 200] [--frames 2400]
 *
 * The clip is synthetic (smooth made-up joint curves, not a published data set): 2,400 frames at
 * 120 fps, all six landmarks on both sides on every frame, initial contact / midstance / toe-off on
 * both sides (stride 84 frames, contact 30), a scale bar, treadmill at 3.0 m/s.
 */
import { parseArgs } from 'node:util';
import type { FrameLandmarks, GaitEventMark, LandmarkName } from '../../src/contracts/annotations';
import type { Side } from '../../src/contracts/assessment';
import { computeClipMeasures, DEFAULT_REFERENCE_BANDS, type ClipMeasureInput } from '../../src/kinematics';

const { values: args } = parseArgs({ options: { runs: { type: 'string', default: '200' }, frames: { type: 'string', default: '2400' } } });
const RUNS = Number(args.runs);
const FRAMES = Number(args.frames);
const FPS = 120;
const STRIDE = 84;
const CONTACT = 30;
const W = 1280;
const H = 720;
const PX_PER_M = 400;
const TARGET_MS = 10;

const rad = (d: number) => (d * Math.PI) / 180;

/** Synthetic pose (metres, y up, +x forward) at gait phase p ∈ [0, 1) of one leg. */
function pose(p: number): Record<LandmarkName, { x: number; y: number }> {
  const thigh = 5 + 27 * Math.cos(2 * Math.PI * (p + 0.05)); // ≈ +30° late swing … −20° toe-off
  const knee = 20 + 45 * Math.max(0, Math.sin(2 * Math.PI * (p - 0.45))) + 15 * Math.max(0, Math.sin((Math.PI * p) / 0.36));
  const hip = { x: 0, y: 0.92 + 0.035 * Math.cos(4 * Math.PI * p) };
  const kneeP = { x: hip.x + 0.45 * Math.sin(rad(thigh)), y: hip.y - 0.45 * Math.cos(rad(thigh)) };
  const shank = thigh - knee;
  const ankle = { x: kneeP.x + 0.43 * Math.sin(rad(shank)), y: kneeP.y - 0.43 * Math.cos(rad(shank)) };
  const foot = 12 * Math.cos(2 * Math.PI * p);
  const heel = { x: ankle.x - 0.05, y: ankle.y - 0.06 };
  const toe = { x: heel.x + 0.18 * Math.cos(rad(foot)), y: heel.y + 0.18 * Math.sin(rad(foot)) };
  return { shoulder: { x: 0.09, y: 1.42 }, hip, knee: kneeP, ankle, heel, toe };
}

const frac = (q: { x: number; y: number }) => ({ x: (640 + q.x * PX_PER_M) / W, y: (690 - q.y * PX_PER_M) / H });

const landmarks: FrameLandmarks[] = [];
const events: GaitEventMark[] = [];
for (const side of ['right', 'left'] as Side[]) {
  const offset = side === 'right' ? 0 : STRIDE / 2;
  for (let f = 0; f < FRAMES; f++) {
    const p = ((((f - offset) % STRIDE) + STRIDE) % STRIDE) / STRIDE;
    const points = Object.fromEntries(Object.entries(pose(p)).map(([k, q]) => [k, frac(q)]));
    landmarks.push({ frame: f, side, points });
  }
  for (let ic = offset; ic + CONTACT < FRAMES; ic += STRIDE) {
    events.push(
      { frame: ic, side, kind: 'initial_contact' },
      { frame: ic + CONTACT / 2, side, kind: 'midstance' },
      { frame: ic + CONTACT, side, kind: 'toe_off' },
    );
  }
}

const input: ClipMeasureInput = {
  clipId: 1,
  annotations: { landmarks, events, scale: { frame: 0, a: { x: 100 / W, y: 700 / H }, b: { x: 500 / W, y: 700 / H }, lengthM: 1 } },
  frameSize: { width: W, height: H },
  fps: FPS,
  timestampsMs: Array.from({ length: FRAMES }, (_, i) => (i * 1000) / FPS),
  direction: 'left_to_right',
  surface: 'treadmill',
  beltSpeedMps: 3.0,
  bands: DEFAULT_REFERENCE_BANDS,
  frameCount: FRAMES,
};

// Sanity: the clip yields real figures (otherwise the timing means nothing).
const once = computeClipMeasures(input);
const ok = once.measures.filter((m) => m.status === 'ok').length;
const missing = once.measures.filter((m) => m.status !== 'ok').map((m) => `${m.key}${m.side ? `:${m.side}` : ''}`);
console.log(
  `clip: ${FRAMES} frames × 2 sides (${landmarks.length} landmark rows), ${events.length} events, ${once.angles.length} angle samples`,
);
console.log(`measures: ${ok} ok, ${missing.length} not_enough_data${missing.length ? ` (${missing.join(', ')})` : ''}`);

for (let i = 0; i < 20; i++) computeClipMeasures(input); // warm-up (JIT)
const times: number[] = [];
for (let i = 0; i < RUNS; i++) {
  const t0 = performance.now();
  computeClipMeasures(input);
  times.push(performance.now() - t0);
}
times.sort((a, b) => a - b);
const mean = times.reduce((s, t) => s + t, 0) / times.length;
const q = (p: number) => times[Math.min(times.length - 1, Math.floor(p * times.length))]!;
console.log(
  `computeClipMeasures: mean ${mean.toFixed(2)} ms per run over ${RUNS} runs (min ${times[0]!.toFixed(2)}, median ${q(0.5).toFixed(2)}, p95 ${q(0.95).toFixed(2)} ms)`,
);
console.log(`ratio to the ${TARGET_MS} ms target: ${(mean / TARGET_MS).toFixed(2)} (${mean <= TARGET_MS ? 'within' : 'OVER'} target)`);
