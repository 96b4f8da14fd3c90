/**
 * A simple side-view figure for the demo library's illustrations, drawn on any Canvas-2D context
 * (@napi-rs/canvas at seed time). A pose is segment directions in degrees — 0 points down, 90
 * forward (+x, right), 180 up — from the hip; the figure is then set down so its lowest point rests
 * on the floor or on a prop. Invented drawings: no pictures from elsewhere.
 */

/** Angles of one leg: thigh (hip→knee), shank (knee→ankle), foot (ankle→toe). */
export interface LegPose {
  thigh: number;
  shank: number;
  foot: number;
}

/** Angles of one arm: upper arm (shoulder→elbow), forearm (elbow→hand). */
export interface ArmPose {
  upper: number;
  fore: number;
}

/** Something the figure uses: a step, a bench, an anchor for the heels, a weight in the hands. */
export type Prop =
  /** A box whose top is at `height` units, from `x` to `x + width`. */
  | { kind: 'step'; x: number; width: number; height: number }
  /** A bench whose top meets the figure's shoulder blades. */
  | { kind: 'bench'; under: 'shoulder'; width: number }
  /** A pad holding the heels down (kneeling work). */
  | { kind: 'anchor' }
  /** A weight in the near hand. */
  | { kind: 'weight' };

/** One key position. */
export interface Pose {
  /** Hip's horizontal place, in figure units from the left edge (150 units across). */
  x: number;
  /** Hip → shoulder. */
  trunk: number;
  /** Head tilt relative to the trunk line (degrees), e.g. looking down. */
  head?: number;
  near: LegPose;
  far: LegPose;
  nearArm: ArmPose;
  farArm: ArmPose;
  /** Height the resting point is set at (a step's top), units; default the floor. */
  restOn?: number;
  /** What rests there: the figure's lowest point (default), or the near toe (heel hanging off a step). */
  restPoint?: 'lowest' | 'near-toe';
  props?: Prop[];
}

/** Segment lengths in figure units (a standing figure's hip is about 48 units up). */
export const SEGMENTS = { trunk: 28, neck: 4, head: 5.5, thigh: 23, shank: 23, foot: 8, upper: 15, fore: 14 } as const;

type Pt = [number, number];
const rad = (deg: number) => (deg * Math.PI) / 180;
/** A step of `len` in direction `deg`, in y-up units (0 = down). */
const along = (p: Pt, deg: number, len: number): Pt => [p[0] + Math.sin(rad(deg)) * len, p[1] - Math.cos(rad(deg)) * len];

/** Joint positions of a pose in y-up units, before it is set down. */
export function joints(pose: Pose) {
  const hip: Pt = [pose.x, 0];
  const shoulder = along(hip, pose.trunk, SEGMENTS.trunk);
  const neckTop = along(shoulder, pose.trunk + (pose.head ?? 0), SEGMENTS.neck);
  const headCentre = along(neckTop, pose.trunk + (pose.head ?? 0), SEGMENTS.head);
  const leg = (l: LegPose) => {
    const knee = along(hip, l.thigh, SEGMENTS.thigh);
    const ankle = along(knee, l.shank, SEGMENTS.shank);
    const toe = along(ankle, l.foot, SEGMENTS.foot);
    const heel = along(ankle, l.foot + 180, 2.5);
    return { knee, ankle, toe, heel };
  };
  const arm = (a: ArmPose) => {
    const elbow = along(shoulder, a.upper, SEGMENTS.upper);
    return { elbow, hand: along(elbow, a.fore, SEGMENTS.fore) };
  };
  return {
    hip,
    shoulder,
    neckTop,
    headCentre,
    near: leg(pose.near),
    far: leg(pose.far),
    nearArm: arm(pose.nearArm),
    farArm: arm(pose.farArm),
  };
}

export type Joints = ReturnType<typeof joints>;

/** The figure's lowest point (y-up units). */
export function lowest(j: Joints): number {
  const ys = [
    j.headCentre[1] - SEGMENTS.head,
    j.shoulder[1] - 1.5,
    j.hip[1] - 2,
    ...[j.near, j.far].flatMap((l) => [l.knee[1], l.ankle[1], l.toe[1], l.heel[1]]),
    ...[j.nearArm, j.farArm].flatMap((a) => [a.elbow[1], a.hand[1]]),
  ];
  return Math.min(...ys);
}

/**
 * The view: `across` units span the picture's width (poses place the hip within 0–150, so `offset`
 * units of margin sit left of 0); the floor is `floorPx` (at 1200 px wide) above the bottom edge.
 */
export const VIEW = { across: 160, offset: 5, floorPx: 60 } as const;

/** Colours of the drawings: the app's spruce for the near side, a lighter tone for the far side. */
export const INK = {
  background: '#F4F7F5',
  floor: '#9DB0A8',
  near: '#1F5A4A',
  far: '#8FB5A8',
  prop: '#C9D4CF',
  propEdge: '#7D918A',
  arrow: '#E08A1E',
};

/**
 * Draws one pose filling a `width`×`height` canvas: floor, props, the far limbs, then trunk, head
 * and the near limbs on top.
 */
export function drawPose(ctx: CanvasRenderingContext2D, pose: Pose, width: number, height: number): void {
  const scale = width / VIEW.across;
  const floorY = height - VIEW.floorPx * (width / 1200);
  const j = joints(pose);
  const lift = (pose.restOn ?? 0) - (pose.restPoint === 'near-toe' ? j.near.toe[1] - 1.5 : lowest(j));
  const px = (p: Pt): Pt => [(p[0] + VIEW.offset) * scale, floorY - (p[1] + lift) * scale];

  ctx.fillStyle = INK.background;
  ctx.fillRect(0, 0, width, height);
  ctx.fillStyle = INK.floor;
  ctx.fillRect(0, floorY, width, height - floorY);

  for (const prop of pose.props ?? []) {
    if (prop.kind === 'step' || prop.kind === 'bench') {
      const box =
        prop.kind === 'step'
          ? { x: prop.x, width: prop.width, height: prop.height }
          : { x: j.shoulder[0] - prop.width / 2, width: prop.width, height: j.shoulder[1] + lift - 2.3 };
      ctx.fillStyle = INK.prop;
      ctx.strokeStyle = INK.propEdge;
      ctx.lineWidth = 3;
      const top = floorY - box.height * scale;
      ctx.beginPath();
      ctx.roundRect((box.x + VIEW.offset) * scale, top, box.width * scale, box.height * scale, 6);
      ctx.fill();
      ctx.stroke();
    }
  }

  const line = (points: Pt[], colour: string, w: number) => {
    ctx.strokeStyle = colour;
    ctx.lineWidth = w * scale;
    ctx.lineCap = 'round';
    ctx.lineJoin = 'round';
    ctx.beginPath();
    points.map(px).forEach(([x, y], i) => (i === 0 ? ctx.moveTo(x, y) : ctx.lineTo(x, y)));
    ctx.stroke();
  };
  const legPts = (l: Joints['near']): Pt[] => [j.hip, l.knee, l.ankle, l.heel, l.toe, l.ankle];
  const armPts = (a: Joints['nearArm']): Pt[] => [j.shoulder, a.elbow, a.hand];

  line(legPts(j.far), INK.far, 3.6);
  line(armPts(j.farArm), INK.far, 3);
  line([j.hip, j.shoulder, j.neckTop], INK.near, 4.6);
  const [hx, hy] = px(j.headCentre);
  ctx.fillStyle = INK.near;
  ctx.beginPath();
  ctx.arc(hx, hy, SEGMENTS.head * scale, 0, Math.PI * 2);
  ctx.fill();
  line(legPts(j.near), INK.near, 4);
  line(armPts(j.nearArm), INK.near, 3.2);

  for (const prop of pose.props ?? []) {
    if (prop.kind === 'anchor') {
      // A pad over the near ankle.
      const [ax, ay] = px(j.near.ankle);
      ctx.fillStyle = INK.propEdge;
      ctx.beginPath();
      ctx.roundRect(ax - 3 * scale, ay - 3 * scale, 6 * scale, 6 * scale, 4);
      ctx.fill();
    } else if (prop.kind === 'weight') {
      const [wx, wy] = px(j.nearArm.hand);
      ctx.fillStyle = '#3E4C59';
      ctx.fillRect(wx - 6 * scale, wy - 1.2 * scale, 12 * scale, 2.4 * scale);
      ctx.fillRect(wx - 7 * scale, wy - 3.5 * scale, 2.2 * scale, 7 * scale);
      ctx.fillRect(wx + 4.8 * scale, wy - 3.5 * scale, 2.2 * scale, 7 * scale);
    }
  }
}
