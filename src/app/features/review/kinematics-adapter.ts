/**
 * The one place the review workspace calls `src/kinematics` (measures, bands, event checks and the
 * overlay), so the client and the server use one implementation of the math.
 *
 * INTERIM for `drawOverlay` only: until the kinematics overlay is committed, a plain stand-in below
 * draws markers and segments; switch it to the re-export once `src/kinematics/overlay.ts` lands.
 */
import type { FrameLandmarks, LandmarkName, ScaleBar } from '../../../contracts/annotations';
import type { Direction, Side } from '../../../contracts/assessment';

export {
  DEFAULT_REFERENCE_BANDS,
  KINEMATICS_VERSION,
  classifyFootStrike,
  computeClipMeasures,
  validateEvents,
} from '../../../kinematics';
export type { ClipMeasureInput } from '../../../kinematics';

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
