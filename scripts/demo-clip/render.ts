/**
 * Draws one frame of the synthetic runner with a Canvas 2D context (@napi-rs/canvas in Node; any
 * Canvas 2D context works). Near side over far side, tape markers on top.
 */
import { createCanvas, type Canvas, type SKRSContext2D } from '@napi-rs/canvas';
import type { Point } from '../../src/kinematics/geometry';
import { toRad } from '../../src/kinematics/geometry';
import { markerRadiusPx, toPixels, type Layout } from './ground-truth';
import { armPoints, seededRandom } from './realism';
import { BODY, type PlacedLeg, type RunnerPose } from './runner-model';

/** DESIGN.md colours: left limb violet, right limb amber, trunk slate; plus scene colours. */
export const COLOURS = {
  left: '#7B4FD6',
  right: '#E08A1E',
  trunk: '#3E4C59',
  background: '#CCD6D1',
  deck: '#3A4147',
  beltLine: '#1E2327',
  beltTick: '#59636B',
  /** Near-side tape markers: white with a dark ring. */
  nearMarker: '#FFFFFF',
  /** Far-side tape markers: light grey, smaller. */
  farMarker: '#D8DCDA',
  markerRing: '#1C2226',
} as const;

/** Mixes a #RRGGBB colour with another; `t` = share of the second. */
export function mix(a: string, b: string, t: number): string {
  const ch = (hex: string, i: number) => parseInt(hex.slice(1 + 2 * i, 3 + 2 * i), 16);
  const parts = [0, 1, 2].map((i) => Math.round(ch(a, i) * (1 - t) + ch(b, i) * t));
  return `#${parts.map((p) => p.toString(16).padStart(2, '0')).join('')}`;
}

/** Shoe outline in the foot frame (origin heel marker, x along heel→toe, y up from that line), m. */
const SHOE: ReadonlyArray<readonly [number, number]> = [
  [-0.035, -0.025],
  [0.245, -0.025],
  [0.262, -0.006],
  [0.2, 0.035],
  [0.095, 0.07],
  [0.03, 0.085],
  [-0.038, 0.03],
];

interface Scene {
  ctx: SKRSContext2D;
  layout: Layout;
  px: (p: Point) => Point;
  m: (metres: number) => number;
}

function segment(s: Scene, a: Point, b: Point, widthM: number, colour: string): void {
  const { ctx } = s;
  const pa = s.px(a);
  const pb = s.px(b);
  ctx.strokeStyle = colour;
  ctx.lineWidth = s.m(widthM);
  ctx.lineCap = 'round';
  ctx.beginPath();
  ctx.moveTo(pa.x, pa.y);
  ctx.lineTo(pb.x, pb.y);
  ctx.stroke();
}

function shoe(s: Scene, leg: PlacedLeg, colour: string): void {
  const a = toRad(leg.angles.footDeg);
  const u = { x: Math.cos(a), y: Math.sin(a) };
  const n = { x: -Math.sin(a), y: Math.cos(a) };
  const { ctx } = s;
  ctx.fillStyle = colour;
  ctx.beginPath();
  SHOE.forEach(([x, y], i) => {
    const p = s.px({ x: leg.heel.x + x * u.x + y * n.x, y: leg.heel.y + x * u.y + y * n.y });
    if (i === 0) ctx.moveTo(p.x, p.y);
    else ctx.lineTo(p.x, p.y);
  });
  ctx.closePath();
  ctx.fill();
}

function leg(s: Scene, hip: Point, l: PlacedLeg, colour: string, shoeColour: string): void {
  segment(s, hip, l.knee, 0.13, colour);
  segment(s, l.knee, l.ankle, 0.09, colour);
  shoe(s, l, shoeColour);
}

/** Arm swinging against the leg of the same side; the elbow bent about 80°. */
function arm(s: Scene, shoulder: Point, sameSideThighDeg: number, colour: string): void {
  const { elbow, hand } = armPoints(shoulder, sameSideThighDeg);
  segment(s, shoulder, elbow, 0.075, colour);
  segment(s, elbow, hand, 0.065, colour);
}

function marker(s: Scene, p: Point, radiusPx: number, fill: string): void {
  const { ctx } = s;
  const c = s.px(p);
  ctx.fillStyle = fill;
  ctx.strokeStyle = COLOURS.markerRing;
  ctx.lineWidth = Math.max(1, s.m(0.004));
  ctx.beginPath();
  ctx.arc(c.x, c.y, radiusPx, 0, 2 * Math.PI);
  ctx.fill();
  ctx.stroke();
}

function treadmill(s: Scene, width: number, height: number, timeS: number, beltSpeedMps: number, offsetY: number): void {
  const { ctx } = s;
  const beltY = s.layout.beltY + offsetY;
  ctx.fillStyle = COLOURS.deck;
  ctx.fillRect(0, beltY, width, height - beltY);
  // Belt ticks every 0.25 m, moving backwards with the belt.
  const spacing = 0.25;
  const shift = (((beltSpeedMps * timeS) % spacing) + spacing) % spacing;
  ctx.strokeStyle = COLOURS.beltTick;
  ctx.lineWidth = Math.max(1, s.m(0.006));
  const halfSpan = width / s.layout.pxPerMetre / 2 + spacing;
  for (let x = -halfSpan - shift; x < halfSpan; x += spacing) {
    const p = s.px({ x, y: 0 });
    ctx.beginPath();
    ctx.moveTo(p.x, beltY + 2);
    ctx.lineTo(p.x, Math.min(height, beltY + s.m(0.03)));
    ctx.stroke();
  }
  ctx.strokeStyle = COLOURS.beltLine;
  ctx.lineWidth = Math.max(1.5, s.m(0.008));
  ctx.beginPath();
  ctx.moveTo(0, beltY);
  ctx.lineTo(width, beltY);
  ctx.stroke();
}

/** Extras of {@link drawFrame} that the realism options bring. */
export interface FrameExtras {
  /** Drawn instead of the plain background colour (see {@link makeTexturedWall}). */
  background?: Canvas;
  /** Camera offset in pixels: everything, background included, moves by it. */
  offset?: Point;
  /** Whether the far-side markers are drawn on top of everything (no occlusion). */
  farMarkersOnTop?: boolean;
  /** Whether no tape markers are drawn at all. */
  noMarkers?: boolean;
}

/**
 * A wall behind the treadmill: panels in shades around the background colour, a few darker and
 * lighter streaks and fine speckle, seeded so every frame of a clip shows the same wall. A little
 * larger than the frame so camera shake never shows an edge.
 */
export function makeTexturedWall(width: number, height: number, seed: number): Canvas {
  const margin = 16;
  const canvas = createCanvas(width + 2 * margin, height + 2 * margin);
  const ctx = canvas.getContext('2d');
  const rnd = seededRandom(seed * 104729);
  ctx.fillStyle = COLOURS.background;
  ctx.fillRect(0, 0, canvas.width, canvas.height);
  const panel = Math.round(width / 9);
  for (let y = 0; y < canvas.height; y += panel / 2)
    for (let x = 0; x < canvas.width; x += panel) {
      ctx.fillStyle = mix(COLOURS.background, rnd() < 0.5 ? '#000000' : '#FFFFFF', 0.04 + 0.12 * rnd());
      ctx.fillRect(x + ((y / (panel / 2)) % 2) * (panel / 2), y, panel - 2, panel / 2 - 2);
    }
  for (let i = 0; i < 40; i++) {
    ctx.strokeStyle = mix(COLOURS.background, rnd() < 0.6 ? '#2A3330' : '#F4F6F5', 0.2 + 0.3 * rnd());
    ctx.lineWidth = 1 + 3 * rnd();
    ctx.beginPath();
    const x = rnd() * canvas.width;
    const y = rnd() * canvas.height;
    ctx.moveTo(x, y);
    ctx.lineTo(x + (rnd() - 0.5) * 300, y + (rnd() - 0.5) * 120);
    ctx.stroke();
  }
  const img = ctx.getImageData(0, 0, canvas.width, canvas.height);
  for (let i = 0; i < img.data.length; i += 4) {
    const d = (rnd() - 0.5) * 24;
    img.data[i] = Math.max(0, Math.min(255, img.data[i]! + d));
    img.data[i + 1] = Math.max(0, Math.min(255, img.data[i + 1]! + d));
    img.data[i + 2] = Math.max(0, Math.min(255, img.data[i + 2]! + d));
  }
  ctx.putImageData(img, 0, 0);
  return canvas;
}

/**
 * Draws the whole frame: background (plain or a textured wall), treadmill belt line (with ticks
 * moving at belt speed), far arm and leg (lighter) with smaller far markers, trunk and head, near
 * leg and arm, then the near-side markers (shoulder, hip, knee, ankle, heel, toe) on top of
 * everything. `extras.offset` moves the whole picture (camera shake).
 */
export function drawFrame(
  ctx: SKRSContext2D,
  pose: RunnerPose,
  layout: Layout,
  size: { width: number; height: number },
  beltSpeedMps: number,
  extras: FrameExtras = {},
): void {
  const off = extras.offset ?? { x: 0, y: 0 };
  const s: Scene = {
    ctx,
    layout,
    px: (p) => {
      const q = toPixels(p, layout);
      return { x: q.x + off.x, y: q.y + off.y };
    },
    m: (metres) => metres * layout.pxPerMetre,
  };
  const nearColour = layout.facing === 'right' ? COLOURS.right : COLOURS.left;
  const farColour = mix(layout.facing === 'right' ? COLOURS.left : COLOURS.right, COLOURS.background, 0.45);
  const radius = markerRadiusPx(layout.pxPerMetre);

  if (extras.background) {
    const margin = (extras.background.width - size.width) / 2;
    ctx.drawImage(extras.background, off.x - margin, off.y - margin);
  } else {
    ctx.fillStyle = COLOURS.background;
    ctx.fillRect(0, 0, size.width, size.height);
  }
  treadmill(s, size.width, size.height, pose.timeS, beltSpeedMps, off.y);

  arm(s, pose.shoulder, pose.far.angles.thighDeg, farColour);
  leg(s, pose.hip, pose.far, farColour, mix(COLOURS.trunk, COLOURS.background, 0.45));
  const farMarkers = () => {
    if (extras.noMarkers) return;
    for (const p of [pose.far.knee, pose.far.ankle, pose.far.heel, pose.far.toe]) marker(s, p, radius * 0.75, COLOURS.farMarker);
  };
  if (!extras.farMarkersOnTop) farMarkers();

  segment(s, pose.hip, pose.shoulder, 0.2, COLOURS.trunk);
  const tr = toRad(pose.trunkDeg);
  const headCentre = {
    x: pose.shoulder.x + (BODY.neckM + BODY.headRadiusM * 0.4) * Math.sin(tr),
    y: pose.shoulder.y + (BODY.neckM + BODY.headRadiusM * 0.4) * Math.cos(tr),
  };
  const hc = s.px(headCentre);
  ctx.fillStyle = mix(COLOURS.trunk, '#FFFFFF', 0.15);
  ctx.beginPath();
  ctx.arc(hc.x, hc.y, s.m(BODY.headRadiusM), 0, 2 * Math.PI);
  ctx.fill();

  leg(s, pose.hip, pose.near, nearColour, COLOURS.trunk);
  arm(s, pose.shoulder, pose.near.angles.thighDeg, nearColour);
  if (!extras.noMarkers)
    for (const p of [pose.shoulder, pose.hip, pose.near.knee, pose.near.ankle, pose.near.heel, pose.near.toe])
      marker(s, p, radius, COLOURS.nearMarker);
  if (extras.farMarkersOnTop) farMarkers();
}
