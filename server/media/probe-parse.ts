import { MediaError } from './media-error';

/** What Trailframe needs to know about an uploaded clip before extracting frames. */
export interface VideoProbe {
  /** Video codec name as ffprobe reports it, e.g. `h264`, `hevc`, `vp9`. */
  codec: string;
  /** Stored (coded) frame width in pixels, before rotation. */
  width: number;
  /** Stored (coded) frame height in pixels, before rotation. */
  height: number;
  /** Degrees to rotate clockwise for display: 0, 90, 180 or 270. */
  rotation: 0 | 90 | 180 | 270;
  /** Width as displayed: square pixels (sample aspect ratio applied), after rotation. */
  displayWidth: number;
  /** Height as displayed: square pixels, after rotation. */
  displayHeight: number;
  /** Frames per second from `avg_frame_rate`, falling back to `r_frame_rate`. */
  fps: number;
  /** ffprobe's `r_frame_rate` (lowest rate that represents every timestamp), or null if absent. */
  rFrameRate: number | null;
  /** True when `avg_frame_rate` and `r_frame_rate` differ by more than 1 %. */
  variableFrameRate: boolean;
  /** Duration in seconds (stream duration, else container duration, else frames ÷ fps). */
  durationS: number;
  /** Number of video frames shown (`nb_frames`, else — also when an edit list hides some — counted by decoding with `-count_frames`). */
  frameCount: number;
  /** Where {@link frameCount} came from. */
  frameCountSource: 'nb_frames' | 'count_frames';
  /** Whether the file also carries an audio stream. */
  hasAudio: boolean;
  /** ffprobe's `format_name`, e.g. `mov,mp4,m4a,3gp,3g2,mj2`, `matroska,webm`, `avi`. */
  formatName: string;
}

/** The subset of ffprobe's answer that {@link parseProbe} reads (JSON or fluent-ffmpeg's parse). */
export interface ProbeData {
  streams: Array<Record<string, unknown>>;
  format: Record<string, unknown>;
}

/** Demuxers that read still images or text, never a recorded clip. */
const IMAGE_OR_TEXT_FORMATS = /(^|,)(image2|[a-z0-9]+_pipe|gif|apng|webp|tty|bin|xbin|adf|idf|ico)(,|$)/;

const num = (v: unknown): number | null => {
  const n = typeof v === 'number' ? v : typeof v === 'string' && v.trim() !== '' ? Number(v) : NaN;
  return Number.isFinite(n) ? n : null;
};

/** Parses an ffprobe rational such as `30000/1001` or `30/1`; `0/0` and `N/A` give null. */
export function parseRational(v: unknown): number | null {
  if (typeof v === 'number') return Number.isFinite(v) && v > 0 ? v : null;
  if (typeof v !== 'string') return null;
  const m = /^\s*(-?\d+(?:\.\d+)?)\s*[/:]\s*(\d+(?:\.\d+)?)\s*$/.exec(v);
  if (!m) return num(v) !== null && num(v)! > 0 ? num(v) : null;
  const n = Number(m[1]);
  const d = Number(m[2]);
  return d > 0 && n > 0 ? n / d : null;
}

/** Rounds any angle to the nearest quarter turn in [0, 360). */
export function normaliseQuarterTurn(deg: number): 0 | 90 | 180 | 270 {
  const q = ((Math.round(deg / 90) % 4) + 4) % 4;
  return (q * 90) as 0 | 90 | 180 | 270;
}

/**
 * Clockwise display rotation of a stream.
 *
 * - Display-matrix side data (`side_data_list[].rotation` in ffprobe JSON; fluent-ffmpeg's text
 *   parser flattens the `[SIDE_DATA]` block, so it arrives as `stream.rotation`) is
 *   counter-clockwise: ffprobe's `-90` means "turn 90° clockwise to display".
 * - The legacy `rotate` tag (`tags.rotate`, older demuxers) is already clockwise.
 *
 * The display matrix wins when both are present; that is what ffmpeg's autorotate follows.
 */
export function displayRotation(stream: Record<string, unknown>): 0 | 90 | 180 | 270 {
  const sideData = Array.isArray(stream['side_data_list']) ? (stream['side_data_list'] as Array<Record<string, unknown>>) : [];
  const matrix = sideData.map((s) => num(s['rotation'])).find((r) => r !== null) ?? num(stream['rotation']);
  if (matrix !== null) return normaliseQuarterTurn(-matrix);
  const tags = (stream['tags'] ?? {}) as Record<string, unknown>;
  const legacy = num(tags['rotate']);
  return legacy !== null ? normaliseQuarterTurn(legacy) : 0;
}

function sampleAspect(v: unknown): number {
  const r = parseRational(v);
  return r && r > 0 ? r : 1;
}

/** The clip's main video stream: the first video stream that is not cover art. */
export function mainVideoStream(data: ProbeData): Record<string, unknown> | undefined {
  return data.streams.find((s) => {
    const disposition = (s['disposition'] ?? {}) as Record<string, unknown>;
    return s['codec_type'] === 'video' && num(disposition['attached_pic']) !== 1;
  });
}

/**
 * Whether a container's frame count (`nb_frames`: samples stored) runs past what its duration
 * shows at its frame rate by more than one frame and 1 %: an edit list hides samples (a clip
 * trimmed without re-encoding keeps the frames from the key frame before the cut, and players
 * start showing at the cut). Decoding shows only the frames after it, so they must be counted.
 */
export function framesPastDuration(stored: number, durationS: number, fps: number): boolean {
  return stored > durationS * fps * 1.01 + 1;
}

/**
 * Turns ffprobe's answer into a {@link VideoProbe}. Pure. `frameCount` is null in the result
 * when the container does not state `nb_frames` (Matroska/WebM usually), or states more than its
 * duration shows ({@link framesPastDuration}), and `nb_read_frames` was not asked for; the caller
 * then counts frames. Throws {@link MediaError} for images, text,
 * audio-only files and streams without size or frame rate.
 */
export function parseProbe(data: ProbeData): Omit<VideoProbe, 'frameCount' | 'frameCountSource'> & { frameCount: number | null } {
  const formatName = String(data.format['format_name'] ?? '');
  if (IMAGE_OR_TEXT_FORMATS.test(formatName)) {
    throw new MediaError(
      'not_video',
      'This file is a still image or text, not a video. Upload the clip itself (MP4, MOV, WebM, MKV, AVI or 3GP).',
      `format_name=${formatName}`,
    );
  }
  const video = mainVideoStream(data);
  if (!video) {
    throw new MediaError(
      'no_video_stream',
      'This file has no video track (it may be audio only). Upload the clip itself.',
      `streams=${data.streams.map((s) => s['codec_type']).join(',')}`,
    );
  }
  const width = num(video['width']);
  const height = num(video['height']);
  const avg = parseRational(video['avg_frame_rate']);
  const r = parseRational(video['r_frame_rate']);
  const fps = avg ?? r;
  if (!width || !height || !fps) {
    throw new MediaError(
      'probe_failed',
      'We could not read this clip’s frame size or frame rate.',
      `width=${width} height=${height} avg=${String(video['avg_frame_rate'])} r=${String(video['r_frame_rate'])}`,
    );
  }
  const rotation = displayRotation(video);
  const sar = sampleAspect(video['sample_aspect_ratio']);
  const squareW = Math.round(width * sar);
  const quarter = rotation === 90 || rotation === 270;
  const nbFrames = num(video['nb_frames']) ?? null;
  const nbRead = num(video['nb_read_frames']) ?? null;
  const streamDurationS = num(video['duration']);
  const stored = nbFrames && nbFrames > 0 && !(streamDurationS && framesPastDuration(nbFrames, streamDurationS, fps)) ? nbFrames : null;
  const frameCount = nbRead && nbRead > 0 ? nbRead : stored;
  const durationS = streamDurationS ?? num(data.format['duration']) ?? (frameCount !== null ? frameCount / fps : null);
  if (durationS === null || durationS <= 0) {
    throw new MediaError('probe_failed', 'We could not read how long this clip is.', 'no stream or format duration');
  }
  return {
    codec: String(video['codec_name'] ?? 'unknown'),
    width,
    height,
    rotation,
    displayWidth: quarter ? height : squareW,
    displayHeight: quarter ? squareW : height,
    fps,
    rFrameRate: r,
    variableFrameRate: avg !== null && r !== null && Math.abs(avg - r) / r > 0.01,
    durationS,
    frameCount,
    hasAudio: data.streams.some((s) => s['codec_type'] === 'audio'),
    formatName,
  };
}
