import { existsSync } from 'node:fs';
import { mkdir, readdir, rm } from 'node:fs/promises';
import path from 'node:path';
import ffmpeg from 'fluent-ffmpeg';
import {
  DEFAULT_SCALE_FLAGS,
  DEFAULT_SCALER,
  THUMB_QUALITY,
  filterGraph,
  frameTimestamps,
  jpegPixelOptions,
  oddPixelTrim,
  parseShowinfoLine,
  plannedManifest,
  type Scaler,
  type ShowinfoFrame,
  type Size,
} from './extract-plan';
import { FRAMES_DIR, THUMBS_DIR, frameFileName, writeManifest, type FrameManifest } from './manifest';
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
  /**
   * Called as frames are written, in order: frames 0 … done − 1 are complete files (from ffmpeg's
   * progress reports, every {@link STATS_PERIOD_S} s). Goes back to 0 if the extraction restarts
   * with the fallback scaler.
   */
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
  /** More decoder options before the input (the benchmark tries e.g. `-skip_loop_filter all`). */
  inputOptions?: string[];
  /** More encoder options of the frame JPEGs (the benchmark tries e.g. `-huffman default`). */
  jpegOptions?: string[];
  /** CPU priority of ffmpeg (`nice` value, 0–19; default {@link FFMPEG_NICE}), so web requests stay responsive. */
  nice?: number;
}

/** How often ffmpeg reports progress, s: the first frames are announced within this of being written. */
export const STATS_PERIOD_S = 0.1;
/** Default niceness of ffmpeg: below the web server, so requests are answered while frames are made. */
export const FFMPEG_NICE = 10;

const aborted = () => new MediaError('aborted', 'Frame extraction was cancelled.');
/** ffmpeg output that means zscale itself failed (missing filter, zimg colourspace refusal). */
const ZSCALE_TROUBLE = /zscale|zimg|No such filter|no path between colorspaces/i;

/**
 * Encoder time base of both outputs: the demuxer's (`-enc_time_base -1`, ffmpeg 5.1's spelling of
 * `demux`). Without it ffmpeg times the encoder in 1 ÷ the guessed frame rate, which for a
 * variable-frame-rate clip is the average rate (`avg_frame_rate`): two frames closer together
 * than one average interval (a phone's 1/60 s frame in a clip averaging 54 fps) round to the same
 * pts, and the JPEG encoder stops the whole extraction ("Invalid pts … <= last"). In the demuxer's
 * time base every frame keeps its own timestamp, so every decoded frame is written. The
 * filtergraph goes further ({@link filterGraph}: `settb=1,setpts=N`): the encoders see frames
 * numbered 0, 1, 2 … s, so files whose own times repeat, go back or are missing are written whole
 * too; the manifest's times come from `showinfo`, before that renumbering.
 */
const PASSTHROUGH_TIME_BASE = ['-enc_time_base', '-1'];

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
  outDir: string;
  frame: Size;
  thumb: Size;
  every: number;
  quality: number;
  total: number;
  scaler: Scaler;
  /** Odd last column/row to cut instead of scaling ({@link oddPixelTrim}). */
  trim: Size | null;
  opts: ExtractOptions;
}

/** One ffmpeg process: decode once, write working frames and thumbnails, log timestamps. */
function runFfmpeg(run: Run): Promise<ShowinfoFrame[]> {
  const { opts } = run;
  return new Promise((resolve, reject) => {
    const logged: ShowinfoFrame[] = [];
    /** Frames whose files exist (0 … written − 1). */
    let written = 0;
    const pixel = jpegPixelOptions(run.scaler);
    const inputOptions = ['-hide_banner', '-xerror', '-stats_period', String(STATS_PERIOD_S)];
    if (opts.threads !== undefined) inputOptions.push('-threads', String(opts.threads));
    if (opts.inputOptions) inputOptions.push(...opts.inputOptions);
    const command = ffmpeg(run.input, { niceness: EXTRACT_NICENESS })
      .inputOptions(inputOptions)
      .complexFilter(
        filterGraph(run.frame, run.thumb, run.every, run.scaler, opts.scaleFlags ?? DEFAULT_SCALE_FLAGS, run.trim ?? undefined),
      )
      .output(path.join(run.outDir, FRAMES_DIR, '%06d.jpg'))
      .outputOptions([
        '-map',
        '[frames]',
        '-fps_mode',
        'passthrough',
        ...PASSTHROUGH_TIME_BASE,
        '-c:v',
        'mjpeg',
        ...pixel,
        '-q:v',
        String(run.quality),
        ...(opts.jpegOptions ?? []),
        '-f',
        'image2',
        // Each file appears whole (temp file + rename), so one that exists can be served.
        '-atomic_writing',
        '1',
      ])
      .output(path.join(run.outDir, THUMBS_DIR, '%06d.jpg'))
      .outputOptions([
        '-map',
        '[thumbs]',
        '-fps_mode',
        'passthrough',
        ...PASSTHROUGH_TIME_BASE,
        '-c:v',
        'mjpeg',
        ...pixel,
        '-q:v',
        String(THUMB_QUALITY),
        '-f',
        'image2',
        '-atomic_writing',
        '1',
      ])
      // An abort that came while fluent-ffmpeg was still preparing finds no process to kill.
      .on('start', () => {
        if (opts.signal?.aborted) command.kill('SIGKILL');
      })
      .on('stderr', (line: string) => {
        const frame = parseShowinfoLine(line);
        if (frame) logged.push(frame);
        else if (opts.onProgress) {
          // ffmpeg's own status line ("frame=  123 fps=…"), read here rather than through
          // fluent-ffmpeg's progress event, which would run an extra ffprobe on the input. The
          // muxer writes in its own thread, so the count can run ahead of the files: only frames
          // whose (atomically written) file exists count, in order.
          const encoded = parseFrameCount(line);
          if (encoded === null) return;
          const before = written;
          while (written < Math.min(encoded, run.total) && existsSync(path.join(run.outDir, FRAMES_DIR, frameFileName(written)))) written++;
          if (written > before || encoded === 0) opts.onProgress(written, run.total);
        }
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
    const onAbort = () => command.kill('SIGKILL');
    opts.signal?.addEventListener('abort', onAbort, { once: true });
    // Below the web server's priority (fluent-ffmpeg starts it through `nice`).
    if ((opts.nice ?? FFMPEG_NICE) > 0) command.renice(Math.min(19, opts.nice ?? FFMPEG_NICE));
    command.run();
  });
}

/** Why a clip whose header lists frames but none of them decodes (cut just after its header) fails. */
const NO_FRAME_READ =
  'This clip is damaged: none of its frames can be read (the file may have been cut short). Please export or record it again and re-upload.';

/** Maps ffmpeg's failure text to a user-facing {@link MediaError}. */
export function extractFailure(text: string, framesDone: number): MediaError {
  if (/Cannot find ffmpeg|spawn \S+ ENOENT/i.test(text)) {
    return new MediaError('tool_missing', 'The video tools are not installed on the server.', text);
  }
  if (/corrupt|Invalid data|partial file|Error while decoding|error splitting|NAL unit/i.test(text)) {
    return new MediaError(
      'extract_failed',
      framesDone === 0
        ? NO_FRAME_READ
        : `This clip is damaged after about ${framesDone} frames and cannot be read to the end. Please export or record it again and re-upload.`,
      text,
    );
  }
  return new MediaError('extract_failed', 'We could not turn this clip into frames.', text);
}

/** Frames written so far from ffmpeg's status line (`frame=  123 fps=…`), or null for other lines. */
export function parseFrameCount(line: string): number | null {
  const m = /^\s*frame=\s*(\d+)\s/.exec(line);
  return m ? Number(m[1]) : null;
}

/** Empties the frame and thumbnail folders of `outDir` (creating them). */
async function freshFolders(outDir: string): Promise<void> {
  for (const dir of [FRAMES_DIR, THUMBS_DIR]) {
    await rm(path.join(outDir, dir), { recursive: true, force: true });
    await mkdir(path.join(outDir, dir), { recursive: true });
  }
}

/**
 * Decodes every frame of a clip once with ffmpeg and writes, under `outDir`:
 * - `frames/000001.jpg …`: one JPEG per decoded frame (`-fps_mode passthrough`: no frame is
 *   dropped or duplicated), displayed orientation (ffmpeg's autorotate), long side ≤ `longSide`,
 *   never upscaled, even width and height, square pixels, full-range JFIF (resized by zscale,
 *   or swscale when zscale is unavailable);
 * - `thumbs/000001.jpg …`: one thumbnail every `thumbEvery` frames (≈ 10 per second of video,
 *   ≤ 600 per clip; thumb k shows frame (k − 1)·thumbEvery), long side ≤ `thumbLongSide`;
 * - `manifest.json` ({@link FrameManifest}, `complete: true`), written last.
 *
 * Frames are written in place and in order, so the first ones can be shown while the rest are
 * made (`onProgress` says how many are complete). The frame and thumbnail folders are emptied
 * first; a failure or an abort removes them again, so nothing half-made is left. `outDir` may also
 * hold the source clip and a planned manifest; nothing else in it is touched.
 *
 * @throws {MediaError} `aborted`, `extract_failed` (damaged or truncated stream: ffmpeg runs with
 *   `-xerror`, so any decoding error stops it), `tool_missing`, or any error of {@link probeVideo}.
 */
export async function extractFrames(input: string, outDir: string, opts: ExtractOptions = {}): Promise<FrameManifest> {
  const { signal } = opts;
  if (signal?.aborted) throw aborted();
  const probe = opts.probe ?? (await probeVideo(input));
  if (signal?.aborted) throw aborted();
  const plan = plannedManifest(probe, opts);
  const frame: Size = { width: plan.width, height: plan.height };
  const thumb: Size = { width: plan.thumbWidth, height: plan.thumbHeight };

  await mkdir(outDir, { recursive: true });
  try {
    const attempt = async (scaler: Scaler) => {
      await freshFolders(outDir);
      opts.onProgress?.(0, probe.frameCount);
      return runFfmpeg({
        input,
        outDir,
        frame,
        thumb,
        every: plan.thumbEvery,
        quality: plan.quality,
        total: probe.frameCount,
        scaler,
        trim: oddPixelTrim(probe, frame),
        opts,
      });
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
    const frameCount = await countJpegs(path.join(outDir, FRAMES_DIR));
    if (frameCount === 0 || frameCount < 0.9 * probe.frameCount) {
      throw new MediaError(
        'extract_failed',
        frameCount === 0
          ? NO_FRAME_READ
          : `Only ${frameCount} of ${probe.frameCount} frames could be read; the clip may be cut short. Please upload it again.`,
        `decoded ${frameCount}, container says ${probe.frameCount}`,
      );
    }
    const { timestampsMs, source } = frameTimestamps(logged, frameCount, probe.fps);
    const manifest: FrameManifest = {
      ...plan,
      complete: true,
      frameCount,
      timestampsMs,
      timestampsSource: source,
      thumbCount: await countJpegs(path.join(outDir, THUMBS_DIR)),
    };
    await writeManifest(outDir, manifest);
    opts.onProgress?.(frameCount, frameCount);
    return manifest;
  } catch (err) {
    for (const dir of [FRAMES_DIR, THUMBS_DIR]) await rm(path.join(outDir, dir), { recursive: true, force: true });
    throw err;
  }
}

/**
 * Makes fluent-ffmpeg look up ffmpeg, its formats and encoders now (it caches them per process),
 * so the first extraction starts without that delay. Best effort.
 */
export function warmUpFfmpeg(): Promise<void> {
  return new Promise((resolve) => {
    ffmpeg.getAvailableFormats(() => ffmpeg.getAvailableEncoders(() => resolve()));
  });
}
