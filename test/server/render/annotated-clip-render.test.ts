/**
 * The annotated-clip renderer without the API. References outside the project:
 * - ffprobe (Debian's) for the produced file: codec, pixel format, counted frames, duration, the
 *   order of the top-level MP4 boxes (its trace log), no audio;
 * - ffmpeg's own decode of chosen video frames (BT.709, as tagged) for pixels;
 * - the synthetic runner's ground truth (scripts/demo-clip: joint pixels and gait events the
 *   generator drew; a fixture with known geometry, not a published source);
 * - DESIGN.md's limb colours (right amber #E08A1E) and the white marker outline;
 * - the slow-motion rule as documented in src/kinematics/slow-motion.ts, recomputed by hand ([calc]).
 */
import { execFile } from 'node:child_process';
import path from 'node:path';
import { promisify } from 'node:util';
import { createCanvas, loadImage } from '@napi-rs/canvas';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { renderAnnotatedClip, type AnnotatedClipRenderOutput } from '../../../server/render/annotated-clip-render';
import type { FrameLandmarks, GaitEventMark } from '../../../src/contracts/annotations';
import { OVERLAY_COLOURS, pairInitialContacts, sideBySideSteps } from '../../../src/kinematics';
import { runnerFrames, runnerPanel, type RunnerFrames } from '../../support/runner-frames';
import { FFMPEG, FFPROBE, ffprobeJson, tempDir } from '../media/fixtures';

const run = promisify(execFile);
let dir: { dir: string; cleanup: () => Promise<void> };
let runner: RunnerFrames; // 640×360 at 60 fps, 2 s
let fast: RunnerFrames; // 640×360 at 100 fps, 2 s (the Re-test)

beforeAll(async () => {
  dir = await tempDir('annotated-clip');
  runner = await runnerFrames({ fps: 60, width: 640, height: 360, seconds: 2, hipExtensionDeg: 8, facing: 'right' });
  fast = await runnerFrames({ fps: 100, width: 640, height: 360, seconds: 2, hipExtensionDeg: 14, facing: 'right' });
}, 120_000);
afterAll(async () => dir?.cleanup());

/** What ffprobe says about the file. */
async function probe(file: string) {
  const json = (await ffprobeJson(file, ['-count_frames', '-show_streams', '-show_format'])) as unknown as {
    streams: {
      codec_type: string;
      codec_name: string;
      pix_fmt: string;
      profile: string;
      nb_read_frames: string;
      width: number;
      height: number;
    }[];
    format: { duration: string; format_name: string };
  };
  const { stderr } = await run(FFPROBE, ['-v', 'trace', file], { maxBuffer: 64 << 20 });
  const boxes = [...stderr.matchAll(/type:'(\w{4})' parent:'root'/g)].map((m) => m[1]);
  return {
    json,
    video: json.streams.filter((s) => s.codec_type === 'video'),
    audio: json.streams.filter((s) => s.codec_type === 'audio'),
    boxes,
  };
}

/** ffmpeg's decode of video frame `n` as RGB bytes (BT.709 limited range → full-range RGB). */
async function decodeFrame(file: string, n: number, width: number, height: number): Promise<Buffer> {
  const { stdout } = await run(
    FFMPEG,
    [
      '-v',
      'error',
      '-i',
      file,
      '-vf',
      `select=eq(n\\,${n}),scale=in_color_matrix=bt709:in_range=tv:out_range=pc,format=rgb24`,
      '-frames:v',
      '1',
      '-f',
      'rawvideo',
      '-',
    ],
    { encoding: 'buffer', maxBuffer: width * height * 4 },
  );
  expect(stdout.length).toBe(width * height * 3);
  return stdout;
}

const rgbAt = (rgb: Buffer, width: number, x: number, y: number) => {
  const i = (Math.floor(y) * width + Math.floor(x)) * 3;
  return [rgb[i]!, rgb[i + 1]!, rgb[i + 2]!];
};
const hexRgb = (hex: string) => [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16));

describe('a single clip in slow motion', () => {
  const from = 20;
  const to = 79; // 60 source frames
  let file: string;
  let out: AnnotatedClipRenderOutput;

  beforeAll(async () => {
    file = path.join(dir.dir, 'eighth.mp4');
    const steps = [];
    for (let f = from; f <= to; f++) steps.push([f]);
    out = await renderAnnotatedClip({
      panels: [runnerPanel(runner, 'Baseline · 6 Oct 2026')],
      steps,
      factor: 0.125,
      caption: 'Right toe-off: watch the hip pass under the body.',
      showAngles: true,
      outFile: file,
    });
  }, 120_000);

  it('is H.264 yuv420p in MP4 with moov before mdat and no audio (ffprobe)', async () => {
    const p = await probe(file);
    expect(p.video).toHaveLength(1);
    expect(p.audio).toHaveLength(0);
    expect(p.video[0]).toMatchObject({ codec_name: 'h264', pix_fmt: 'yuv420p', width: out.width, height: out.height });
    expect(p.json.format.format_name).toContain('mp4');
    expect(p.boxes.indexOf('moov')).toBeGreaterThanOrEqual(0);
    expect(p.boxes.indexOf('moov')).toBeLessThan(p.boxes.indexOf('mdat'));
    // Fits a phone: even size, long side ≤ 1280, the frame at its working size.
    expect((out.width % 2) + (out.height % 2)).toBe(0);
    expect(Math.max(out.width, out.height)).toBeLessThanOrEqual(1280);
    expect(out.layout[0]).toMatchObject({ width: 640, height: 360 });
  });

  it('has range × repeat frames and lasts range ÷ (fps × factor) (the documented rule, by hand)', async () => {
    // 60 fps at 1/8 shows 7.5 source frames a second; ⌈24 ÷ 7.5⌉ = 4 copies each → 30 fps.
    // 60 source frames → 240 video frames, 60 ÷ 7.5 = 8 s.
    const p = await probe(file);
    expect(Number(p.video[0]!.nb_read_frames)).toBe(240);
    expect(Math.abs(Number(p.json.format.duration) - 8)).toBeLessThanOrEqual(1 / 30 + 1e-6);
    expect(out).toMatchObject({ frameCount: 240, repeat: 4, outputFps: 30, durationS: 8 });
  });

  it('gets each source frame once and has ffmpeg repeat it: the 4 copies decode alike, the next frame differs (ffmpeg decode)', async () => {
    const meanDiff = (a: Buffer, b: Buffer) => {
      let sum = 0;
      for (let i = 0; i < a.length; i++) sum += Math.abs(a[i]! - b[i]!);
      return sum / a.length;
    };
    const k = 50 - from;
    const copies = await Promise.all([0, 1, 2, 3, 4].map((r) => decodeFrame(file, k * 4 + r, out.width, out.height)));
    const within = [1, 2, 3].map((r) => meanDiff(copies[0]!, copies[r]!));
    const across = meanDiff(copies[3]!, copies[4]!); // the last copy of frame 50 against the first of frame 51
    expect(Math.max(...within), `copies ${within.join(', ')}; next frame ${across}`).toBeLessThan(0.5);
    expect(across).toBeGreaterThan(4 * Math.max(0.05, ...within));
  });

  it('shows the near-side colour and the white ring at the true joint pixels (ffmpeg decode, generator truth)', async () => {
    const want = hexRgb(OVERLAY_COLOURS[runner.truth.nearSide]);
    const rect = out.layout[0]!;
    // Toe-off and initial contact frames inside the range, and one in between.
    const frames = [
      runner.truth.events.near.toeOff.find((f) => f >= from && f <= to)!,
      runner.truth.events.far.initialContact.find((f) => f >= from)!,
      50,
    ];
    for (const source of frames) {
      // The first of the four copies of that source frame.
      const rgb = await decodeFrame(file, (source - from) * 4, out.width, out.height);
      const bareImg = await loadImage(runner.jpegs[source]!);
      const bare = createCanvas(bareImg.width, bareImg.height).getContext('2d');
      bare.drawImage(bareImg, 0, 0);
      const truth = runner.truth.frames[source]!;
      for (const name of ['hip', 'knee', 'ankle', 'heel', 'toe'] as const) {
        const p = truth.landmarks.near[name];
        const px = rgbAt(rgb, out.width, rect.x + p.x, rect.y + p.y);
        const diff = Math.max(...want.map((v, i) => Math.abs(v - px[i]!)));
        expect(diff, `frame ${source} ${name} at (${p.x}, ${p.y}) is rgb(${px.join(', ')})`).toBeLessThanOrEqual(40);
        // The white outline: in at least two of four directions a pixel about one marker radius out
        // is clearly whiter than the bare frame there.
        const lift = (ux: number, uy: number) =>
          Math.max(
            ...[2.5, 3, 3.5, 4].map((r) => {
              const x = Math.floor(p.x + ux * r);
              const y = Math.floor(p.y + uy * r);
              const q = rgbAt(rgb, out.width, rect.x + x, rect.y + y);
              const b = bare.getImageData(x, y, 1, 1).data;
              return Math.min(q[0]! - b[0]!, q[1]! - b[1]!, q[2]! - b[2]!);
            }),
          );
        const ring = [
          [1, 0],
          [-1, 0],
          [0, 1],
          [0, -1],
        ].map(([ux, uy]) => lift(ux!, uy!));
        expect(ring.filter((w) => w >= 15).length, `frame ${source} ${name} outline ${ring.join(',')}`).toBeGreaterThanOrEqual(2);
      }
    }
  });

  it('says every landmark was marked when every frame was marked', () => {
    expect(out.origins[0]).toEqual({ marked: 60, followed: 0, interpolated: 0, none: 0 });
    expect(out.note).toBe('Landmarks marked on 60 frames.');
  });
});

describe('landmarks only on event frames', () => {
  it('are interpolated between them, and the clip says on how many frames (counted from the truth by hand)', async () => {
    const panel = runnerPanel(runner, 'Baseline', 'events');
    const marked = new Set(panel.landmarks.map((l) => l.frame));
    const first = Math.min(...marked);
    const last = Math.max(...marked);
    // Range 0–119: frames before the first or after the last marked frame show nothing; the rest
    // between marked frames are interpolated.
    const steps = Array.from({ length: 120 }, (_, f) => [f]);
    const out = await renderAnnotatedClip({
      panels: [panel],
      steps,
      factor: 0.5,
      caption: '',
      showAngles: false,
      outFile: path.join(dir.dir, 'half.mp4'),
    });
    const interpolated = last - first + 1 - marked.size;
    expect(out.origins[0]).toEqual({ marked: marked.size, followed: 0, interpolated, none: 120 - (last - first + 1) });
    expect(out.note).toBe(`Landmarks marked on ${marked.size} frames and interpolated between marked frames on ${interpolated}.`);
    // 60 fps at 1/2 = 30 a second: no copies, 120 frames, 4 s (ffprobe).
    const p = await probe(path.join(dir.dir, 'half.mp4'));
    expect(Number(p.video[0]!.nb_read_frames)).toBe(120);
    expect(Math.abs(Number(p.json.format.duration) - 4)).toBeLessThanOrEqual(1 / 30 + 1e-6);
  }, 120_000);
});

describe('a range over the limit', () => {
  it('is refused before anything is drawn, with the limit in the message', async () => {
    const steps = Array.from({ length: 1001 }, () => [0]);
    await expect(
      renderAnnotatedClip({
        panels: [runnerPanel(runner, 'x')],
        steps,
        factor: 1,
        caption: '',
        showAngles: false,
        outFile: path.join(dir.dir, 'no.mp4'),
      }),
    ).rejects.toThrow('at most 1000 frames; this one has 1001');
  });
});

/** The Re-test: the 100 fps runner from its 13th frame on, so its contacts fall elsewhere than the Baseline's. */
const SHIFT = 13;
function shifted(r: RunnerFrames) {
  const panel = runnerPanel(r, 'Re-test · 24 Nov 2026');
  const landmarks: FrameLandmarks[] = panel.landmarks.filter((l) => l.frame >= SHIFT).map((l) => ({ ...l, frame: l.frame - SHIFT }));
  const events: GaitEventMark[] = panel.events.filter((e) => e.frame >= SHIFT).map((e) => ({ ...e, frame: e.frame - SHIFT }));
  return { ...panel, landmarks, events, readFrame: async (i: number) => r.jpegs[i + SHIFT]! };
}

/** Mean absolute grey difference between the video's panel and a source frame resized to it. */
function greyDiff(
  rgb: Buffer,
  videoWidth: number,
  rect: { x: number; y: number; width: number; height: number },
  frame: Uint8ClampedArray,
) {
  let sum = 0;
  let n = 0;
  for (let y = 0; y < rect.height; y += 2) {
    for (let x = 0; x < rect.width; x += 2) {
      const i = ((rect.y + y) * videoWidth + rect.x + x) * 3;
      const j = (y * rect.width + x) * 4;
      sum += Math.abs(rgb[i]! + rgb[i + 1]! + rgb[i + 2]! - frame[j]! - frame[j + 1]! - frame[j + 2]!);
      n++;
    }
  }
  return sum / n;
}

describe('Baseline and Re-test side by side', () => {
  it('shows the Re-test’s own initial contact at each true initial contact of the Baseline (±1 frame, ffmpeg decode)', async () => {
    const retest = shifted(fast);
    const baseline = runnerPanel(runner, 'Baseline · 6 Oct 2026');
    // Truth, by hand: each visit's initial contacts of both sides in time order. Both start with the
    // same side and alternate, so the k-th contact of one visit is the k-th of the other.
    const contacts = (ev: RunnerFrames['truth']['events'], shift: number) =>
      [
        ...ev.near.initialContact.map((f) => ({ f: f - shift, side: 'near' })),
        ...ev.far.initialContact.map((f) => ({ f: f - shift, side: 'far' })),
      ]
        .filter((c) => c.f >= 0)
        .sort((a, b) => a.f - b.f);
    const b = contacts(runner.truth.events, 0);
    const r = contacts(fast.truth.events, SHIFT);
    const n = Math.min(b.length, r.length);
    expect(n).toBeGreaterThanOrEqual(4);
    expect(b.slice(0, n).map((c) => c.side)).toEqual(r.slice(0, n).map((c) => c.side));

    const pairs = pairInitialContacts(baseline.events, retest.events);
    const steps = sideBySideSteps(0, runner.truth.frameCount - 1, pairs, 100 / 60, fast.truth.frameCount - SHIFT);
    const file = path.join(dir.dir, 'pair.mp4');
    const out = await renderAnnotatedClip({
      panels: [baseline, retest],
      steps,
      factor: 0.5,
      caption: 'Baseline and re-test, lined up at each initial contact.',
      showAngles: true,
      outFile: file,
    });
    // Same height, side by side, within 1280 px.
    expect(out.layout[0]!.height).toBe(out.layout[1]!.height);
    expect(out.layout[1]!.x).toBeGreaterThan(out.layout[0]!.x + out.layout[0]!.width - 1);
    expect(Math.max(out.width, out.height)).toBeLessThanOrEqual(1280);
    const p = await probe(file);
    expect(p.video[0]).toMatchObject({ codec_name: 'h264', pix_fmt: 'yuv420p' });
    expect(Number(p.video[0]!.nb_read_frames)).toBe(120); // 60 fps at 1/2: 30 a second, no copies

    // The Re-test's source frames at the panel's size, to find which one the video shows.
    const rect = out.layout[1]!;
    const canvas = createCanvas(rect.width, rect.height);
    const ctx = canvas.getContext('2d');
    const candidates: Uint8ClampedArray[] = [];
    for (let f = 0; f < fast.truth.frameCount - SHIFT; f++) {
      ctx.drawImage(await loadImage(fast.jpegs[f + SHIFT]!), 0, 0, rect.width, rect.height);
      candidates.push(ctx.getImageData(0, 0, rect.width, rect.height).data);
    }
    for (let k = 0; k < n; k++) {
      const rgb = await decodeFrame(file, b[k]!.f, out.width, out.height); // one video frame per Baseline frame
      const diffs = candidates.map((c) => greyDiff(rgb, out.width, rect, c));
      const shown = diffs.indexOf(Math.min(...diffs));
      expect(
        Math.abs(shown - r[k]!.f),
        `Baseline contact ${b[k]!.f}: Re-test shows ${shown}, its contact is ${r[k]!.f}`,
      ).toBeLessThanOrEqual(1);
    }
  }, 180_000);
});

describe('side by side on a phone', () => {
  it('keeps headings and caption readable when a 390×844 phone shows the clip full screen (ffmpeg decode, measured ink)', async () => {
    // Two 1280×720 clips: each panel is about half its frame, so text sized by the frame would halve.
    const big = await runnerFrames({ fps: 120, width: 1280, height: 720, seconds: 0.05, hipExtensionDeg: 8, facing: 'right' });
    const file = path.join(dir.dir, 'phone-pair.mp4');
    const out = await renderAnnotatedClip({
      panels: [runnerPanel(big, 'Baseline · 6 Oct 2026'), runnerPanel(big, 'Re-test · 24 Nov 2026')],
      steps: big.jpegs.map((_, i) => [i, i]),
      factor: 0.5,
      caption: 'Baseline and re-test, lined up at each initial contact.',
      showAngles: true,
      outFile: file,
    });
    // Panels and the gap between them within the 1280 px limit.
    expect(out.width).toBeLessThanOrEqual(1280);
    expect(out.layout[1]!.x + out.layout[1]!.width).toBeLessThanOrEqual(out.width);
    // The phone turned sideways for full screen is 844×390 CSS px; the player fits the video inside ([calc]).
    const shown = Math.min(844 / out.width, 390 / out.height);
    const rgb = await decodeFrame(file, 0, out.width, out.height);
    /** Rows of `rows` that hold dark text pixels within columns `x0`…`x1`, as [first, last]. */
    const inkRows = (y0: number, y1: number, x0: number, x1: number) => {
      const rows: number[] = [];
      for (let y = y0; y < y1; y++)
        for (let x = x0; x < x1; x++) {
          const [r, g, b] = rgbAt(rgb, out.width, x, y);
          if (r! + g! + b! < 3 * 110) {
            rows.push(y);
            break;
          }
        }
      return [Math.min(...rows), Math.max(...rows)];
    };
    // The Baseline heading (capitals, digits and an "l": no descenders) in the band above the panel.
    const [top, bottom] = inkRows(0, out.layout[0]!.y, 0, Math.round(out.layout[0]!.width * 0.45));
    const capHeight = (bottom - top + 1) * shown;
    // About 9 CSS px from the top of a capital to the baseline is a 13 px font: the smallest size
    // commonly used for body text on phones (common practice).
    expect(capHeight, `heading ink ${bottom - top + 1} video px → ${capHeight.toFixed(1)} CSS px`).toBeGreaterThanOrEqual(9);
    // The caption's first line, just below the panels: "Baseline …" again starts with a capital.
    const footTop = out.layout[0]!.y + out.layout[0]!.height;
    const [cTop] = inkRows(footTop, out.height, 0, out.width);
    const [, cBottom] = inkRows(cTop, cTop + Math.round(40 / shown), 0, Math.round(out.width * 0.05));
    expect((cBottom - cTop + 1) * shown, 'caption capital height, CSS px').toBeGreaterThanOrEqual(9);
  }, 120_000);
});
