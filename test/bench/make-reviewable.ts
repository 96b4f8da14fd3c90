/**
 * Benchmark: how long a 10 s 1920×1080 120 fps H.264 clip takes to become reviewable (probe +
 * frame extraction) compared with ffmpeg merely decoding it (`ffmpeg -i clip -f null -`).
 * Target: extraction ≤ 1.5 × decode. Prints numbers only; it is not a timed test.
 *
 *   npx tsx test/bench/make-reviewable.ts [--reps 2] [--all] [--components] [--quality] [--only 'defaults + huffman,swscale'] [--clip file.mp4] [--keep]
 *
 * --all tries a wider grid of JPEG quality, scaler and decoder threads; --components first prints
 * the ffmpeg CPU seconds of each stage (decode; + resize; + JPEG encoding; + writing the files) so
 * the cost of each part of the extraction shows; --quality compares each setting's first 240
 * frames with the defaults' and with the source resized by lanczos, using ffmpeg's ssim and psnr
 * filters; --only runs the defaults and the settings whose names start with one of the given (comma-separated) texts (`--only none`: the defaults alone); --clip reuses a clip
 * (skips the ~30 s encode); --keep leaves the temp folder. Wall times on a shared machine are
 * noisy, so each setting runs `--reps` times, alternating with the decode baseline, and the
 * fastest run of each is reported; CPU seconds of child processes (from /proc) are shown as well.
 */
import { spawn } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { mkdir, mkdtemp, readdir, rename, rm, stat } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { extractFrames, type ExtractOptions } from '../../server/media/extract';
import {
  DEFAULT_QUALITY,
  DEFAULT_SCALE_FLAGS,
  DEFAULT_SCALER,
  frameScaleFilter,
  jpegPixelOptions,
  plannedManifest,
} from '../../server/media/extract-plan';
import { probeVideo } from '../../server/media/probe';
import { compareFrames, type FrameQuality } from './support/frame-quality';

const { values: args } = parseArgs({
  options: {
    reps: { type: 'string', default: '2' },
    all: { type: 'boolean', default: false },
    clip: { type: 'string' },
    keep: { type: 'boolean', default: false },
    components: { type: 'boolean', default: false },
    quality: { type: 'boolean', default: false },
    only: { type: 'string' },
  },
});

/** CPU seconds used by waited-for child processes (Linux /proc/self/stat cutime + cstime). */
function childCpuS(): number {
  try {
    const fields = readFileSync('/proc/self/stat', 'utf8').split(') ')[1]!.split(' ');
    return (Number(fields[13]) + Number(fields[14])) / 100; // fields 16, 17 of stat(5); USER_HZ 100
  } catch {
    return NaN;
  }
}

function ffmpeg(argv: string[]): Promise<void> {
  return new Promise((resolve, reject) => {
    const child = spawn('ffmpeg', ['-hide_banner', '-v', 'error', ...argv], { stdio: ['ignore', 'ignore', 'pipe'] });
    let err = '';
    child.stderr.on('data', (c: Buffer) => (err += c.toString()));
    child.on('close', (code) => (code === 0 ? resolve() : reject(new Error(`ffmpeg ${code}: ${err}`))));
  });
}

interface Timing {
  wallS: number;
  /** CPU seconds of child processes (ffprobe, ffmpeg). */
  cpuS: number;
  /** CPU seconds of this Node process meanwhile (reading ffmpeg's log and progress, as the server does). */
  nodeS: number;
}

async function timed(fn: () => Promise<unknown>): Promise<Timing> {
  const cpu0 = childCpuS();
  const own0 = process.cpuUsage();
  const t0 = performance.now();
  await fn();
  const own = process.cpuUsage(own0);
  return { wallS: (performance.now() - t0) / 1000, cpuS: childCpuS() - cpu0, nodeS: (own.user + own.system) / 1e6 };
}

const best = (ts: Timing[]): Timing => ({
  wallS: Math.min(...ts.map((t) => t.wallS)),
  cpuS: Math.min(...ts.map((t) => t.cpuS)),
  nodeS: Math.min(...ts.map((t) => t.nodeS)),
});
const f2 = (n: number) => n.toFixed(2);

interface Variant {
  name: string;
  opts: ExtractOptions;
}

const defaults: Variant = { name: `defaults (${DEFAULT_SCALER} ${DEFAULT_SCALE_FLAGS}, q ${DEFAULT_QUALITY})`, opts: {} };
const grid: Variant[] = args.all
  ? [2, 4, 6, 8].flatMap((quality) =>
      (['zscale', 'swscale'] as const).flatMap((scaler) =>
        [undefined, 1, 2].map((threads) => ({
          name: `${scaler}, q ${quality}, threads ${threads ?? 'auto'}`,
          opts: { quality, scaler, threads },
        })),
      ),
    )
  : [
      { name: 'swscale bilinear, q 4', opts: { scaler: 'swscale', scaleFlags: 'bilinear', quality: 4 } },
      { name: 'zscale bilinear, q 6', opts: { scaler: 'zscale', quality: 6 } },
      { name: 'zscale bilinear, q 4, 1 decoder thread', opts: { scaler: 'zscale', quality: 4, threads: 1 } },
      // Cheaper JPEGs: standard Huffman tables instead of optimal ones per frame (larger files).
      { name: 'defaults + huffman default', opts: { jpegOptions: ['-huffman', 'default'] } },
      // Encoder slices on two threads (the encoder otherwise runs in ffmpeg's main thread).
      { name: 'defaults + 2 encoder slices', opts: { jpegOptions: ['-threads', '2', '-slices', '2'] } },
      // h264 decoder shortcuts allowed by the standard's non-bit-exact mode.
      { name: 'defaults + decoder flags2 fast', opts: { inputOptions: ['-flags2', '+fast'] } },
      // Decoder without its deblocking filter: cheaper, but block edges show in the frames.
      { name: 'defaults + skip loop filter', opts: { inputOptions: ['-skip_loop_filter', 'all'] } },
    ];
const only = args.only?.split(',').map((p) => p.trim());
const variants = [defaults, ...grid.filter((v) => !only || only.some((p) => v.name.startsWith(p)))];
const fq = (q: FrameQuality) =>
  `SSIM ${q.ssim.toFixed(4)}, PSNR ${Number.isFinite(q.psnrDb) ? q.psnrDb.toFixed(1) + ' dB' : 'inf (identical)'}`;

/**
 * ffmpeg CPU seconds of each stage of the extraction, alternating the stages `reps` times and
 * keeping the least of each: decode only; decode + resize to the working size (full range);
 * + mjpeg encoding (discarded); + writing the JPEG files. The full extraction (thumbnails and the
 * timestamp log on top) is the defaults row that follows.
 */
async function components(clip: string, out: string, reps: number): Promise<void> {
  const plan = plannedManifest(await probeVideo(clip));
  const scale = frameScaleFilter({ width: plan.width, height: plan.height }, DEFAULT_SCALER, DEFAULT_SCALE_FLAGS);
  const jpeg = ['-c:v', 'mjpeg', ...jpegPixelOptions(DEFAULT_SCALER), '-q:v', String(DEFAULT_QUALITY)];
  const stages: Array<[string, () => string[]]> = [
    ['decode only', () => ['-i', clip, '-f', 'null', '-']],
    [`+ resize (${scale})`, () => ['-i', clip, '-vf', scale, '-f', 'null', '-']],
    ['+ mjpeg encoding (discarded)', () => ['-i', clip, '-vf', scale, ...jpeg, '-f', 'null', '-']],
    [
      '+ writing the JPEG files',
      () => ['-i', clip, '-vf', scale, ...jpeg, '-f', 'image2', '-atomic_writing', '1', path.join(out, '%06d.jpg')],
    ],
  ];
  const cpu = stages.map(() => Infinity);
  for (let r = 0; r < reps; r++) {
    for (const [i, [, argv]] of stages.entries()) {
      await rm(out, { recursive: true, force: true });
      await mkdir(out, { recursive: true });
      cpu[i] = Math.min(cpu[i]!, (await timed(() => ffmpeg(argv()))).cpuS);
    }
  }
  console.log(`ffmpeg CPU seconds by stage (least of ${reps}), ${plan.frameCount} frames → ${plan.width}×${plan.height}:`);
  stages.forEach(([name], i) => {
    const step = i === 0 ? '' : ` (+${f2(cpu[i]! - cpu[i - 1]!)} s, ${f2((1000 * (cpu[i]! - cpu[i - 1]!)) / plan.frameCount)} ms/frame)`;
    console.log(`  ${name.padEnd(60)} ${f2(cpu[i]!)} s CPU${step}; ${f2(cpu[i]! / cpu[0]!)} × decode`);
  });
  console.log(`  the 1.5 target leaves ${f2(0.5 * cpu[0]!)} s CPU over the decode for everything else\n`);
  await rm(out, { recursive: true, force: true });
}

const work = await mkdtemp(path.join(os.tmpdir(), 'tf-bench-'));
for (const signal of ['SIGINT', 'SIGTERM'] as const) {
  process.once(signal, () => {
    void rm(work, { recursive: true, force: true }).finally(() => process.exit(130));
  });
}
try {
  let clip = args.clip;
  if (!clip) {
    clip = path.join(work, 'testsrc2-1080p120-10s.mp4');
    process.stdout.write('encoding 10 s 1920×1080 120 fps testsrc2 (libx264 veryfast, yuv420p)… ');
    const enc = await timed(() =>
      ffmpeg([
        '-f',
        'lavfi',
        '-i',
        'testsrc2=size=1920x1080:rate=120',
        '-t',
        '10',
        '-c:v',
        'libx264',
        '-preset',
        'veryfast',
        '-pix_fmt',
        'yuv420p',
        clip!,
      ]),
    );
    console.log(`${f2(enc.wallS)} s`);
  }
  const reps = Math.max(1, Number(args.reps));
  if (args.components) await components(clip, path.join(work, 'stages'), reps);
  const decode: Timing[] = [];
  const rows: Array<{ v: Variant; t: Timing; frames: number; meanBytes: number; probeS: number }> = [];
  /** Frames of the defaults, kept for --quality. */
  const reference = path.join(work, 'defaults-frames');
  for (const v of variants) {
    const runs: Timing[] = [];
    let frames = 0;
    let meanBytes = 0;
    let probeS = Infinity;
    for (let r = 0; r < reps; r++) {
      decode.push(await timed(() => ffmpeg(['-i', clip!, '-f', 'null', '-'])));
      const out = path.join(work, 'out');
      await rm(out, { recursive: true, force: true });
      runs.push(
        await timed(async () => {
          const t0 = performance.now();
          const probe = await probeVideo(clip!);
          probeS = Math.min(probeS, (performance.now() - t0) / 1000);
          // At the decode's priority: the server runs ffmpeg at a lower one, which on a busy
          // machine measures the neighbours rather than the extraction.
          const m = await extractFrames(clip!, out, { nice: 0, ...v.opts, probe });
          frames = m.frameCount;
        }),
      );
      const files = (await readdir(path.join(out, 'frames'))).filter((f) => f.endsWith('.jpg'));
      let bytes = 0;
      for (const f of files) bytes += (await stat(path.join(out, 'frames', f))).size;
      meanBytes = bytes / files.length;
    }
    rows.push({ v, t: best(runs), frames, meanBytes, probeS });
    const d = best(decode);
    let quality = '';
    if (args.quality) {
      const frames = path.join(work, 'out', 'frames');
      const plan = plannedManifest(await probeVideo(clip));
      const source = await compareFrames(frames, { clip, width: plan.width, height: plan.height });
      if (v === defaults) await rename(frames, reference);
      const vsDefaults =
        v === defaults ? '' : `; against the defaults: ${fq(await compareFrames(path.join(work, 'out', 'frames'), reference))}`;
      quality = ` | against the source (lanczos): ${fq(source)}${vsDefaults}`;
    }
    console.log(
      `${v.name.padEnd(40)} probe+extract ${f2(best(runs).wallS)} s wall (${f2(best(runs).cpuS)} s CPU, Node ${f2(best(runs).nodeS)} s), probe ${f2(probeS)} s | ` +
        `decode ${f2(d.wallS)} s (${f2(d.cpuS)} s CPU) | ratio ${f2(best(runs).wallS / d.wallS)} wall, ${f2(best(runs).cpuS / d.cpuS)} CPU | ` +
        `${frames} frames, ${Math.round(meanBytes / 1024)} KiB/frame${quality}`,
    );
  }
  const d = best(decode);
  console.log(
    `\nffmpeg -f null decode (best of ${decode.length}): ${f2(d.wallS)} s wall, ${f2(d.cpuS)} s CPU; ${os.cpus().length} CPUs, load ${os.loadavg().map(f2).join(' ')}`,
  );
  const ok = rows.filter((r) => r.t.wallS / d.wallS <= 1.5);
  console.log(ok.length ? `meets ≤ 1.5 × decode: ${ok.map((r) => r.v.name).join('; ')}` : 'no setting met ≤ 1.5 × decode here');
} finally {
  if (args.keep) console.log(`kept ${work}`);
  else await rm(work, { recursive: true, force: true });
}
