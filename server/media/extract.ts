import { mkdir, mkdtemp, readdir, rename, rm } from 'node:fs/promises';
import path from 'node:path';
import ffmpeg from 'fluent-ffmpeg';
import {
  DEFAULT_LONG_SIDE,
  DEFAULT_QUALITY,
  DEFAULT_SCALE_FLAGS,
  DEFAULT_SCALER,
  DEFAULT_THUMB_LONG_SIDE,
  THUMB_QUALITY,
  filterGraph,
  fitLongSide,
  frameTimestamps,
  jpegPixelOptions,
  parseShowinfoLine,
  thumbEvery,
  type Scaler,
  type ShowinfoFrame,
  type Size,
} from './extract-plan';
import { FRAMES_DIR, MANIFEST_FILE, THUMBS_DIR, writeManifest, type FrameManifest } from './manifest';
import { MediaError } from './media-error';
import { probeVideo, type VideoProbe } from './probe';

export type { FrameManifest } from './manifest';

/** Options of {@link extractFrames}. */
export interface ExtractOptions {
  /** Long side of working frames in px (default 1280); smaller clips are never upscaled. */
  longSide?: number;
  /** JPEG quality as ffmpeg `-q:v`, 2 (best) … 31 (default {@link DEFAULT_QUALITY}). */
  quality?: number;
  /** Long side of thumbnails in px (default 160). */
  thumbLongSide?: number;
  /** Called as frames are written (from ffmpeg's progress reports, about twice a second). */
  onProgress?: (done: number, total: number) => void;
  /** Aborting kills ffmpeg and removes everything this call wrote. */
  signal?: AbortSignal;
  /** The clip's probe when the caller already has it (saves one ffprobe run). */
  probe?: VideoProbe;
  /** Decoder threads (`-threads` on the input); default: ffmpeg's automatic choice. */
  threads?: number;
  /** Resize kernel for working frames (default {@link DEFAULT_SCALE_FLAGS}). */
  scaleFlags?: string;
  /** Scaler (default {@link DEFAULT_SCALER}; falls back to swscale by itself if zscale fails). */
  scaler?: Scaler;
}

const aborted = () => new MediaError('aborted', 'Frame extraction was cancelled.');
/** ffmpeg output that means zscale itself failed (missing filter, zimg colourspace refusal). */
const ZSCALE_TROUBLE = /zscale|zimg|No such filter|no path between colorspaces/i;

/** Marks a failure that swscale may not have; extractFrames retries once with swscale. */
class ScalerFailed extends Error {
  constructor(readonly failure: MediaError) {
    super(failure.message);
  }
}
const JPG = /^\d{6}\.jpg$/;

async function countJpegs(dir: string): Promise<number> {
  return (await readdir(dir)).filter((f) => JPG.test(f)).length;
}

/**
 * Frame extraction runs at this niceness (`nice -n`): on a busy machine the API (autosave, page
 * reads) keeps its share of the cores, and extraction takes whatever is left.
 */
export const EXTRACT_NICENESS = 10;

interface Run {
  input: string;
  staging: string;
  frame: Size;
  thumb: Size;
  every: number;
  quality: number;
  total: number;
  scaler: Scaler;
  opts: ExtractOptions;
}

/** One ffmpeg process: decode once, write working frames and thumbnails, log timestamps. */
function runFfmpeg(run: Run): Promise<ShowinfoFrame[]> {
  const { opts } = run;
  return new Promise((resolve, reject) => {
    const logged: ShowinfoFrame[] = [];
    const pixel = jpegPixelOptions(run.scaler);
    const inputOptions = ['-hide_banner', '-xerror'];
    if (opts.threads !== undefined) inputOptions.push('-threads', String(opts.threads));
    const command = ffmpeg(run.input, { niceness: EXTRACT_NICENESS })
      .inputOptions(inputOptions)
      .complexFilter(filterGraph(run.frame, run.thumb, run.every, run.scaler, opts.scaleFlags ?? DEFAULT_SCALE_FLAGS))
      .output(path.join(run.staging, FRAMES_DIR, '%06d.jpg'))
      .outputOptions([
        '-map',
        '[frames]',
        '-fps_mode',
        'passthrough',
        '-c:v',
        'mjpeg',
        ...pixel,
        '-q:v',
        String(run.quality),
        '-f',
        'image2',
      ])
      .output(path.join(run.staging, THUMBS_DIR, '%06d.jpg'))
      .outputOptions([
        '-map',
        '[thumbs]',
        '-fps_mode',
        'passthrough',
        '-c:v',
        'mjpeg',
        ...pixel,
        '-q:v',
        String(THUMB_QUALITY),
        '-f',
        'image2',
      ])
      // An abort that came while fluent-ffmpeg was still preparing finds no process to kill.
      .on('start', () => {
        if (opts.signal?.aborted) command.kill('SIGKILL');
      })
      .on('stderr', (line: string) => {
        const frame = parseShowinfoLine(line);
        if (frame) logged.push(frame);
      })
      .on('end', () => {
        opts.signal?.removeEventListener('abort', onAbort);
        resolve(logged);
      })
      .on('error', (err: Error, _stdout: string | null, stderr: string | null) => {
        opts.signal?.removeEventListener('abort', onAbort);
        if (opts.signal?.aborted) return reject(aborted());
        const tail = (stderr ?? '')
          .split('\n')
          .filter((l) => l && !l.includes('showinfo'))
          .slice(-8)
          .join('\n');
        const failure = extractFailure(`${err.message}\n${tail}`, logged.length);
        reject(run.scaler === 'zscale' && ZSCALE_TROUBLE.test(`${err.message}\n${tail}`) ? new ScalerFailed(failure) : failure);
      });
    if (opts.onProgress) {
      const report = opts.onProgress;
      command.on('progress', (p: { frames?: number }) => {
        if (typeof p.frames === 'number' && Number.isFinite(p.frames)) report(Math.min(p.frames, run.total), run.total);
      });
    }
    const onAbort = () => command.kill('SIGKILL');
    opts.signal?.addEventListener('abort', onAbort, { once: true });
    command.run();
  });
}

/** Maps ffmpeg's failure text to a user-facing {@link MediaError}. */
export function extractFailure(text: string, framesDone: number): MediaError {
  if (/Cannot find ffmpeg|spawn \S+ ENOENT/i.test(text)) {
    return new MediaError('tool_missing', 'The video tools are not installed on the server.', text);
  }
  if (/corrupt|Invalid data|partial file|Error while decoding|error splitting|NAL unit/i.test(text)) {
    return new MediaError(
      'extract_failed',
      `This clip is damaged after about ${framesDone} frames and cannot be read to the end. Please export or record it again and re-upload.`,
      text,
    );
  }
  return new MediaError('extract_failed', 'We could not turn this clip into frames.', text);
}

/**
 * Decodes every frame of a clip once with ffmpeg and writes, under `outDir`:
 * - `frames/000001.jpg …`: one JPEG per decoded frame (`-fps_mode passthrough`: no frame is
 *   dropped or duplicated), displayed orientation (ffmpeg's autorotate), long side ≤ `longSide`,
 *   never upscaled, even width and height, square pixels, full-range JFIF (resized by zscale,
 *   or swscale when zscale is unavailable);
 * - `thumbs/000001.jpg …`: one thumbnail every `thumbEvery` frames (≈ 10 per second of video,
 *   ≤ 600 per clip; thumb k shows frame (k − 1)·thumbEvery), long side ≤ `thumbLongSide`;
 * - `manifest.json` ({@link FrameManifest}), written last — its presence means "complete".
 *
 * Output is built in a hidden staging folder and moved into place only on success, so a failure
 * or an abort leaves no partial frames (and an earlier complete extraction stays as it was until
 * it is replaced). `outDir` may also hold the source clip; nothing else in it is touched.
 *
 * @throws {MediaError} `aborted`, `extract_failed` (damaged or truncated stream: ffmpeg runs with
 *   `-xerror`, so any decoding error stops it), `tool_missing`, or any error of {@link probeVideo}.
 */
export async function extractFrames(input: string, outDir: string, opts: ExtractOptions = {}): Promise<FrameManifest> {
  const { signal } = opts;
  if (signal?.aborted) throw aborted();
  const probe = opts.probe ?? (await probeVideo(input));
  if (signal?.aborted) throw aborted();
  const quality = opts.quality ?? DEFAULT_QUALITY;
  if (!Number.isInteger(quality) || quality < 2 || quality > 31) throw new RangeError(`quality must be an integer 2–31, got ${quality}`);
  const frame = fitLongSide({ width: probe.displayWidth, height: probe.displayHeight }, opts.longSide ?? DEFAULT_LONG_SIDE);
  const thumb = fitLongSide(frame, opts.thumbLongSide ?? DEFAULT_THUMB_LONG_SIDE);
  const every = thumbEvery(probe.fps, probe.frameCount);

  await mkdir(outDir, { recursive: true });
  const staging = await mkdtemp(path.join(outDir, '.extract-'));
  try {
    const attempt = async (scaler: Scaler) => {
      for (const dir of [FRAMES_DIR, THUMBS_DIR]) {
        await rm(path.join(staging, dir), { recursive: true, force: true });
        await mkdir(path.join(staging, dir));
      }
      return runFfmpeg({ input, staging, frame, thumb, every, quality, total: probe.frameCount, scaler, opts });
    };
    const scaler = opts.scaler ?? DEFAULT_SCALER;
    let logged: ShowinfoFrame[];
    try {
      logged = await attempt(scaler);
    } catch (err) {
      if (!(err instanceof ScalerFailed)) throw err;
      if (signal?.aborted) throw aborted();
      logged = await attempt('swscale').catch((again: unknown) => {
        throw again instanceof ScalerFailed ? again.failure : again;
      });
    }
    if (signal?.aborted) throw aborted();
    const frameCount = await countJpegs(path.join(staging, FRAMES_DIR));
    if (frameCount === 0 || frameCount < 0.9 * probe.frameCount) {
      throw new MediaError(
        'extract_failed',
        `Only ${frameCount} of ${probe.frameCount} frames could be read; the clip may be cut short. Please upload it again.`,
        `decoded ${frameCount}, container says ${probe.frameCount}`,
      );
    }
    const { timestampsMs, source } = frameTimestamps(logged, frameCount, probe.fps);
    const manifest: FrameManifest = {
      version: 1,
      frameCount,
      width: frame.width,
      height: frame.height,
      fps: probe.fps,
      durationS: probe.durationS,
      rotationApplied: probe.rotation,
      timestampsMs,
      timestampsSource: source,
      thumbEvery: every,
      thumbCount: await countJpegs(path.join(staging, THUMBS_DIR)),
      thumbWidth: thumb.width,
      thumbHeight: thumb.height,
      quality,
    };
    await rm(path.join(outDir, MANIFEST_FILE), { force: true });
    for (const dir of [FRAMES_DIR, THUMBS_DIR]) {
      await rm(path.join(outDir, dir), { recursive: true, force: true });
      await rename(path.join(staging, dir), path.join(outDir, dir));
    }
    await writeManifest(outDir, manifest);
    opts.onProgress?.(frameCount, frameCount);
    return manifest;
  } finally {
    await rm(staging, { recursive: true, force: true });
  }
}
