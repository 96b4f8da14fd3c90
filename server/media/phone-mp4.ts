import ffmpeg from 'fluent-ffmpeg';
import { CLIP_ENCODING } from './encode-h264';

/** Longest side of a phone MP4, px. */
export const PHONE_MP4_LONG_SIDE = 1280;
/** Highest frame rate of a phone MP4 (a 240 fps slow-motion recording plays at real speed with 30). */
export const PHONE_MP4_MAX_FPS = 30;

/** Options of {@link makePhoneMp4}. */
export interface PhoneMp4Options {
  /** The uploaded clip (any container ffprobe accepted). */
  input: string;
  /** The .mp4 to write. */
  outFile: string;
  /** The poster JPEG to write (a frame of the MP4, same size). */
  posterFile: string;
  /** The clip's duration, s (for progress). */
  durationS: number;
  /** Reports the fraction done, 0–1. */
  onProgress?: (fraction: number) => void;
  /** Aborting kills ffmpeg; the promise then rejects. */
  signal?: AbortSignal;
  threads?: number;
}

/**
 * Scale filter: the long side at most {@link PHONE_MP4_LONG_SIDE}, never enlarged, both sides even
 * (yuv420p). ffmpeg rotates a phone's portrait clip upright before filters, so `iw`/`ih` are upright.
 */
export const PHONE_MP4_SCALE =
  `scale=w='if(gte(iw,ih),trunc(min(${PHONE_MP4_LONG_SIDE},iw)/2)*2,-2)'` +
  `:h='if(gte(iw,ih),-2,trunc(min(${PHONE_MP4_LONG_SIDE},ih)/2)*2)',format=yuv420p`;

/** `time=00:00:01.23` of ffmpeg's status line, in seconds. */
export function statusTimeS(line: string): number | null {
  const m = /time=\s*(\d+):(\d{2}):(\d{2}(?:\.\d+)?)/.exec(line);
  return m ? Number(m[1]) * 3600 + Number(m[2]) * 60 + Number(m[3]) : null;
}

function run(command: ffmpeg.FfmpegCommand, signal: AbortSignal | undefined, what: string): Promise<void> {
  return new Promise<void>((resolve, reject) => {
    const onAbort = () => command.kill('SIGKILL');
    command
      .on('start', () => {
        if (signal?.aborted) command.kill('SIGKILL');
      })
      .on('end', () => {
        signal?.removeEventListener('abort', onAbort);
        resolve();
      })
      .on('error', (err: Error, _out: string | null, stderr: string | null) => {
        signal?.removeEventListener('abort', onAbort);
        if (signal?.aborted) return reject(new Error(`${what} was cancelled.`));
        const last = (stderr ?? '').trim().split('\n').slice(-2).join(' ');
        reject(new Error(`ffmpeg could not ${what}: ${last || err.message}`));
      });
    signal?.addEventListener('abort', onAbort, { once: true });
    command.run();
  });
}

/**
 * Makes a clip phone-friendly with Debian's ffmpeg: H.264 (x264, {@link CLIP_ENCODING}) yuv420p in
 * MP4 with `moov` before `mdat` (fast start: a phone plays while it downloads), long side ≤ 1280,
 * at most 30 frames/s, no audio stream; then a poster JPEG from the MP4's frame at a tenth of its
 * length (past a black first frame).
 */
export async function makePhoneMp4(o: PhoneMp4Options): Promise<void> {
  const threads = o.threads ? ['-threads', String(o.threads)] : [];
  const encode = ffmpeg(o.input)
    .inputOptions(['-hide_banner', ...threads])
    .noAudio()
    .videoCodec('libx264')
    .outputOptions([
      '-map',
      '0:v:0',
      '-map_metadata',
      '-1',
      '-vf',
      PHONE_MP4_SCALE,
      '-fpsmax',
      String(PHONE_MP4_MAX_FPS),
      '-preset',
      CLIP_ENCODING.preset,
      '-crf',
      String(CLIP_ENCODING.crf + 3),
      '-profile:v',
      CLIP_ENCODING.profile,
      '-pix_fmt',
      'yuv420p',
      '-movflags',
      '+faststart',
    ])
    .format('mp4')
    .output(o.outFile)
    .on('stderr', (line: string) => {
      const t = statusTimeS(line);
      if (t !== null && o.onProgress) o.onProgress(Math.min(1, t / Math.max(0.01, o.durationS)));
    });
  await run(encode, o.signal, 'make the phone video');
  const poster = ffmpeg(o.outFile)
    .inputOptions(['-hide_banner', '-ss', (o.durationS / 10).toFixed(3)])
    .outputOptions(['-frames:v', '1', '-q:v', '3', '-map_metadata', '-1'])
    .output(o.posterFile);
  await run(poster, o.signal, 'take the poster frame');
}
