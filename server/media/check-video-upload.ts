import { uploadHead } from '../storage/upload-temps';
import { SNIFF_BYTES, sniffContainer, type ContainerKind } from './magic';
import { MediaError } from './media-error';
import { probeVideo, type VideoProbe } from './probe';

/**
 * Decides from its content whether an uploaded temp file is a video: not empty, a container we
 * accept by its first bytes, then ffprobe's reading (a video stream, size, rate, duration).
 * @throws {MediaError} `empty_file`, `not_video`, `no_video_stream`, `truncated`, `probe_failed`.
 */
export async function checkVideoUpload(file: { path: string; size: number }): Promise<{ container: ContainerKind; probe: VideoProbe }> {
  if (file.size === 0) throw new MediaError('empty_file', 'The uploaded file is empty.', 'size 0');
  const container = sniffContainer(await uploadHead(file.path, Math.min(file.size, SNIFF_BYTES)));
  if (!container) {
    throw new MediaError(
      'not_video',
      'This file is not a video we can read. Upload an MP4, MOV, WebM, MKV, AVI or 3GP clip.',
      'unknown magic bytes',
    );
  }
  return { container, probe: await probeVideo(file.path) };
}
