/**
 * The one place the review workspace calls `src/kinematics`. INTERIM: the kinematics module does
 * not yet export `computeClipMeasures`, `drawOverlay`, `DEFAULT_REFERENCE_BANDS` and
 * `validateEvents`; until it does, this file stands in with a minimal version (per-frame angles
 * for the chart, a plain overlay, no measures) so the workspace can be built and used. Switch to
 * re-exports once `src/kinematics/index.ts` has them.
 */
import type { FrameLandmarks, GaitEventMark, LandmarkName, ScaleBar } from '../../../contracts/annotations';
import type { Direction, FilmSurface, Side } from '../../../contracts/assessment';
import type { AngleSample, ClipMeasures, ReferenceBand } from '../../../contracts/measures';
import { footAngleDeg, hipRelativeToTrunkDeg, kneeFlexionDeg, shankAngleDeg, thighAngleDeg, toSagittal, trunkLeanDeg } from '../../../kinematics';

export interface ClipMeasuresInput {
  clipId: number;
  annotations: { landmarks: FrameLandmarks[]; events: GaitEventMark[]; scale: ScaleBar | null };
  frameSize: { width: number; height: number };
  fps: number;
  timestampsMs?: number[];
  direction: Direction;
  surface: FilmSurface;
  beltSpeedMps: number | null;
  bands: ReferenceBand[];
}

export interface OverlayOptions {
  frameSize: { width: number; height: number };
  landmarks: FrameLandmarks[];
  nearSide: Side;
  direction: Direction;
  showAngles: boolean;
  selected?: { side: Side; landmark: LandmarkName } | null;
  scale?: ScaleBar | null;
  fontFamily?: string;
  markerRadiusPx?: number;
}

export type Canvas2DLike = CanvasRenderingContext2D;

export const KINEMATICS_VERSION = 'interim-client';

export const DEFAULT_REFERENCE_BANDS: ReferenceBand[] = [];

export function validateEvents(events: GaitEventMark[], frameCount: number): string[] {
  return events.filter((e) => e.frame < 0 || e.frame >= frameCount).map((e) => `An event at frame ${e.frame} lies outside the clip.`);
}

export function computeClipMeasures(input: ClipMeasuresInput): ClipMeasures {
  const facing = input.direction === 'left_to_right' ? 'right' : 'left';
  const angles: AngleSample[] = [];
  for (const row of input.annotations.landmarks) {
    const p = (name: LandmarkName) => {
      const q = row.points[name];
      return q ? toSagittal(q, input.frameSize, facing) : null;
    };
    const [shoulder, hip, knee, ankle, heel, toe] = (['shoulder', 'hip', 'knee', 'ankle', 'heel', 'toe'] as const).map(p);
    const sample: AngleSample = {
      frame: row.frame,
      timeMs: input.timestampsMs?.[row.frame] ?? (row.frame * 1000) / input.fps,
      side: row.side,
    };
    if (hip && knee) sample.thighDeg = thighAngleDeg(hip, knee);
    if (knee && ankle) sample.shankDeg = shankAngleDeg(knee, ankle);
    if (hip && knee && ankle) sample.kneeFlexionDeg = kneeFlexionDeg(hip, knee, ankle);
    if (hip && shoulder) sample.trunkDeg = trunkLeanDeg(hip, shoulder);
    if (heel && toe) sample.footDeg = footAngleDeg(heel, toe);
    if (sample.thighDeg !== undefined && sample.trunkDeg !== undefined) sample.hipRelTrunkDeg = hipRelativeToTrunkDeg(sample.thighDeg, sample.trunkDeg);
    angles.push(sample);
  }
  return {
    kinematicsVersion: KINEMATICS_VERSION,
    clipId: input.clipId,
    hasScale: input.annotations.scale !== null || (input.surface === 'treadmill' && input.beltSpeedMps !== null),
    measures: [],
    angles: angles.sort((a, b) => a.frame - b.frame),
    notes: ['Measures are not computed in this build yet; the chart shows per-frame angles.'],
  };
}

const LIMB: Record<Side, string> = { left: '#7B4FD6', right: '#E08A1E' };
const TRUNK = '#3E4C59';

export function drawOverlay(ctx: Canvas2DLike, opts: OverlayOptions): void {
  const { width, height } = opts.frameSize;
  const r = opts.markerRadiusPx ?? 5;
  const at = (p: { x: number; y: number }) => ({ x: p.x * width, y: p.y * height });
  ctx.save();
  ctx.lineCap = 'round';
  ctx.lineJoin = 'round';
  const rows = [...opts.landmarks].sort((a) => (a.side === opts.nearSide ? 1 : -1));
  for (const row of rows) {
    const colour = LIMB[row.side];
    const chain: LandmarkName[][] = [['hip', 'knee', 'ankle', 'heel', 'toe', 'ankle']];
    ctx.lineWidth = r * 0.6;
    ctx.globalAlpha = row.side === opts.nearSide ? 1 : 0.7;
    if (row.points.shoulder && row.points.hip) {
      ctx.strokeStyle = TRUNK;
      ctx.beginPath();
      const a = at(row.points.shoulder);
      const b = at(row.points.hip);
      ctx.moveTo(a.x, a.y);
      ctx.lineTo(b.x, b.y);
      ctx.stroke();
    }
    ctx.strokeStyle = colour;
    for (const names of chain) {
      for (let i = 0; i + 1 < names.length; i++) {
        const p = row.points[names[i]];
        const q = row.points[names[i + 1]];
        if (!p || !q) continue;
        const a = at(p);
        const b = at(q);
        ctx.beginPath();
        ctx.moveTo(a.x, a.y);
        ctx.lineTo(b.x, b.y);
        ctx.stroke();
      }
    }
    for (const [name, p] of Object.entries(row.points) as [LandmarkName, { x: number; y: number }][]) {
      const c = at(p);
      const selected = opts.selected?.side === row.side && opts.selected.landmark === name;
      ctx.beginPath();
      ctx.arc(c.x, c.y, selected ? r * 1.5 : r, 0, Math.PI * 2);
      ctx.fillStyle = name === 'shoulder' ? TRUNK : colour;
      ctx.fill();
      ctx.lineWidth = r * 0.4;
      ctx.strokeStyle = '#ffffff';
      ctx.stroke();
    }
  }
  if (opts.scale) {
    const a = at(opts.scale.a);
    const b = at(opts.scale.b);
    ctx.globalAlpha = 1;
    ctx.strokeStyle = '#ffffff';
    ctx.lineWidth = r * 0.5;
    ctx.setLineDash([r, r]);
    ctx.beginPath();
    ctx.moveTo(a.x, a.y);
    ctx.lineTo(b.x, b.y);
    ctx.stroke();
  }
  ctx.restore();
}
