/**
 * Benchmark: rendering an annotated still of a 1280×720 frame on the server (decode the frame
 * JPEG, draw it, the shared overlay with angle labels, heading and caption, encode PNG and the
 * phone JPEG). Target ≤ 300 ms. Side by side in the same run: the bare floor — decode the same
 * JPEG and encode a PNG of it, no overlay — so the overlay's share is visible. Prints numbers only.
 *
 *   npx tsx test/bench/still-render.ts [--runs 30]
 */
import { parseArgs } from 'node:util';
import { performance } from 'node:perf_hooks';
import { createCanvas, loadImage } from '@napi-rs/canvas';
import { renderStill } from '../../server/render/still-render';
import { H, W, median, p95, frameJpeg, runnerPanel } from './support/still-inputs';

const { values: args } = parseArgs({ options: { runs: { type: 'string', default: '30' } } });
const RUNS = Number(args.runs);
const TARGET_MS = 300;

const jpeg = await frameJpeg();
const panel = runnerPanel(jpeg);
const caption =
  'Right toe-off at the re-test: the thigh now passes vertical and the hip reaches extension before the foot leaves the belt.';

async function full(): Promise<number> {
  const t0 = performance.now();
  const out = await renderStill({ panels: [panel], caption, showAngles: true });
  const ms = performance.now() - t0;
  if (out.width !== W || out.labels.length === 0) throw new Error('unexpected render');
  return ms;
}

async function bare(): Promise<number> {
  const t0 = performance.now();
  const img = await loadImage(jpeg);
  const canvas = createCanvas(W, H);
  canvas.getContext('2d').drawImage(img, 0, 0);
  await canvas.encode('png');
  return performance.now() - t0;
}

for (let i = 0; i < 3; i++) {
  await full();
  await bare();
}
const fullMs: number[] = [];
const bareMs: number[] = [];
for (let i = 0; i < RUNS; i++) {
  // Interleaved, so both see the same machine load.
  fullMs.push(await full());
  bareMs.push(await bare());
}
const m = median(fullMs);
console.log(`frame ${W}×${H} JPEG (${(jpeg.length / 1024).toFixed(0)} KiB), ${RUNS} runs each, interleaved`);
console.log(`annotated still (PNG + phone JPEG): median ${m.toFixed(1)} ms, p95 ${p95(fullMs).toFixed(1)} ms`);
console.log(`bare decode + PNG encode:          median ${median(bareMs).toFixed(1)} ms`);
console.log(`ratio still / bare: ${(m / median(bareMs)).toFixed(2)}`);
console.log(`ratio median / target (${TARGET_MS} ms): ${(m / TARGET_MS).toFixed(2)} — ${m <= TARGET_MS ? 'met' : 'NOT met'}`);
