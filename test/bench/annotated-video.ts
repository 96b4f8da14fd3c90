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

/** One run: wall time, this process's CPU time (decode, drawing, piping) and ffmpeg's CPU time, seconds. */
interface Run {
  wallS: number;
  nodeCpuS: number;
  ffmpegCpuS: number;
}

const cpuSince = (c0: NodeJS.CpuUsage) => {
  const c = process.cpuUsage(c0);
  return (c.user + c.system) / 1e6;
};

async function annotated(round: number): Promise<Run> {
  const t0 = performance.now();
  const c0 = process.cpuUsage();
  const out = await renderAnnotatedClip({
    panels: [panel],
    steps,
    factor: FACTOR,
    caption,
    showAngles: true,
    outFile: path.join(dir, `annotated-${round}.mp4`),
  });
  const wallS = (performance.now() - t0) / 1000;
  size = { width: out.width, height: out.height, frames: out.frameCount, fps: out.outputFps };
  return { wallS, nodeCpuS: cpuSince(c0), ffmpegCpuS: out.encoderCpuS ?? Number.NaN };
}

async function bare(round: number): Promise<Run> {
  const { repeat, outputFps } = slowMotionTiming(120, FACTOR);
  const t0 = performance.now();
  const c0 = process.cpuUsage();
  const canvas = createCanvas(size.width, size.height);
  const ctx = canvas.getContext('2d');
  ctx.fillStyle = '#FFFFFF';
  ctx.fillRect(0, 0, size.width, size.height);
  const encoder = startH264Encoder({
    width: size.width,
    height: size.height,
    fps: outputFps,
    repeat,
    outFile: path.join(dir, `bare-${round}.mp4`),
  });
  for (const jpeg of runner.jpegs) {
    ctx.drawImage(await loadImage(jpeg), 0, 0);
    await encoder.write(canvas.data());
  }
  await encoder.finish();
  return { wallS: (performance.now() - t0) / 1000, nodeCpuS: cpuSince(c0), ffmpegCpuS: encoder.cpuSeconds() ?? Number.NaN };
}

await annotated(-1); // warm-up, and learns the video size
const runs: { annotated: Run[]; bare: Run[] } = { annotated: [], bare: [] };
for (let i = 0; i < ROUNDS; i++) {
  runs.annotated.push(await annotated(i));
  runs.bare.push(await bare(i));
}
await rm(dir, { recursive: true, force: true });
const med = (list: Run[], k: keyof Run) => median(list.map((r) => r[k]));
const line = (list: Run[]) =>
  `wall median ${med(list, 'wallS').toFixed(2)} s [${list.map((r) => r.wallS.toFixed(2)).join(', ')}]; ` +
  `CPU Node ${med(list, 'nodeCpuS').toFixed(2)} s + ffmpeg ${med(list, 'ffmpegCpuS').toFixed(2)} s`;
const ratio = med(runs.annotated, 'wallS') / med(runs.bare, 'wallS');
const cpu = (list: Run[]) => med(list, 'nodeCpuS') + med(list, 'ffmpegCpuS');
const [load1, load5] = os.loadavg();
console.log(
  `${FRAMES} source frames 1280×720 at 120 fps, 1/4 speed → video ${size.width}×${size.height}, ${size.frames} frames at ${size.fps} fps`,
);
console.log(`annotated clip (decode + overlay + encode): ${line(runs.annotated)}`);
console.log(`same frames, no overlay (decode + encode):  ${line(runs.bare)}`);
console.log(
  `CPU ratio (Node + ffmpeg) annotated / no overlay: ${(cpu(runs.annotated) / cpu(runs.bare)).toFixed(2)}; ` +
    `Node side alone ${(med(runs.annotated, 'nodeCpuS') / med(runs.bare, 'nodeCpuS')).toFixed(2)}; ffmpeg alone ${(med(runs.annotated, 'ffmpegCpuS') / med(runs.bare, 'ffmpegCpuS')).toFixed(2)}`,
);
console.log(`load average ${load1!.toFixed(1)} (1 min), ${load5!.toFixed(1)} (5 min) on ${os.cpus().length} cores`);
console.log(`ratio annotated / no overlay (wall): ${ratio.toFixed(2)} (target ≤ ${TARGET}) — ${ratio <= TARGET ? 'met' : 'NOT met'}`);
