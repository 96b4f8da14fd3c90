/**
 * Renders the synthetic runner with @napi-rs/canvas and encodes it with ffmpeg (raw RGBA frames
 * piped to stdin → H.264 yuv420p mp4, BT.709 tagged), writing the ground truth beside the clip.
 */
import { spawn } from 'node:child_process';
import { mkdir, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { createCanvas } from '@napi-rs/canvas';
import { buildGroundTruth, frameTimeS, modelForClip, type ClipSpec, type GroundTruth } from './ground-truth';
import { flickerGain, seededRandom, shakeOffsetPx, type RealismOptions } from './realism';
import { drawFrame, makeTexturedWall } from './render';

export type { ClipSpec, GroundTruth } from './ground-truth';
export { ALL_REALISM, type RealismOptions } from './realism';

/** Options of {@link generateRunnerClip}. */
export interface RunnerClipOptions extends ClipSpec {
  /** Output .mp4 path; the ground truth goes to {@link groundTruthPath} of it. */
  outFile: string;
  /** x264 preset (default `fast`). */
  preset?: string;
  /** x264 constant rate factor (default 18: visually lossless for flat colours; 28 with `realism.compressionNoise`). */
  crf?: number;
}

/** Where the ground truth of a clip is written: `clip.mp4` → `clip.ground-truth.json`. */
export function groundTruthPath(videoFile: string): string {
  return videoFile.replace(/\.mp4$/i, '') + '.ground-truth.json';
}

function startEncoder(opts: RunnerClipOptions) {
  const args = [
    '-hide_banner',
    '-v',
    'error',
    '-y',
    '-f',
    'rawvideo',
    '-pix_fmt',
    'rgba',
    '-s',
    `${opts.width}x${opts.height}`,
    '-r',
    String(opts.fps),
    '-i',
    '-',
    '-vf',
    'scale=out_color_matrix=bt709:out_range=tv,format=yuv420p',
    '-colorspace',
    'bt709',
    '-color_primaries',
    'bt709',
    '-color_trc',
    'bt709',
    '-color_range',
    'tv',
    '-c:v',
    'libx264',
    '-preset',
    opts.preset ?? 'fast',
    '-crf',
    String(opts.crf ?? (opts.realism?.compressionNoise ? 28 : 18)),
    '-movflags',
    '+faststart',
    opts.outFile,
  ];
  const child = spawn(process.env['FFMPEG_PATH'] ?? 'ffmpeg', args, { stdio: ['pipe', 'ignore', 'pipe'] });
  let stderr = '';
  child.stderr.on('data', (c: Buffer) => (stderr += c.toString()));
  const done = new Promise<void>((resolve, reject) => {
    child.on('error', reject);
    child.on('close', (code) => (code === 0 ? resolve() : reject(new Error(`ffmpeg exited with ${code}: ${stderr.trim()}`))));
  });
  return { child, done };
}

/**
 * Renders a side-view runner clip and its ground truth.
 * Writes `opts.outFile` (H.264 mp4) and `groundTruthPath(opts.outFile)` (JSON) and returns the
 * ground truth. Stride and contact are rounded to whole frames (see `frameTiming`), so every
 * initial contact and toe-off falls on a frame.
 */
export async function generateRunnerClip(opts: RunnerClipOptions): Promise<GroundTruth> {
  if (opts.width % 2 || opts.height % 2) throw new RangeError('width and height must be even for yuv420p');
  await mkdir(path.dirname(path.resolve(opts.outFile)), { recursive: true });
  const truth = buildGroundTruth(opts);
  const { model, timing, layout, frameCount } = modelForClip(opts);
  const canvas = createCanvas(opts.width, opts.height);
  const ctx = canvas.getContext('2d');
  const realism = opts.realism;
  const extras = {
    ...(realism?.texture ? { background: makeTexturedWall(opts.width, opts.height, realism.seed ?? 1) } : {}),
    farMarkersOnTop: realism?.occlusion === false,
    noMarkers: opts.tapeMarkers === false,
  };
  const film = realism && (realism.motionBlur || realism.flicker || realism.compressionNoise) ? new FilmEffects(opts, realism) : null;
  const { child, done } = startEncoder(opts);
  const stdin = child.stdin!;
  let failed: Error | null = null;
  done.catch((err: Error) => (failed = err));
  stdin.on('error', (err) => (failed ??= err));
  for (let i = 0; i < frameCount && !failed; i++) {
    const offset = shakeOffsetPx(i, opts.fps, opts.width, realism);
    const shutter = film?.shutterOffsetsS ?? [0];
    for (const dt of shutter) {
      const pose = model.pose(frameTimeS(i, opts, timing) + dt);
      drawFrame(ctx, pose, layout, opts, model.beltSpeedMps, { ...extras, offset });
      // Every pixel is opaque, so the premultiplied bytes equal straight RGBA.
      film?.add(canvas.data());
    }
    const bytes = film ? film.finish(i) : canvas.data();
    if (!stdin.write(bytes)) await new Promise<void>((resolve) => stdin.once('drain', resolve));
  }
  stdin.end();
  await done;
  await writeFile(groundTruthPath(opts.outFile), JSON.stringify(truth));
  return truth;
}

/**
 * Motion blur (average of sub-frames over a 180° shutter centred on the frame time, so the blurred
 * marker's centre stays on the ground truth), lighting gain and sensor noise, applied to raw RGBA.
 */
class FilmEffects {
  /** Sub-frame times relative to the frame time, s. */
  readonly shutterOffsetsS: number[];
  private readonly sum: Uint16Array;
  private readonly out: Buffer;
  private readonly noise: Int8Array;
  private readonly rnd: () => number;
  private count = 0;

  constructor(
    private readonly spec: ClipSpec,
    private readonly realism: RealismOptions,
  ) {
    const n = spec.width * spec.height * 4;
    const exposureS = 0.5 / spec.fps;
    this.shutterOffsetsS = realism.motionBlur ? [-0.375, -0.125, 0.125, 0.375].map((k) => k * exposureS) : [0];
    this.sum = new Uint16Array(n);
    this.out = Buffer.alloc(n);
    this.rnd = seededRandom((realism.seed ?? 1) * 31337);
    // Roughly Gaussian sensor noise, σ ≈ 3 grey levels (sum of three uniforms), reused at random offsets.
    this.noise = new Int8Array(1 << 20);
    for (let i = 0; i < this.noise.length; i++) this.noise[i] = Math.round((this.rnd() + this.rnd() + this.rnd() - 1.5) * 6);
  }

  add(rgba: Uint8Array): void {
    const sum = this.sum;
    if (this.count === 0) for (let i = 0; i < sum.length; i++) sum[i] = rgba[i]!;
    else for (let i = 0; i < sum.length; i++) sum[i]! += rgba[i]!;
    this.count++;
  }

  finish(index: number): Buffer {
    const gain = flickerGain(index, this.spec.fps, this.realism) / this.count;
    const { sum, out, noise } = this;
    const noisy = !!this.realism.compressionNoise;
    const mask = noise.length - 1;
    let k = Math.floor(this.rnd() * noise.length);
    for (let i = 0; i < sum.length; i += 4) {
      const d = noisy ? noise[k++ & mask]! : 0;
      out[i] = Math.min(255, Math.max(0, sum[i]! * gain + d));
      out[i + 1] = Math.min(255, Math.max(0, sum[i + 1]! * gain + d));
      out[i + 2] = Math.min(255, Math.max(0, sum[i + 2]! * gain + d));
      out[i + 3] = 255;
    }
    this.count = 0;
    return out;
  }
}

/** The two clips the demo seed uses (invented athlete whose push-off was guarded after a hamstring strain). */
export const DEMO_CLIPS = {
  baseline: { name: 'baseline', label: 'Baseline', hipExtensionDeg: 4 },
  retest: { name: 'retest', label: 'Re-test', hipExtensionDeg: 11 },
} as const;

/** One generated demo clip: files and truth. */
export interface DemoClip {
  label: string;
  videoFile: string;
  groundTruthFile: string;
  groundTruth: GroundTruth;
}

/**
 * Makes the demo seed's clips in `outDir`: Baseline (~4° hip extension at toe-off) and Re-test
 * (~11°), 1280×720 at 120 fps, 3 s, facing right: `baseline.mp4` / `retest.mp4` plus their
 * `.ground-truth.json`. Takes tens of seconds on two cores.
 */
export async function generateDemoClips(
  outDir: string,
  overrides: Partial<Omit<RunnerClipOptions, 'outFile' | 'hipExtensionDeg'>> = {},
): Promise<{ baseline: DemoClip; retest: DemoClip }> {
  const make = async (clip: (typeof DEMO_CLIPS)[keyof typeof DEMO_CLIPS]): Promise<DemoClip> => {
    const videoFile = path.join(outDir, `${clip.name}.mp4`);
    const groundTruth = await generateRunnerClip({
      fps: 120,
      width: 1280,
      height: 720,
      seconds: 3,
      facing: 'right',
      ...overrides,
      hipExtensionDeg: clip.hipExtensionDeg,
      outFile: videoFile,
    });
    return { label: clip.label, videoFile, groundTruthFile: groundTruthPath(videoFile), groundTruth };
  };
  return { baseline: await make(DEMO_CLIPS.baseline), retest: await make(DEMO_CLIPS.retest) };
}
