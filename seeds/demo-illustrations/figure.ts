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

/** How far the figure is lifted so its resting point sits where the pose says. */
function liftOf(pose: Pose, j: Joints): number {
  return (pose.restOn ?? 0) - (pose.restPoint === 'near-toe' ? j.near.toe[1] - 1.5 : lowest(j));
}

/** What a set of poses covers once set down, in units: left and right edges and the top (the floor is 0). */
export interface Frame {
  minX: number;
  maxX: number;
  maxY: number;
}

/** The frame that holds every pose of an exercise (so its pictures share one scale and the figure does not jump). */
export function frameOf(poses: readonly Pose[]): Frame {
  const xs: number[] = [];
  const ys: number[] = [0];
  for (const pose of poses) {
    const j = joints(pose);
    const lift = liftOf(pose, j);
    const pts = [
      j.hip,
      j.shoulder,
      ...[j.near, j.far].flatMap((l) => [l.knee, l.ankle, l.toe, l.heel]),
      ...[j.nearArm, j.farArm].flatMap((a) => [a.elbow, a.hand]),
    ];
    for (const [x, y] of pts) {
      xs.push(x);
      ys.push(y + lift);
    }
    xs.push(j.headCentre[0] - SEGMENTS.head, j.headCentre[0] + SEGMENTS.head);
    ys.push(j.headCentre[1] + lift + SEGMENTS.head);
    for (const prop of pose.props ?? []) {
      if (prop.kind === 'step') xs.push(prop.x, prop.x + prop.width);
      if (prop.kind === 'bench') xs.push(j.shoulder[0] - prop.width / 2, j.shoulder[0] + prop.width / 2);
    }
  }
  return { minX: Math.min(...xs), maxX: Math.max(...xs), maxY: Math.max(...ys) };
}

/** Pixels of floor under the figure, and of margin around it (at any size). */
export const LAYOUT = { floorBand: 0.06, margin: 0.05 } as const;

/** A picture size for a frame: 1000 px wide, as tall as the figure needs (between 2:1 and 4:3). */
export function sizeFor(frame: Frame, width = 1000): { width: number; height: number } {
  const wide = frame.maxX - frame.minX;
  const tall = frame.maxY;
  const inner = width * (1 - 2 * LAYOUT.margin);
  const height = ((tall / wide) * inner) / (1 - LAYOUT.floorBand - LAYOUT.margin);
  return { width, height: Math.round(Math.min(width * 0.75, Math.max(width * 0.5, height))) };
}

/**
 * Draws one pose into a `width`×`height` canvas, scaled so `frame` fills it: floor, props, the
 * far limbs, then trunk, head and the near limbs on top.
 */
export function drawPose(ctx: CanvasRenderingContext2D, pose: Pose, width: number, height: number, frame: Frame = frameOf([pose])): void {
  const floorY = height * (1 - LAYOUT.floorBand);
  const margin = width * LAYOUT.margin;
  const scale = Math.min((width - 2 * margin) / (frame.maxX - frame.minX), (floorY - height * LAYOUT.margin) / frame.maxY);
  const left = (width - (frame.maxX - frame.minX) * scale) / 2 - frame.minX * scale;
  const j = joints(pose);
  const lift = liftOf(pose, j);
  const px = (p: Pt): Pt => [left + p[0] * scale, floorY - (p[1] + lift) * scale];

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
      ctx.roundRect(left + box.x * scale, top, box.width * scale, box.height * scale, 6);
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
