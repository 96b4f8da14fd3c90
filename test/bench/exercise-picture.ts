/**
 * Benchmark: processing a 12-megapixel phone photo (4032×3024 JPEG with EXIF orientation 6 and
 * GPS) into a demonstration picture with jimp — decode, turn upright, scale to 1600 px, 400 px
 * thumbnail, re-encode without metadata (`processPicture`, as the picture worker runs it). Side by
 * side in the same run and with the same library: the plain floor — decode the same JPEG and
 * encode it again at full size — and the earlier way (jimp turns the full-size photo upright on
 * decode, then scale, copy the 1600 px picture for the thumbnail). Wall and CPU time (the machine
 * may be shared: CPU time is the steadier figure). Prints numbers only.
 *
 *   npx tsx test/bench/exercise-picture.ts [--runs 3]
 */
import { parseArgs } from 'node:util';
import { performance } from 'node:perf_hooks';
import { createCanvas } from '@napi-rs/canvas';
import { Jimp } from 'jimp';
import { processPicture } from '../../server/pictures/picture-processing';
import { withExif } from '../support/pictures';
import { median } from './support/still-inputs';

const { values: args } = parseArgs({ options: { runs: { type: 'string', default: '3' } } });
const RUNS = Number(args.runs);
const W = 4032;
const H = 3024;

/** A phone-like photo: gradients, shapes and fine grain (so the JPEG is not trivially small). */
async function phoneJpeg(): Promise<Buffer> {
  const canvas = createCanvas(W, H);
  const ctx = canvas.getContext('2d');
  const sky = ctx.createLinearGradient(0, 0, 0, H);
  sky.addColorStop(0, '#8fb7d9');
  sky.addColorStop(0.6, '#e9eef2');
  sky.addColorStop(1, '#6d7f5a');
  ctx.fillStyle = sky;
  ctx.fillRect(0, 0, W, H);
  for (let i = 0; i < 400; i++) {
    ctx.fillStyle = `hsl(${(i * 37) % 360} 40% ${30 + (i % 40)}%)`;
    ctx.beginPath();
    ctx.arc((i * 997) % W, (i * 613) % H, 20 + (i % 90), 0, Math.PI * 2);
    ctx.fill();
  }
  const grain = ctx.getImageData(0, 0, W, H);
  let seed = 7;
  for (let i = 0; i < grain.data.length; i += 4) {
    seed = (seed * 1103515245 + 12345) & 0x7fffffff;
    const n = (seed % 17) - 8;
    grain.data[i] = grain.data[i]! + n;
    grain.data[i + 1] = grain.data[i + 1]! + n;
    grain.data[i + 2] = grain.data[i + 2]! + n;
  }
  ctx.putImageData(grain, 0, 0);
  return withExif(await canvas.encode('jpeg', 90), 6);
}

const jpeg = await phoneJpeg();

/** Wall and CPU (user + system) milliseconds of one call. */
async function timed(fn: () => Promise<void>): Promise<{ wall: number; cpu: number }> {
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  await fn();
  const c = process.cpuUsage(c0);
  return { wall: performance.now() - t0, cpu: (c.user + c.system) / 1000 };
}

const processed = () =>
  timed(async () => {
    const out = await processPicture(jpeg);
    if (out.full.width !== 1200 || out.full.height !== 1600) throw new Error(`unexpected size ${out.full.width}×${out.full.height}`);
  });

const plain = () =>
  timed(async () => {
    const img = await Jimp.fromBuffer(jpeg);
    await img.getBuffer('image/jpeg', { quality: 82 });
  });

/** The earlier pipeline: upright at full size by jimp's decoder, then scale, and a copy for the thumbnail. */
const earlier = () =>
  timed(async () => {
    const img = await Jimp.fromBuffer(jpeg);
    img.resize({ w: 1200, h: 1600 });
    await img.getBuffer('image/jpeg', { quality: 82 });
    await img.clone().resize({ w: 300, h: 400 }).getBuffer('image/jpeg', { quality: 82 });
  });

await processed();
await plain();
const runs = {
  processed: [] as { wall: number; cpu: number }[],
  plain: [] as { wall: number; cpu: number }[],
  earlier: [] as { wall: number; cpu: number }[],
};
for (let i = 0; i < RUNS; i++) {
  // Interleaved, so all see the same machine load.
  runs.processed.push(await processed());
  runs.plain.push(await plain());
  runs.earlier.push(await earlier());
}
const med = (list: { wall: number; cpu: number }[], k: 'wall' | 'cpu') => median(list.map((r) => r[k]));
const p = med(runs.processed, 'wall');
const b = med(runs.plain, 'wall');
const cpu = (list: { wall: number; cpu: number }[]) => `${(med(list, 'cpu') / 1000).toFixed(2)} s CPU`;
console.log(
  `photo ${W}×${H} JPEG (${(jpeg.length / 1024 / 1024).toFixed(1)} MiB, EXIF orientation 6 + GPS), ${RUNS} runs each, interleaved, jimp`,
);
console.log(
  `demonstration picture (orient, 1600 px + 400 px thumbnail, strip, encode): median ${(p / 1000).toFixed(2)} s, ${cpu(runs.processed)}`,
);
console.log(
  `plain decode + encode at full size:                                        median ${(b / 1000).toFixed(2)} s, ${cpu(runs.plain)}`,
);
console.log(
  `earlier way (upright at full size on decode, copy for the thumbnail):      median ${(med(runs.earlier, 'wall') / 1000).toFixed(2)} s, ${cpu(runs.earlier)}`,
);
console.log(`ratio picture / plain: ${(p / b).toFixed(2)} wall, ${(med(runs.processed, 'cpu') / med(runs.plain, 'cpu')).toFixed(2)} CPU`);
console.log(`ratio picture / earlier way: ${(med(runs.processed, 'cpu') / med(runs.earlier, 'cpu')).toFixed(2)} CPU`);
