/**
 * Pure planning for frame extraction: working size, thumbnail cadence, the manifest before any
 * frame exists, the ffmpeg filtergraph, and reading frame timestamps from ffmpeg's `showinfo`
 * log. No I/O.
 */
import type { FrameManifest } from '../../src/contracts/api';
import type { VideoProbe } from './probe-parse';

/** A width × height pair in pixels. */
export interface Size {
  width: number;
  height: number;
}

/** Default long side of extracted frames (DESIGN.md: working size, long side ≤ 1280). */
export const DEFAULT_LONG_SIDE = 1280;
/** Default long side of thumbnails. */
export const DEFAULT_THUMB_LONG_SIDE = 160;
/** Default JPEG quality for frames, ffmpeg `-q:v` scale (2 best … 31 worst); see test/bench. */
export const DEFAULT_QUALITY = 4;
/**
 * Which scaler resizes the frames. `zscale` (zimg, SIMD) resizes and converts video range to the
 * full range JPEG needs for about a tenth of the CPU swscale takes for the same job on 1080p
 * (test/bench/make-reviewable.ts); `swscale` is the fallback when zscale is missing or fails.
 */
export type Scaler = 'zscale' | 'swscale';
export const DEFAULT_SCALER: Scaler = 'zscale';
/** Resize kernel for working frames (zscale `f=` / swscale `flags=`). */
export const DEFAULT_SCALE_FLAGS = 'bilinear';
/** JPEG quality of thumbnails (`-q:v`). */
export const THUMB_QUALITY = 6;
/** Thumbnails per second of video the strip aims for. */
export const THUMBS_PER_SECOND = 10;
/** Most thumbnails one clip gets; longer clips space them further apart. */
export const MAX_THUMBS = 600;

const evenFloor = (x: number) => Math.max(2, 2 * Math.floor(x / 2));
const evenRound = (x: number) => Math.max(2, 2 * Math.round(x / 2));

/**
 * Fits a displayed size inside `longSide` keeping the aspect ratio: never upscales, and both
 * sides are even (an odd side loses one pixel, never padded: cut off when nothing else is scaled,
 * see {@link oddPixelTrim}).
 */
export function fitLongSide(display: Size, longSide: number): Size {
  const long = Math.max(display.width, display.height);
  const scale = Math.min(1, longSide / long);
  const fit = (side: number) => Math.min(evenFloor(side), evenFloor(Math.max(longSide, 2)), evenRound(side * scale));
  return { width: fit(display.width), height: fit(display.height) };
}

/**
 * One thumbnail every N frames: about {@link THUMBS_PER_SECOND} per second of video, at most
 * {@link MAX_THUMBS} per clip. Thumbnail k (1-based file number) shows frame (k − 1)·N + 1.
 */
export function thumbEvery(fps: number, frameCount: number): number {
  return Math.max(1, Math.round(fps / THUMBS_PER_SECOND), Math.ceil(frameCount / MAX_THUMBS));
}

/** Number of thumbnails written for `frameCount` frames at one every `every` frames. */
export function thumbCount(frameCount: number, every: number): number {
  return Math.ceil(frameCount / every);
}

/** The filter that resizes decoded frames to the working size and converts them to full range. */
export function frameScaleFilter(frame: Size, scaler: Scaler, kernel: string): string {
  return scaler === 'zscale'
    ? `zscale=w=${frame.width}:h=${frame.height}:f=${kernel}:r=full`
    : `scale=${frame.width}:${frame.height}:flags=${kernel}:out_range=full`;
}

/**
 * The filtergraph for one decode feeding two outputs. ffmpeg has already rotated the frames
 * (autorotate inserts transpose/flip filters before this graph), so sizes here are displayed
 * sizes. The scaler also converts to full ("JPEG") range; `showinfo` (checksums off) logs each
 * frame's presentation time; with `trim` (see {@link oddPixelTrim}) the odd last column or row is
 * cut off first, so the scaler keeps the size and every pixel stays where it was; `settb=1,setpts=N` then numbers the frames 0, 1, 2 … in seconds for
 * the encoders, so a file whose own times repeat, go back or are missing (ffmpeg guesses those)
 * still has every decoded frame written: the JPEG encoder refuses a time not after the last one
 * ("Invalid pts"), and the image files are named by order anyway. `split` hands the same frame to
 * the frame output and, every Nth frame, to a smaller thumbnail scale.
 */
export function filterGraph(frame: Size, thumb: Size, every: number, scaler: Scaler, kernel: string, trim?: Size): string {
  const big = (trim ? `crop=${trim.width}:${trim.height}:0:0,` : '') + frameScaleFilter(frame, scaler, kernel);
  const small =
    scaler === 'zscale' ? `zscale=w=${thumb.width}:h=${thumb.height}:f=bilinear` : `scale=${thumb.width}:${thumb.height}:flags=area`;
  return [
    `[0:v]${big},setsar=1,showinfo=checksum=0,settb=1,setpts=N,split=2[frames][t]`,
    `[t]select='not(mod(n\\,${every}))',${small},setsar=1[thumbs]`,
  ].join(';');
}

/**
 * The crop that makes a clip's odd displayed width or height even without resampling: when the
 * working size is the displayed size less one pixel on an odd side (no downscale), and the clip's
 * pixels are square (stored size = displayed size, turned a quarter or not), cutting the last
 * column or row keeps every other pixel as recorded (square, unblurred) where scaling 1279 → 1278
 * would stretch the picture by 0.08 %. Null otherwise (the frame is scaled anyway).
 */
export function oddPixelTrim(probe: Pick<VideoProbe, 'width' | 'height' | 'displayWidth' | 'displayHeight'>, frame: Size): Size | null {
  const dw = probe.displayWidth - frame.width;
  const dh = probe.displayHeight - frame.height;
  const square =
    (probe.width === probe.displayWidth && probe.height === probe.displayHeight) ||
    (probe.width === probe.displayHeight && probe.height === probe.displayWidth);
  return square && (dw === 0 || dw === 1) && (dh === 0 || dh === 1) && dw + dh > 0 ? frame : null;
}

/**
 * Encoder options per scaler. zscale leaves 8-bit 4:2:0 frames already in full range and tagged
 * so; mjpeg takes them as `yuv420p` only with `-strict unofficial`, and writes standard JFIF
 * (no limited-range marker) because the frames say full range. swscale converts to `yuvj420p`.
 */
export function jpegPixelOptions(scaler: Scaler): string[] {
  return scaler === 'zscale' ? ['-strict', 'unofficial', '-pix_fmt', 'yuv420p'] : ['-pix_fmt', 'yuvj420p'];
}

/** One frame as `showinfo` logged it. */
export interface ShowinfoFrame {
  n: number;
  ptsTimeS: number;
}

const SHOWINFO = /Parsed_showinfo.*?\bn:\s*(\d+)\s+pts:\s*(-?\d+)\s+pts_time:\s*(-?[\d.]+(?:e[-+]?\d+)?)/i;

/** Reads `n:` and `pts_time:` from a `showinfo` log line, or null for any other line. */
export function parseShowinfoLine(line: string): ShowinfoFrame | null {
  const m = SHOWINFO.exec(line);
  return m ? { n: Number(m[1]), ptsTimeS: Number(m[3]) } : null;
}

/**
 * Per-frame presentation times in milliseconds, relative to the first frame, rounded to 0.001 ms.
 * Uses the decoded timestamps when there is one per written frame and each is later than the one
 * before; otherwise (times missing, repeated or going back: a damaged or oddly remuxed file)
 * computes `i × 1000 / fps` (exact only for constant-frame-rate clips) and says so.
 */
export function frameTimestamps(
  logged: ShowinfoFrame[],
  frameCount: number,
  fps: number,
): { timestampsMs: number[]; source: 'decoded' | 'computed' } {
  const byIndex = new Map(logged.map((f) => [f.n, f.ptsTimeS]));
  const times: number[] = [];
  for (let i = 0; i < frameCount; i++) {
    const t = byIndex.get(i);
    if (t === undefined || !Number.isFinite(t) || (i > 0 && !(t > times[i - 1]!))) break;
    times.push(t);
  }
  const round = (ms: number) => Math.round(ms * 1000) / 1000;
  if (times.length === frameCount && frameCount > 0) {
    const t0 = times[0]!;
    return { timestampsMs: times.map((t) => round((t - t0) * 1000)), source: 'decoded' };
  }
  return { timestampsMs: Array.from({ length: frameCount }, (_, i) => round((i * 1000) / fps)), source: 'computed' };
}

/** Sizes and quality of an extraction (defaults: {@link DEFAULT_LONG_SIDE}, {@link DEFAULT_THUMB_LONG_SIDE}, {@link DEFAULT_QUALITY}). */
export interface ExtractSizes {
  longSide?: number;
  thumbLongSide?: number;
  quality?: number;
}

/**
 * The manifest of a clip before extraction (`complete: false`): working and thumbnail sizes from
 * the probe, the probe's frame count, and timestamps computed as i × 1000 / fps. Extraction
 * replaces it with the complete one; the review can open on it while frames arrive.
 */
export function plannedManifest(probe: VideoProbe, sizes: ExtractSizes = {}): FrameManifest {
  const quality = sizes.quality ?? DEFAULT_QUALITY;
  if (!Number.isInteger(quality) || quality < 2 || quality > 31) throw new RangeError(`quality must be an integer 2–31, got ${quality}`);
  const frame = fitLongSide({ width: probe.displayWidth, height: probe.displayHeight }, sizes.longSide ?? DEFAULT_LONG_SIDE);
  const thumb = fitLongSide(frame, sizes.thumbLongSide ?? DEFAULT_THUMB_LONG_SIDE);
  const every = thumbEvery(probe.fps, probe.frameCount);
  return {
    version: 1,
    complete: false,
    frameCount: probe.frameCount,
    width: frame.width,
    height: frame.height,
    fps: probe.fps,
    durationS: probe.durationS,
    rotationApplied: probe.rotation,
    timestampsMs: frameTimestamps([], probe.frameCount, probe.fps).timestampsMs,
    timestampsSource: 'computed',
    thumbEvery: every,
    thumbCount: thumbCount(probe.frameCount, every),
    thumbWidth: thumb.width,
    thumbHeight: thumb.height,
    quality,
  };
}
