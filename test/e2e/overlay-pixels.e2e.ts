/**
 * One overlay routine, two canvases: the same annotations drawn by `drawOverlay` in Debian
 * chromium's Canvas 2D and in Node's @napi-rs/canvas (which renders the server's stills) must give
 * the same pixels where it matters — at every landmark and at the middle of every segment — within
 * a small tolerance for anti-aliasing. Landmarks: the synthetic runner's ground truth at a toe-off
 * (scripts/demo-clip; a fixture with known geometry, not a published source).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { build } from 'esbuild';
import { chromium, type Browser } from 'playwright-core';
import { createCanvas } from '@napi-rs/canvas';
import { CHROMIUM_ARGS } from './harness';
import { buildGroundTruth } from '../../scripts/demo-clip/ground-truth';
import { drawOverlay, overlayLabelPositions, type Canvas2DLike, type OverlayOptions } from '../../src/kinematics';

const W = 640;
const H = 360;
const BACKGROUND = '#CFD9D3';
/** Largest per-channel difference allowed at a sampled pixel (anti-aliasing differs a little). */
const TOLERANCE = 12;

let browser: Browser;
let bundle: string;

const truth = buildGroundTruth({ fps: 60, width: W, height: H, seconds: 1.5, hipExtensionDeg: 8, facing: 'right', beltSpeedMps: 3 });
const frame = truth.frames[truth.events.near.toeOff[0]!]!;
const opts: OverlayOptions = {
  frameSize: { width: W, height: H },
  landmarks: [
    { frame: frame.index, side: 'right', points: frame.landmarksNormalised.near },
    { frame: frame.index, side: 'left', points: frame.landmarksNormalised.far },
  ],
  nearSide: 'right',
  direction: 'left_to_right',
  showAngles: true,
  fontFamily: 'sans-serif',
};

/** Sample points: every marker centre and every segment's midpoint, away from label boxes. */
function samplePoints(): { name: string; x: number; y: number }[] {
  const layout = overlayLabelPositions(opts);
  const pts = [
    ...layout.markers.map((m) => ({ name: `${m.side} ${m.landmark}`, x: m.x, y: m.y })),
    ...layout.segments.map((s) => ({ name: `${s.side} ${s.from}–${s.to}`, x: (s.x1 + s.x2) / 2, y: (s.y1 + s.y2) / 2 })),
  ];
  const nearLabel = (p: { x: number; y: number }) => layout.angles.some((a) => Math.hypot(a.x - p.x, a.y - p.y) < layout.style.fontPx * 3);
  return pts.filter((p) => !nearLabel(p)).map((p) => ({ ...p, x: Math.floor(p.x), y: Math.floor(p.y) }));
}

beforeAll(async () => {
  const out = await build({
    entryPoints: ['src/kinematics/overlay.ts'],
    bundle: true,
    format: 'iife',
    globalName: 'TF',
    write: false,
    platform: 'browser',
    logLevel: 'silent',
  });
  bundle = out.outputFiles[0]!.text;
  browser = await chromium.launch({ executablePath: '/usr/bin/chromium', args: CHROMIUM_ARGS });
});
afterAll(async () => {
  await browser?.close();
});

describe('overlay pixels: browser canvas and Node canvas', () => {
  it('agree at every landmark and segment midpoint', async () => {
    const points = samplePoints();
    expect(points.length).toBeGreaterThanOrEqual(10);

    const page = await browser.newPage();
    await page.setContent(`<canvas id="c" width="${W}" height="${H}"></canvas>`);
    await page.addScriptTag({ content: bundle });
    const browserPixels = await page.evaluate(
      ({ opts, points, background }) => {
        const canvas = document.getElementById('c') as HTMLCanvasElement;
        const ctx = canvas.getContext('2d')!;
        ctx.fillStyle = background;
        ctx.fillRect(0, 0, canvas.width, canvas.height);
        (window as unknown as { TF: { drawOverlay: (c: unknown, o: unknown) => void } }).TF.drawOverlay(ctx, opts);
        return points.map((p) => Array.from(ctx.getImageData(p.x, p.y, 1, 1).data));
      },
      { opts, points, background: BACKGROUND },
    );
    await page.close();

    const canvas = createCanvas(W, H);
    const ctx = canvas.getContext('2d');
    ctx.fillStyle = BACKGROUND;
    ctx.fillRect(0, 0, W, H);
    drawOverlay(ctx as unknown as Canvas2DLike, opts);

    const problems: string[] = [];
    points.forEach((p, i) => {
      const node = Array.from(ctx.getImageData(p.x, p.y, 1, 1).data);
      const web = browserPixels[i]!;
      const diff = Math.max(...[0, 1, 2].map((k) => Math.abs(node[k]! - web[k]!)));
      if (diff > TOLERANCE) problems.push(`${p.name} (${p.x}, ${p.y}): node rgb(${node.slice(0, 3)}) vs browser rgb(${web.slice(0, 3)})`);
    });
    expect(problems).toEqual([]);
    // The sampled pixels are really overlay, not background, on both sides.
    const drawn = browserPixels.filter((px) => px.slice(0, 3).join() !== '207,217,211');
    expect(drawn.length).toBe(points.length);
  });
});
