import { open } from 'node:fs/promises';
import ffmpeg from 'fluent-ffmpeg';
import { SNIFF_BYTES, sniffContainer, type ContainerKind } from './magic';
import { MediaError } from './media-error';
import { parseProbe, type ProbeData, type VideoProbe } from './probe-parse';

export type { VideoProbe } from './probe-parse';

/** Runs fluent-ffmpeg's ffprobe (`ffprobe -show_streams -show_format [options] file`). */
function ffprobe(file: string, options: string[]): Promise<ProbeData> {
  return new Promise((resolve, reject) => {
    ffmpeg.ffprobe(file, options, (err, data) => {
      if (err) reject(err instanceof Error ? err : new Error(String(err)));
      else resolve(data as unknown as ProbeData);
    });
  });
}

/** Reads the first bytes of a file; the size tells empty files apart. */
async function readHead(file: string): Promise<{ size: number; head: Buffer }> {
  let handle;
  try {
    handle = await open(file, 'r');
  } catch (err) {
    throw new MediaError('probe_failed', 'The uploaded file could not be opened.', (err as Error).message);
  }
  try {
    const { size } = await handle.stat();
    const head = Buffer.alloc(Math.min(size, SNIFF_BYTES));
    await handle.read(head, 0, head.length, 0);
    return { size, head };
  } finally {
    await handle.close();
  }
}

/** Maps an ffprobe failure to a {@link MediaError}, using the sniffed container for context. */
export function probeFailure(err: Error, sniffed: ContainerKind | null): MediaError {
  const text = err.message;
  if (/Cannot find ffprobe|spawn \S+ ENOENT/i.test(text)) {
    return new MediaError('tool_missing', 'The video tools are not installed on the server.', text);
  }
  const isoFamily = sniffed === 'mp4' || sniffed === 'mov' || sniffed === '3gp';
  if (sniffed && (/moov atom not found/.test(text) ? isoFamily : /End of file|partial file|truncat/i.test(text))) {
    return new MediaError(
      'truncated',
      'The clip ends early — the recording or upload may have been cut short. Please upload it again.',
      text,
    );
  }
  if (/Invalid data found when processing input|moov atom not found|could not find codec parameters/i.test(text)) {
    return new MediaError('not_video', 'This file is not a video we can read. Upload an MP4, MOV, WebM, MKV, AVI or 3GP clip.', text);
  }
  return new MediaError('probe_failed', 'We could not read this clip’s details.', text);
}

/**
 * Reads a clip's metadata with ffprobe (through fluent-ffmpeg): codec, stored and displayed size,
 * clockwise rotation, frame rate, duration, frame count (decoding with `-count_frames` only when
 * the container does not state `nb_frames`, or states more frames than its duration shows: an edit
 * list hides some), audio presence and container format.
 *
 * @throws {MediaError} `empty_file`, `not_video` (text, images, unknown bytes), `no_video_stream`
 *   (audio only), `truncated` (ISO-BMFF without its `moov` box, e.g. an upload cut in half),
 *   `probe_failed`, `tool_missing`.
 */
export async function probeVideo(file: string): Promise<VideoProbe> {
  const { size, head } = await readHead(file);
  if (size === 0) throw new MediaError('empty_file', 'The uploaded file is empty.', `${file}: 0 bytes`);
  const sniffed = sniffContainer(head);
  let data: ProbeData;
  try {
    data = await ffprobe(file, ['-hide_banner', '-v', 'error']);
  } catch (err) {
    throw probeFailure(err as Error, sniffed);
  }
  const parsed = parseProbe(data);
  if (parsed.frameCount !== null) return { ...parsed, frameCount: parsed.frameCount, frameCountSource: 'nb_frames' };

  let counted: ProbeData;
  try {
    counted = await ffprobe(file, ['-hide_banner', '-v', 'error', '-count_frames', '-select_streams', 'v:0']);
  } catch (err) {
    throw probeFailure(err as Error, sniffed);
  }
  const frameCount = Number(counted.streams[0]?.['nb_read_frames']);
  if (!Number.isFinite(frameCount) || frameCount <= 0) {
    throw new MediaError(
      'probe_failed',
      'This clip has no frames we can decode.',
      `nb_read_frames=${String(counted.streams[0]?.['nb_read_frames'])}`,
    );
  }
  return { ...parsed, frameCount, frameCountSource: 'count_frames' };
}
