/**
 * CLI: render a synthetic side-view runner clip and its ground truth.
 *
 *   npx tsx scripts/demo-clip/generate.ts --out dir --fps 120 --width 1280 --height 720 \
 *     --seconds 3 --hip-ext 4 --facing right [--name clip] [--preset fast] [--crf 18] [--realistic]
 *   npx tsx scripts/demo-clip/generate.ts --out dir --demo     # Baseline + Re-test clips
 */
import path from 'node:path';
import { parseArgs } from 'node:util';
import { ALL_REALISM, generateDemoClips, generateRunnerClip, groundTruthPath } from './clip';

const { values: a } = parseArgs({
  options: {
    out: { type: 'string', default: '.' },
    fps: { type: 'string', default: '120' },
    width: { type: 'string', default: '1280' },
    height: { type: 'string', default: '720' },
    seconds: { type: 'string', default: '3' },
    'hip-ext': { type: 'string', default: '10' },
    facing: { type: 'string', default: 'right' },
    name: { type: 'string' },
    preset: { type: 'string' },
    crf: { type: 'string' },
    demo: { type: 'boolean', default: false },
    /** Every realism option on: textured wall, motion blur, compression noise, flicker, occlusion, shake. */
    realistic: { type: 'boolean', default: false },
  },
});

const num = (name: string, v: string | undefined): number => {
  const n = Number(v);
  if (!Number.isFinite(n)) throw new Error(`--${name} must be a number, got ${v}`);
  return n;
};

const started = performance.now();
if (a.demo) {
  const clips = await generateDemoClips(a.out!);
  for (const c of Object.values(clips))
    console.log(`${c.label}: ${c.videoFile} (${c.groundTruth.frameCount} frames), ${c.groundTruthFile}`);
} else {
  if (a.facing !== 'left' && a.facing !== 'right') throw new Error('--facing must be left or right');
  const hipExt = num('hip-ext', a['hip-ext']);
  const fps = num('fps', a.fps);
  const outFile = path.join(a.out!, `${a.name ?? `runner-hipext${hipExt}-${a.facing}-${fps}fps`}.mp4`);
  const truth = await generateRunnerClip({
    outFile,
    fps,
    width: num('width', a.width),
    height: num('height', a.height),
    seconds: num('seconds', a.seconds),
    hipExtensionDeg: hipExt,
    facing: a.facing,
    ...(a.preset ? { preset: a.preset } : {}),
    ...(a.crf ? { crf: num('crf', a.crf) } : {}),
    ...(a.realistic ? { realism: ALL_REALISM } : {}),
  });
  const ext = truth.hipExtensionAtToeOffDeg.near;
  console.log(
    `${outFile}: ${truth.frameCount} frames at ${truth.fps} fps, cadence ${truth.cadenceStepsPerMin} steps/min, duty factor ${truth.dutyFactor}`,
  );
  console.log(`hip extension at near-side toe-offs: ${ext.map((e) => e.toFixed(2)).join(', ')}° (requested ${hipExt}°)`);
  console.log(`ground truth: ${groundTruthPath(outFile)}`);
}
console.log(`done in ${((performance.now() - started) / 1000).toFixed(1)} s`);
