import { describe, expect, it } from 'vitest';
import {
  filterGraph,
  fitLongSide,
  jpegPixelOptions,
  oddPixelTrim,
  frameTimestamps,
  parseShowinfoLine,
  thumbCount,
  thumbEvery,
} from '../../../server/media/extract-plan';
import { frameFileName } from '../../../server/media/manifest';

describe('fitLongSide', () => {
  it('scales the long side down to the limit, keeping the aspect ratio', () => {
    expect(fitLongSide({ width: 1920, height: 1080 }, 1280)).toEqual({ width: 1280, height: 720 });
    expect(fitLongSide({ width: 1080, height: 1920 }, 1280)).toEqual({ width: 720, height: 1280 });
    expect(fitLongSide({ width: 3840, height: 2160 }, 1280)).toEqual({ width: 1280, height: 720 });
  });
  it('never upscales', () => {
    expect(fitLongSide({ width: 320, height: 180 }, 1280)).toEqual({ width: 320, height: 180 });
  });
  it('always gives even sides, trimming odd ones instead of padding', () => {
    expect(fitLongSide({ width: 321, height: 181 }, 1280)).toEqual({ width: 320, height: 180 });
    const odd = fitLongSide({ width: 640, height: 360 }, 333);
    expect((odd.width % 2) + (odd.height % 2)).toBe(0);
    expect(odd.width).toBeLessThanOrEqual(333);
    expect(fitLongSide({ width: 1280, height: 720 }, 160)).toEqual({ width: 160, height: 90 });
  });
});

describe('thumbnails', () => {
  it('about ten per second of video, at most 600 per clip', () => {
    expect(thumbEvery(30, 30)).toBe(3);
    expect(thumbEvery(120, 360)).toBe(12);
    expect(thumbEvery(240, 240)).toBe(24);
    expect(thumbEvery(5, 10)).toBe(1);
    expect(thumbCount(60_000, thumbEvery(30, 60_000))).toBeLessThanOrEqual(600);
    expect(thumbCount(360, 12)).toBe(30);
    expect(thumbCount(361, 12)).toBe(31);
  });
});

describe('filterGraph', () => {
  it('decodes once, scales to full range with zscale, logs timestamps and splits frames and thumbs', () => {
    expect(filterGraph({ width: 1280, height: 720 }, { width: 160, height: 90 }, 12, 'zscale', 'bilinear')).toBe(
      '[0:v]zscale=w=1280:h=720:f=bilinear:r=full,setsar=1,showinfo=checksum=0,settb=1,setpts=N,split=2[frames][t];' +
        "[t]select='not(mod(n\\,12))',zscale=w=160:h=90:f=bilinear,setsar=1[thumbs]",
    );
  });
  it('the swscale fallback graph converts range in the scale filter', () => {
    expect(filterGraph({ width: 640, height: 360 }, { width: 160, height: 90 }, 3, 'swscale', 'bicubic')).toBe(
      '[0:v]scale=640:360:flags=bicubic:out_range=full,setsar=1,showinfo=checksum=0,settb=1,setpts=N,split=2[frames][t];' +
        "[t]select='not(mod(n\\,3))',scale=160:90:flags=area,setsar=1[thumbs]",
    );
  });
});

describe('jpegPixelOptions', () => {
  it('zscale frames go to mjpeg as full-range yuv420p (needs -strict unofficial); swscale ones as yuvj420p', () => {
    expect(jpegPixelOptions('zscale')).toEqual(['-strict', 'unofficial', '-pix_fmt', 'yuv420p']);
    expect(jpegPixelOptions('swscale')).toEqual(['-pix_fmt', 'yuvj420p']);
  });
});

describe('showinfo timestamps', () => {
  it('reads n and pts_time from ffmpeg 5.1 showinfo lines (format copied from a real run) and ignores the rest', () => {
    const line =
      '[Parsed_showinfo_2 @ 0x55d0c8e1c9c0] n:  12 pts:   1536 pts_time:0.1     pos:     8231 fmt:yuvj420p sar:1/1 s:320x180 i:P iskey:0 type:B ';
    expect(parseShowinfoLine(line)).toEqual({ n: 12, ptsTimeS: 0.1 });
    expect(parseShowinfoLine('[Parsed_showinfo_2 @ 0x55d0c8e1c9c0]   color_range:pc color_space:unknown')).toBeNull();
    expect(parseShowinfoLine('frame=  120 fps=0.0 q=4.0 size=N/A time=00:00:01.00')).toBeNull();
  });
  it('uses decoded times relative to the first frame when there is one per frame', () => {
    const logged = [0.5, 0.52, 0.56].map((t, n) => ({ n, ptsTimeS: t }));
    expect(frameTimestamps(logged, 3, 50)).toEqual({ timestampsMs: [0, 20, 60], source: 'decoded' });
  });
  it('falls back to i × 1000 / fps (constant rate assumed) when times are missing, and says so', () => {
    expect(frameTimestamps([{ n: 0, ptsTimeS: 0 }], 3, 120)).toEqual({ timestampsMs: [0, 8.333, 16.667], source: 'computed' });
  });
  it('falls back to i × 1000 / fps when the decoded times do not rise frame after frame (a file whose own times are broken)', () => {
    const back = [0, 0.033, 0.067, 0].map((t, n) => ({ n, ptsTimeS: t }));
    expect(frameTimestamps(back, 4, 30)).toEqual({ timestampsMs: [0, 33.333, 66.667, 100], source: 'computed' });
    const same = [0, 0.04, 0.04].map((t, n) => ({ n, ptsTimeS: t }));
    expect(frameTimestamps(same, 3, 25).source).toBe('computed');
  });
  it('frame files are numbered from 000001', () => {
    expect(frameFileName(0)).toBe('000001.jpg');
    expect(frameFileName(359)).toBe('000360.jpg');
  });
});

describe('oddPixelTrim', () => {
  it('cuts the odd last column/row when the working size is the displayed size less that pixel, square pixels only', () => {
    const odd = { width: 1279, height: 719, displayWidth: 1279, displayHeight: 719 };
    expect(oddPixelTrim(odd, { width: 1278, height: 718 })).toEqual({ width: 1278, height: 718 });
    // Turned a quarter: stored 1279×719, shown 719×1279.
    expect(oddPixelTrim({ ...odd, displayWidth: 719, displayHeight: 1279 }, { width: 718, height: 1278 })).toEqual({
      width: 718,
      height: 1278,
    });
    // Even already, downscaled, or non-square pixels (240×180 at 4:3 shown 320×180): scaled, not cut.
    expect(oddPixelTrim({ width: 320, height: 180, displayWidth: 320, displayHeight: 180 }, { width: 320, height: 180 })).toBeNull();
    expect(oddPixelTrim({ width: 1921, height: 1081, displayWidth: 1921, displayHeight: 1081 }, { width: 1280, height: 720 })).toBeNull();
    expect(oddPixelTrim({ width: 241, height: 181, displayWidth: 321, displayHeight: 181 }, { width: 320, height: 180 })).toBeNull();
  });
  it('the graph crops before the scaler when given a trim', () => {
    expect(
      filterGraph({ width: 1278, height: 718 }, { width: 160, height: 90 }, 3, 'zscale', 'bilinear', { width: 1278, height: 718 }),
    ).toMatch(/^\[0:v\]crop=1278:718:0:0,zscale=w=1278:h=718:/);
  });
});
