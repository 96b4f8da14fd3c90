/**
 * Benchmark: an annotated clip of 240 source frames at 1280×720 (the synthetic runner at 120 fps,
 * every frame marked) at 1/4 speed, with the overlay, angle labels, headings, caption and caution —
 * beside ffmpeg encoding the same frames without any overlay, with the same encoder settings
 * (`CLIP_ENCODING`), the same video size and frame count, in the same run. Both start from the same
 * stored working frames (JPEG bytes in memory) and pipe raw RGBA into ffmpeg: the baseline decodes
 * each frame and hands it over untouched; the annotated clip decodes, draws and hands over.
 * Target: ratio ≤ 1.5. Rounds alternate so both see the same machine load. Prints numbers only.
 *
 *   npx tsx test/bench/annotated-video.ts [--rounds 3]
 */
import { parseArgs } from 'node:util';
import { performance } from 'node:perf_hooks';
import os from 'node:os';
import path from 'node:path';
import { mkdtemp, rm } from 'node:fs/promises';
import { createCanvas, loadImage } from '@napi-rs/canvas';
import { renderAnnotatedClip } from '../../server/render/annotated-clip-render';
import { startH264Encoder } from '../../server/media/encode-h264';
import { slowMotionTiming } from '../../src/kinematics';
import { runnerFrames, runnerPanel } from '../support/runner-frames';
import { median } from './support/still-inputs';

const { values: args } = parseArgs({ options: { rounds: { type: 'string', default: '3' } } });
const ROUNDS = Number(args.rounds);
const TARGET = 1.5;
const FACTOR = 0.25;
const FRAMES = 240;

const dir = await mkdtemp(path.join(os.tmpdir(), 'annotated-video-bench-'));
const runner = await runnerFrames(
  { fps: 120, width: 1280, height: 720, seconds: FRAMES / 120, hipExtensionDeg: 8, facing: 'right' },
  { noise: true },
);
const panel = runnerPanel(runner, 'Re-test · 24 Nov 2026');
const steps = runner.jpegs.map((_, i) => [i]);
const caption =
  'Right toe-off at the re-test: the thigh now passes vertical and the hip reaches extension before the foot leaves the belt.';

let size = { width: 0, height: 0, frames: 0, fps: 0 };

async function annotated(round: number): Promise<number> {
  const t0 = performance.now();
  const out = await renderAnnotatedClip({
    panels: [panel],
    steps,
    factor: FACTOR,
    caption,
    showAngles: true,
    outFile: path.join(dir, `annotated-${round}.mp4`),
  });
  const ms = performance.now() - t0;
  size = { width: out.width, height: out.height, frames: out.frameCount, fps: out.outputFps };
  return ms;
}

async function bare(round: number): Promise<number> {
  const { repeat, outputFps } = slowMotionTiming(120, FACTOR);
  const t0 = performance.now();
  const canvas = createCanvas(size.width, size.height);
  const ctx = canvas.getContext('2d');
  ctx.fillStyle = '#FFFFFF';
  ctx.fillRect(0, 0, size.width, size.height);
  const encoder = startH264Encoder({
    width: size.width,
    height: size.height,
    fps: outputFps,
    outFile: path.join(dir, `bare-${round}.mp4`),
  });
  for (const jpeg of runner.jpegs) {
    ctx.drawImage(await loadImage(jpeg), 0, 0);
    const pixels = canvas.data();
    for (let r = 0; r < repeat; r++) await encoder.write(pixels);
  }
  await encoder.finish();
  return performance.now() - t0;
}

await annotated(-1); // warm-up, and learns the video size
const annotatedMs: number[] = [];
const bareMs: number[] = [];
for (let i = 0; i < ROUNDS; i++) {
  annotatedMs.push(await annotated(i));
  bareMs.push(await bare(i));
}
await rm(dir, { recursive: true, force: true });
const ratio = median(annotatedMs) / median(bareMs);
console.log(
  `${FRAMES} source frames 1280×720 at 120 fps, 1/4 speed → video ${size.width}×${size.height}, ${size.frames} frames at ${size.fps} fps`,
);
console.log(
  `annotated clip (decode + overlay + encode): median ${(median(annotatedMs) / 1000).toFixed(2)} s  [${annotatedMs.map((m) => (m / 1000).toFixed(2)).join(', ')}]`,
);
console.log(
  `same frames, no overlay (decode + encode):  median ${(median(bareMs) / 1000).toFixed(2)} s  [${bareMs.map((m) => (m / 1000).toFixed(2)).join(', ')}]`,
);
console.log(`ratio annotated / no overlay: ${ratio.toFixed(2)} (target ≤ ${TARGET}) — ${ratio <= TARGET ? 'met' : 'NOT met'}`);
