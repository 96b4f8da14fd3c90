import { describe, expect, it } from 'vitest';
import { isMediaError } from '../../../server/media/media-error';
import { displayRotation, normaliseQuarterTurn, parseProbe, parseRational, type ProbeData } from '../../../server/media/probe-parse';

const h264 = (extra: Record<string, unknown> = {}): Record<string, unknown> => ({
  index: 0,
  codec_type: 'video',
  codec_name: 'h264',
  width: 1920,
  height: 1080,
  sample_aspect_ratio: '1:1',
  avg_frame_rate: '120/1',
  r_frame_rate: '120/1',
  duration: '3.000000',
  nb_frames: '360',
  ...extra,
});
const data = (streams: Array<Record<string, unknown>>, format: Record<string, unknown> = {}): ProbeData => ({
  streams,
  format: { format_name: 'mov,mp4,m4a,3gp,3g2,mj2', duration: '3.0', ...format },
});

function mediaCode(fn: () => unknown): string | undefined {
  try {
    fn();
  } catch (err) {
    return isMediaError(err) ? err.code : 'other';
  }
  return undefined;
}

describe('parseRational', () => {
  it('reads ffprobe rationals and rejects 0/0 and N/A', () => {
    expect(parseRational('30000/1001')).toBeCloseTo(29.97003, 5);
    expect(parseRational('120/1')).toBe(120);
    expect(parseRational('0/0')).toBeNull();
    expect(parseRational('N/A')).toBeNull();
    expect(parseRational(undefined)).toBeNull();
    expect(parseRational('1:1')).toBe(1);
  });
});

describe('display rotation sign conventions', () => {
  it('display-matrix rotation is counter-clockwise: ffprobe -90 → turn 90° clockwise', () => {
    expect(displayRotation({ side_data_list: [{ side_data_type: 'Display Matrix', rotation: -90 }] })).toBe(90);
    expect(displayRotation({ side_data_list: [{ side_data_type: 'Display Matrix', rotation: 90 }] })).toBe(270);
    expect(displayRotation({ side_data_list: [{ rotation: 180 }] })).toBe(180);
    expect(displayRotation({ side_data_list: [{ rotation: -180 }] })).toBe(180);
  });
  it("fluent-ffmpeg's flattened side data (stream.rotation, '-90' as a string) reads the same", () => {
    expect(displayRotation({ rotation: '-90', side_data_type: 'Display Matrix' })).toBe(90);
    expect(displayRotation({ rotation: 90 })).toBe(270);
  });
  it('legacy tags.rotate is clockwise already', () => {
    expect(displayRotation({ tags: { rotate: '90' } })).toBe(90);
    expect(displayRotation({ tags: { rotate: '270' } })).toBe(270);
    expect(displayRotation({ tags: { rotate: '-90' } })).toBe(270);
  });
  it('the display matrix wins over the legacy tag; no data → 0', () => {
    expect(displayRotation({ tags: { rotate: '90' }, side_data_list: [{ rotation: -90 }] })).toBe(90);
    expect(displayRotation({ tags: { rotate: '0' }, side_data_list: [{ rotation: 90 }] })).toBe(270);
    expect(displayRotation({})).toBe(0);
  });
  it('normalises near-quarter angles', () => {
    expect(normaliseQuarterTurn(-0)).toBe(0);
    expect(normaliseQuarterTurn(89.99)).toBe(90);
    expect(normaliseQuarterTurn(-270)).toBe(90);
    expect(normaliseQuarterTurn(450)).toBe(90);
  });
});

describe('parseProbe', () => {
  it('landscape clip: stored = displayed size, CFR, nb_frames', () => {
    const p = parseProbe(data([h264(), { codec_type: 'audio', codec_name: 'aac' }]));
    expect(p).toMatchObject({
      codec: 'h264',
      width: 1920,
      height: 1080,
      rotation: 0,
      displayWidth: 1920,
      displayHeight: 1080,
      fps: 120,
      rFrameRate: 120,
      variableFrameRate: false,
      durationS: 3,
      frameCount: 360,
      hasAudio: true,
    });
  });
  it('phone portrait clip (rotation -90) swaps displayed width and height', () => {
    const p = parseProbe(data([h264({ side_data_list: [{ rotation: -90 }] })]));
    expect(p).toMatchObject({ width: 1920, height: 1080, rotation: 90, displayWidth: 1080, displayHeight: 1920, hasAudio: false });
  });
  it('variable frame rate when avg and r rates differ by more than 1 %; avg is the fps', () => {
    const p = parseProbe(data([h264({ avg_frame_rate: '3000/31', r_frame_rate: '120/1' })]));
    expect(p.fps).toBeCloseTo(96.774, 3);
    expect(p.variableFrameRate).toBe(true);
    expect(parseProbe(data([h264({ avg_frame_rate: '120000/1001' })])).variableFrameRate).toBe(false);
  });
  it('falls back to r_frame_rate when avg_frame_rate is 0/0', () => {
    expect(parseProbe(data([h264({ avg_frame_rate: '0/0', r_frame_rate: '60/1' })])).fps).toBe(60);
  });
  it('no nb_frames (Matroska) → frameCount null for the caller to count; nb_read_frames is used', () => {
    expect(parseProbe(data([h264({ nb_frames: 'N/A' })])).frameCount).toBeNull();
    expect(parseProbe(data([h264({ nb_frames: 'N/A', nb_read_frames: '359' })])).frameCount).toBe(359);
  });
  it('more samples than the duration shows (an edit list hides the start of a trimmed clip) → counted by the caller [calc]', () => {
    // [calc] 3 s at 120 fps shows 360 frames: 361 (one frame of rounding) stays, 720 is counted.
    expect(parseProbe(data([h264({ nb_frames: '361' })])).frameCount).toBe(361);
    expect(parseProbe(data([h264({ nb_frames: '720' })])).frameCount).toBeNull();
    expect(parseProbe(data([h264({ nb_frames: '720', nb_read_frames: '360' })])).frameCount).toBe(360);
  });
  it('duration falls back to the container', () => {
    expect(parseProbe(data([h264({ duration: 'N/A' })], { duration: '2.5' })).durationS).toBe(2.5);
  });
  it('anamorphic storage: displayed width uses the sample aspect ratio', () => {
    const p = parseProbe(data([h264({ width: 1440, height: 1080, sample_aspect_ratio: '4:3' })]));
    expect([p.displayWidth, p.displayHeight]).toEqual([1920, 1080]);
  });
  it('cover art is not the video stream', () => {
    expect(mediaCode(() => parseProbe(data([{ codec_type: 'audio' }, h264({ disposition: { attached_pic: 1 } })])))).toBe(
      'no_video_stream',
    );
  });
  it('images and text demuxers → not_video; audio only → no_video_stream; no size → probe_failed', () => {
    expect(mediaCode(() => parseProbe(data([h264({ codec_name: 'png' })], { format_name: 'png_pipe' })))).toBe('not_video');
    expect(mediaCode(() => parseProbe(data([h264({ codec_name: 'mjpeg' })], { format_name: 'image2' })))).toBe('not_video');
    expect(mediaCode(() => parseProbe(data([h264({ codec_name: 'ansi' })], { format_name: 'tty' })))).toBe('not_video');
    expect(mediaCode(() => parseProbe(data([{ codec_type: 'audio', codec_name: 'aac' }])))).toBe('no_video_stream');
    expect(mediaCode(() => parseProbe(data([h264({ width: undefined })])))).toBe('probe_failed');
  });
});
