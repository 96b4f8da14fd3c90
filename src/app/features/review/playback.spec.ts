import { clampFrame, formatMs, frameAtTime, playbackFrame, realTimestamps, stepRate } from './playback';

describe('realTimestamps', () => {
  it('keeps container times for a normal clip, from the first frame', () => {
    expect(realTimestamps([100, 133.3, 166.7], 3, false, 30)).toEqual([0, 33.3, 66.7].map((v) => expect.closeTo(v, 6)));
  });

  it('uses the capture rate for a slow-motion file (240 fps capture stored at 30 fps)', () => {
    // [calc] frame 8 of a 240 fps capture happened 8 / 240 s = 33.33 ms after frame 0.
    const ts = realTimestamps(
      Array.from({ length: 9 }, (_, i) => (i * 1000) / 30),
      9,
      true,
      240,
    );
    expect(ts[8]).toBeCloseTo(33.333, 3);
  });

  it('computes times from the rate when timestamps are missing', () => {
    expect(realTimestamps(undefined, 3, false, 120)).toEqual([0, 1000 / 120, 2000 / 120]);
    expect(realTimestamps([0], 2, false, 60)).toEqual([0, 1000 / 60]);
  });
});

describe('frameAtTime / playbackFrame', () => {
  const times = [0, 10, 20, 30, 40];

  it('finds the last frame at or before a time', () => {
    expect(frameAtTime(times, -5)).toBe(0);
    expect(frameAtTime(times, 0)).toBe(0);
    expect(frameAtTime(times, 19.9)).toBe(1);
    expect(frameAtTime(times, 20)).toBe(2);
    expect(frameAtTime(times, 999)).toBe(4);
    expect(frameAtTime([], 5)).toBe(0);
  });

  it('plays at a fraction of real time', () => {
    // 80 ms on the wall at 1/8 speed is 10 ms of clip time: one frame on from frame 1.
    expect(playbackFrame(times, 1, 80, 0.125)).toBe(2);
    expect(playbackFrame(times, 1, 79, 0.125)).toBe(1);
    expect(playbackFrame(times, 0, 25, 1)).toBe(2);
  });
});

describe('small helpers', () => {
  it('steps the playback speed and stops at the ends', () => {
    expect(stepRate(0.25, 1)).toBe(0.5);
    expect(stepRate(1, 1)).toBe(1);
    expect(stepRate(0.125, -1)).toBe(0.125);
  });

  it('formats milliseconds', () => {
    expect(formatMs(1234.56)).toBe('1,234.6 ms');
    expect(formatMs(0)).toBe('0.0 ms');
    expect(formatMs(null)).toBe('— ms');
  });

  it('clamps frames into the clip', () => {
    expect(clampFrame(-3, 10)).toBe(0);
    expect(clampFrame(12, 10)).toBe(9);
    expect(clampFrame(4.4, 10)).toBe(4);
  });
});
