import { PassThrough } from 'node:stream';
import ffmpeg from 'fluent-ffmpeg';

/**
 * Encoder settings of annotated clips, used by the renderer and by its benchmark baseline alike:
 * H.264 (x264, High profile) in MP4, yuv420p with BT.709 tags, `moov` before `mdat` (fast start)
 * so a phone browser starts playing before the whole file has arrived, no audio.
 */
export const CLIP_ENCODING = {
  preset: 'fast',
  /** Constant rate factor: visually clean for overlay lines and small text. */
  crf: 20,
  profile: 'high',
} as const;

/** Options of {@link startH264Encoder}. */
export interface H264EncoderOptions {
  /** Frame size, px; both even (yuv420p halves the colour planes). */
  width: number;
  height: number;
  /** Video frame rate, frames/s (any positive number; passed to ffmpeg as a ratio). */
  fps: number;
  /**
   * Video frames per frame written (≥ 1, default 1): ffmpeg reads the frames at `fps ÷ repeat` and
   * its `fps` filter repeats each one, after the colour conversion, so a slowed-down clip's copies
   * are neither drawn, piped nor converted again. N frames written give N × repeat video frames.
   */
  repeat?: number;
  /** The .mp4 file to write (a real file: fast start rewrites it once at the end). */
  outFile: string;
  /** Aborting kills ffmpeg; {@link H264Encoder.done} then rejects. */
  signal?: AbortSignal;
}

/** A running ffmpeg that takes raw RGBA frames. */
export interface H264Encoder {
  /** Queues one frame (width × height × 4 bytes, opaque RGBA); resolves when ffmpeg can take more. */
  write(frame: Buffer): Promise<void>;
  /** Ends the input and resolves once the file is complete. */
  finish(): Promise<void>;
  /** Kills ffmpeg (the file is left incomplete for the caller to remove). */
  abort(): void;
  /** Settles when ffmpeg exits (rejects with its last error line). */
  readonly done: Promise<void>;
  /** CPU seconds (user + system) ffmpeg spent, as it reports with `-benchmark`; null before it ends or when not reported. */
  cpuSeconds(): number | null;
}

/** User + system CPU seconds from ffmpeg's `-benchmark` line (`bench: utime=1.234s stime=0.056s rtime=…`), or null. */
export function benchCpuSeconds(stderr: string): number | null {
  const m = /bench:\s+utime=([\d.]+)s\s+stime=([\d.]+)s/.exec(stderr);
  return m ? Number(m[1]) + Number(m[2]) : null;
}

/** `fps ÷ divisor` as an exact-enough ratio for ffmpeg (`30000/1000`, `14985/1000`, `30000/4000`). */
export function fpsRatio(fps: number, divisor = 1): string {
  return `${Math.round(fps * 1000)}/${1000 * divisor}`;
}

/**
 * Starts Debian's ffmpeg (through fluent-ffmpeg) reading raw RGBA frames from a pipe — no file
 * per frame — and writing H.264 in MP4 with {@link CLIP_ENCODING}.
 */
export function startH264Encoder(opts: H264EncoderOptions): H264Encoder {
  if (opts.width % 2 || opts.height % 2) throw new RangeError('width and height must be even for yuv420p');
  const repeat = opts.repeat ?? 1;
  if (!Number.isInteger(repeat) || repeat < 1) throw new RangeError(`repeat must be a whole number ≥ 1, not ${repeat}`);
  const frameBytes = opts.width * opts.height * 4;
  // Two frames in flight: ffmpeg encodes one while the caller draws the next.
  const input = new PassThrough({ highWaterMark: frameBytes * 2 });
  let failure: Error | null = null;
  let killed = false;
  let cpu: number | null = null;
  const command = ffmpeg(input)
    .inputFormat('rawvideo')
    // -benchmark (global): ffmpeg prints its CPU time when it ends.
    .inputOptions([
      '-benchmark',
      '-pix_fmt',
      'rgba',
      '-video_size',
      `${opts.width}x${opts.height}`,
      '-framerate',
      fpsRatio(opts.fps, repeat),
    ])
    .noAudio()
    .videoCodec('libx264')
    .outputOptions([
      '-vf',
      `scale=out_color_matrix=bt709:out_range=tv,format=yuv420p${repeat > 1 ? `,fps=${fpsRatio(opts.fps)}` : ''}`,
      '-preset',
      CLIP_ENCODING.preset,
      '-crf',
      String(CLIP_ENCODING.crf),
      '-profile:v',
      CLIP_ENCODING.profile,
      '-pix_fmt',
      'yuv420p',
      '-colorspace',
      'bt709',
      '-color_primaries',
      'bt709',
      '-color_trc',
      'bt709',
      '-color_range',
      'tv',
      '-movflags',
      '+faststart',
    ])
    .format('mp4')
    .output(opts.outFile);
  const done = new Promise<void>((resolve, reject) => {
    command.on('end', (_out: string | null, stderr: string | null) => {
      cpu = benchCpuSeconds(stderr ?? '');
      resolve();
    });
    command.on('error', (err: Error, _out: string | null, stderr: string | null) => {
      const last = (stderr ?? '').trim().split('\n').slice(-2).join(' ');
      failure = new Error(killed ? 'Encoding was cancelled.' : `ffmpeg could not encode the clip: ${last || err.message}`);
      reject(failure);
    });
  });
  // ffmpeg gone (finished, failed or killed): a write waiting for it to read is told at once (the
  // pipe closes; `failure` says why) rather than waiting for ever.
  done.then(
    () => input.destroy(),
    () => input.destroy(),
  );
  const onAbort = () => {
    killed = true;
    input.destroy();
    command.kill('SIGKILL');
  };
  opts.signal?.addEventListener('abort', onAbort, { once: true });
  void done.finally(() => opts.signal?.removeEventListener('abort', onAbort)).catch(() => undefined);
  command.run();
  return {
    done,
    async write(frame) {
      if (failure) throw failure;
      if (frame.length !== frameBytes) throw new RangeError(`a frame has ${frame.length} bytes, expected ${frameBytes}`);
      if (!input.write(frame)) {
        await new Promise<void>((resolve, reject) => {
          const onDrain = () => {
            input.off('close', onClose);
            resolve();
          };
          const onClose = () => {
            input.off('drain', onDrain);
            reject(failure ?? new Error('ffmpeg stopped reading frames.'));
          };
          input.once('drain', onDrain);
          input.once('close', onClose);
        });
      }
    },
    abort: onAbort,
    cpuSeconds: () => cpu,
    async finish() {
      input.end();
      await done;
    },
  };
}
