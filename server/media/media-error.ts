import { AppError } from '../errors';

/**
 * Why a clip could not be read or turned into frames.
 * - `empty_file`: zero bytes.
 * - `not_video`: not a video container ffprobe can read (text, image, unknown bytes).
 * - `no_video_stream`: a media file without a video track (audio only, cover art only).
 * - `truncated`: the container starts like a video but ends early (upload cut short).
 * - `probe_failed`: ffprobe ran but the metadata is unusable (no size, no frame rate, no frames).
 * - `extract_failed`: ffmpeg could not decode every frame (corrupt stream, disk, …).
 * - `aborted`: the caller cancelled the extraction.
 * - `tool_missing`: ffmpeg/ffprobe could not be started.
 */
export type MediaErrorCode =
  'empty_file' | 'not_video' | 'no_video_stream' | 'truncated' | 'probe_failed' | 'extract_failed' | 'aborted' | 'tool_missing';

const STATUS: Record<MediaErrorCode, number> = {
  empty_file: 422,
  not_video: 422,
  no_video_stream: 422,
  truncated: 422,
  probe_failed: 422,
  extract_failed: 422,
  aborted: 500,
  tool_missing: 500,
};

/**
 * A media problem with a user-facing `message` and a technical `reason` (ffmpeg/ffprobe output)
 * that is for logs only — it is not part of the HTTP answer, because it can hold server paths.
 * Extends {@link AppError}, so a route that lets it through answers `{ error: { code, message } }`.
 */
export class MediaError extends AppError {
  declare readonly code: MediaErrorCode;

  constructor(
    code: MediaErrorCode,
    message: string,
    readonly reason?: string,
  ) {
    super(STATUS[code], code, message);
  }
}

/** Type guard for {@link MediaError}, optionally of one code. */
export function isMediaError(err: unknown, code?: MediaErrorCode): err is MediaError {
  return err instanceof MediaError && (code === undefined || err.code === code);
}
