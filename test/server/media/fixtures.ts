/**
 * Test clips generated at test time with ffmpeg's lavfi sources (never committed), and a direct
 * ffprobe JSON reader used as the outside reference (it does not go through server/media).
 */
import { execFile } from 'node:child_process';
import { mkdtemp, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';

const run = promisify(execFile);
export const FFMPEG = process.env['FFMPEG_PATH'] ?? 'ffmpeg';
export const FFPROBE = process.env['FFPROBE_PATH'] ?? 'ffprobe';

/** A temp folder for one test file; call `cleanup` in afterAll. */
export async function tempDir(prefix: string): Promise<{ dir: string; cleanup: () => Promise<void> }> {
  const dir = await mkdtemp(path.join(os.tmpdir(), `tf-${prefix}-`));
  return { dir, cleanup: () => rm(dir, { recursive: true, force: true }) };
}

/** Runs ffmpeg quietly; rejects with its stderr on failure. */
export async function ffmpegRun(args: string[]): Promise<void> {
  await run(FFMPEG, ['-hide_banner', '-v', 'error', '-y', ...args], { maxBuffer: 32 << 20 });
}

export interface ClipSpec {
  fps: number;
  width: number;
  height: number;
  seconds: number;
  /** Video source: `testsrc2` (default) or a black frame with a white 40×40 square at top-left. */
  source?: 'testsrc2' | 'corner-marker';
  /** Container flags, e.g. `+faststart`. */
  movflags?: string;
  /** Whether to add an AAC audio stream (a 440 Hz tone), as a phone records. */
  audio?: boolean;
}

/** H.264 yuv420p clip from lavfi (ultrafast preset to spare the shared CPU). */
export async function makeClip(file: string, spec: ClipSpec): Promise<string> {
  const size = `${spec.width}x${spec.height}`;
  const lavfi =
    spec.source === 'corner-marker'
      ? `color=c=black:s=${size}:r=${spec.fps},drawbox=x=0:y=0:w=40:h=40:c=white:t=fill`
      : `testsrc2=size=${size}:rate=${spec.fps}`;
  const flags = spec.movflags ? ['-movflags', spec.movflags] : [];
  const tone = spec.audio ? ['-f', 'lavfi', '-i', 'sine=frequency=440:sample_rate=44100'] : [];
  const audio = spec.audio ? ['-c:a', 'aac', '-shortest'] : [];
  await ffmpegRun([
    '-f',
    'lavfi',
    '-i',
    lavfi,
    ...tone,
    '-t',
    String(spec.seconds),
    '-c:v',
    'libx264',
    '-preset',
    'ultrafast',
    '-pix_fmt',
    'yuv420p',
    ...audio,
    ...flags,
    file,
  ]);
  return file;
}

/**
 * Copies a clip setting the legacy `rotate` stream tag. On ffmpeg 5.1 the mp4 muxer turns the tag
 * into a display matrix whose ffprobe `rotation` has the SAME sign as the tag (`rotate=90` →
 * `rotation: 90`, i.e. 90° counter-clockwise); a phone-style portrait clip needs `rotate=-90`.
 */
export async function withRotateTag(src: string, file: string, rotate: number): Promise<string> {
  await ffmpegRun(['-i', src, '-c', 'copy', '-metadata:s:v', `rotate=${rotate}`, file]);
  return file;
}

/** The fields of ffprobe's JSON output that the tests read, as ffprobe prints them. */
export interface FfprobeJson {
  streams: {
    width: number;
    height: number;
    nb_frames: string;
    nb_read_frames: string;
    avg_frame_rate: string;
    r_frame_rate: string;
    side_data_list?: { rotation?: number }[];
  }[];
  frames: { best_effort_timestamp_time: string }[];
  format: { format_name: string };
}

/** `ffprobe -of json` with extra arguments, parsed. */
export async function ffprobeJson(file: string, args: string[]): Promise<FfprobeJson> {
  const { stdout } = await run(FFPROBE, ['-v', 'error', '-of', 'json', ...args, file], { maxBuffer: 64 << 20 });
  return JSON.parse(stdout);
}

/** Outside reference: the video stream as `ffprobe -count_frames -show_streams` sees it. */
export async function ffprobeCounted(
  file: string,
): Promise<{ nbReadFrames: number; width: number; height: number; avgFrameRate: string; rFrameRate: string; rotation: number | null }> {
  const json = await ffprobeJson(file, ['-count_frames', '-select_streams', 'v:0', '-show_streams']);
  const s = json.streams[0];
  const rotation = (s.side_data_list ?? []).find((d) => d.rotation !== undefined)?.rotation ?? null;
  return {
    nbReadFrames: Number(s.nb_read_frames),
    width: s.width,
    height: s.height,
    avgFrameRate: s.avg_frame_rate,
    rFrameRate: s.r_frame_rate,
    rotation,
  };
}

/** Outside reference: per-frame presentation times from ffprobe, in seconds. */
export async function ffprobeFrameTimes(file: string): Promise<number[]> {
  const json = await ffprobeJson(file, ['-select_streams', 'v:0', '-show_entries', 'frame=best_effort_timestamp_time']);
  return json.frames.map((f) => Number(f.best_effort_timestamp_time));
}

/** Outside reference: ffmpeg's own decode of frame 0 (autorotated) as 8-bit grey pixels. */
export async function ffmpegFirstFrameGray(file: string, width: number, height: number, filters: string[] = []): Promise<Buffer> {
  const { stdout } = await run(
    FFMPEG,
    ['-v', 'error', '-i', file, ...filters, '-frames:v', '1', '-f', 'rawvideo', '-pix_fmt', 'gray', '-'],
    {
      encoding: 'buffer',
      maxBuffer: width * height * 2,
    },
  );
  return stdout;
}

/** Centroid of pixels brighter than `threshold` in a grey image (x, y in px). */
export function brightCentroid(gray: Uint8Array | Buffer, width: number, threshold = 128, stride = 1): { x: number; y: number; n: number } {
  let sx = 0;
  let sy = 0;
  let n = 0;
  for (let i = 0; i * stride < gray.length; i++) {
    if (gray[i * stride]! > threshold) {
      sx += i % width;
      sy += Math.floor(i / width);
      n++;
    }
  }
  return { x: sx / n, y: sy / n, n };
}
