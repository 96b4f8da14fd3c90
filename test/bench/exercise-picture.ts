/**
 * Benchmark: processing a 12-megapixel phone photo (4032×3024 JPEG with EXIF orientation 6 and
 * GPS) into a demonstration picture with jimp — decode, turn upright, scale to 1600 px, 400 px
 * thumbnail, re-encode without metadata (`processPicture`, as the picture worker runs it). Side by
 * side in the same run and with the same library: the plain floor — decode the same JPEG and
 * encode it again at full size. Prints numbers only.
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

async function processed(): Promise<number> {
  const t0 = performance.now();
  const out = await processPicture(jpeg);
  const ms = performance.now() - t0;
  if (out.full.width !== 1200 || out.full.height !== 1600) throw new Error(`unexpected size ${out.full.width}×${out.full.height}`);
  return ms;
}

async function plain(): Promise<number> {
  const t0 = performance.now();
  const img = await Jimp.fromBuffer(jpeg);
  await img.getBuffer('image/jpeg', { quality: 82 });
  return performance.now() - t0;
}

await processed();
await plain();
const processedMs: number[] = [];
const plainMs: number[] = [];
for (let i = 0; i < RUNS; i++) {
  // Interleaved, so both see the same machine load.
  processedMs.push(await processed());
  plainMs.push(await plain());
}
const p = median(processedMs);
const b = median(plainMs);
console.log(
  `photo ${W}×${H} JPEG (${(jpeg.length / 1024 / 1024).toFixed(1)} MiB, EXIF orientation 6 + GPS), ${RUNS} runs each, interleaved, jimp`,
);
console.log(`demonstration picture (orient, 1600 px + 400 px thumbnail, strip, encode): median ${(p / 1000).toFixed(2)} s`);
console.log(`plain decode + encode at full size:                                        median ${(b / 1000).toFixed(2)} s`);
console.log(`ratio picture / plain: ${(p / b).toFixed(2)}`);
