/**
 * Overlay: draws on a recording fake Canvas-2D context and on @napi-rs/canvas (the server's
 * renderer); label numbers equal the computed measures rounded to one decimal; pure layout.
 * Poses are the REFERENCES.md worked examples ([calc]).
 */
import { createCanvas, type SKRSContext2D } from '@napi-rs/canvas';
import fc from 'fast-check';
import { describe, expect, expectTypeOf, it } from 'vitest';
import type { FrameLandmarks } from '../../../src/contracts/annotations';
import {
  drawGhostSkeleton,
  drawOverlay,
  formatAngleLabel,
  GHOST_COLOURS,
  labelBox,
  MIN_VIEW_LABEL_PX,
  overlaySizes,
  tint,
  VIEW_LABEL_PX,
  frameAngles,
  LABEL_OFFSET_RAD,
  OVERLAY_COLOURS,
  overlayLabelPositions,
  type Canvas2DLike,
  type OverlayOptions,
} from '../../../src/kinematics';
import { H, IC_POSE, landmarksAt, SCALE_1M_400PX, TO_POSE, timingExampleEvents, W, type MetrePose } from './helpers';

/** A Canvas2DLike that records every call and property write, and checks save/restore pairing. */
class RecordingContext implements Canvas2DLike {
  calls: { op: string; args: unknown[]; state: Record<string, unknown> }[] = [];
  depth = 0;
  maxDepth = 0;
  strokeStyle: string | object = '#000';
  fillStyle: string | object = '#000';
  lineWidth = 1;
  lineCap: Canvas2DLike['lineCap'] = 'butt';
  lineJoin: Canvas2DLike['lineJoin'] = 'miter';
  font = '10px sans-serif';
  textAlign: Canvas2DLike['textAlign'] = 'start';
  textBaseline: Canvas2DLike['textBaseline'] = 'alphabetic';
  globalAlpha = 1;
  private rec(op: string, args: unknown[]) {
    for (const a of args) if (typeof a === 'number' && !Number.isFinite(a)) throw new Error(`${op} got ${a}`);
    const { strokeStyle, fillStyle, lineWidth, globalAlpha, font } = this;
    this.calls.push({ op, args, state: { strokeStyle, fillStyle, lineWidth, globalAlpha, font } });
  }
  save() {
    this.depth++;
    this.maxDepth = Math.max(this.maxDepth, this.depth);
    this.rec('save', []);
  }
  restore() {
    if (--this.depth < 0) throw new Error('restore without save');
    this.rec('restore', []);
  }
  beginPath() {
    this.rec('beginPath', []);
  }
  moveTo(x: number, y: number) {
    this.rec('moveTo', [x, y]);
  }
  lineTo(x: number, y: number) {
    this.rec('lineTo', [x, y]);
  }
  arc(x: number, y: number, r: number, s: number, e: number, ccw?: boolean) {
    this.rec('arc', [x, y, r, s, e, ccw]);
  }
  stroke() {
    this.rec('stroke', []);
  }
  fill() {
    this.rec('fill', []);
  }
  fillText(t: string, x: number, y: number) {
    this.rec('fillText', [t, x, y]);
  }
  strokeText(t: string, x: number, y: number) {
    this.rec('strokeText', [t, x, y]);
  }
  setLineDash(s: number[]) {
    this.rec('setLineDash', [s]);
  }
  texts() {
    return this.calls.filter((c) => c.op === 'fillText').map((c) => c.args[0] as string);
  }
}

const frameOf = (pose: MetrePose, direction: OverlayOptions['direction'] = 'left_to_right', far?: MetrePose): FrameLandmarks[] => [
  landmarksAt(0, 'right', pose, direction),
  ...(far ? [landmarksAt(0, 'left', far, direction)] : []),
];
const opts = (landmarks: FrameLandmarks[], over: Partial<OverlayOptions> = {}): OverlayOptions => ({
  frameSize: { width: W, height: H },
  landmarks,
  nearSide: 'right',
  direction: 'left_to_right',
  showAngles: true,
  ...over,
});

describe('drawOverlay on a recording fake context', () => {
  it('[calc] IC worked example: draws without throwing, balanced save/restore, labels "26.6° flex", "12.5°", "0.7° DF"', () => {
    const ctx = new RecordingContext();
    drawOverlay(
      ctx,
      opts(frameOf(IC_POSE, 'left_to_right', TO_POSE), { scale: SCALE_1M_400PX, selected: { side: 'right', landmark: 'knee' } }),
    );
    expect(ctx.depth).toBe(0);
    expect(ctx.maxDepth).toBe(1);
    expect(ctx.texts()).toEqual(['26.6° flex', '12.5°', '0.7° DF', '1.00 m']);
    // Each label has a white halo drawn first.
    expect(ctx.calls.filter((c) => c.op === 'strokeText').map((c) => c.args[0])).toEqual(ctx.texts());
  });

  it('uses DESIGN.md colours: right limb amber, left limb violet, trunk slate; far side at half strength and thinner', () => {
    const ctx = new RecordingContext();
    drawOverlay(ctx, opts(frameOf(IC_POSE, 'left_to_right', TO_POSE)));
    const strokes = ctx.calls.filter((c) => c.op === 'stroke');
    const styles = new Set(strokes.map((c) => c.state['strokeStyle']));
    for (const c of ['#E08A1E', '#7B4FD6', '#3E4C59']) expect(styles.has(c)).toBe(true);
    const leftLines = strokes.filter((c) => c.state['strokeStyle'] === '#7B4FD6');
    const rightLines = strokes.filter(
      (c) => c.state['strokeStyle'] === '#E08A1E' && c.state['globalAlpha'] === 1 && c.state['lineWidth'] !== undefined,
    );
    expect(leftLines.every((c) => c.state['globalAlpha'] === 0.5)).toBe(true);
    expect(Math.max(...leftLines.map((c) => c.state['lineWidth'] as number))).toBeLessThan(
      Math.max(...rightLines.map((c) => c.state['lineWidth'] as number)),
    );
    const markerFills = ctx.calls.filter((c) => c.op === 'fill').map((c) => c.state['fillStyle']);
    expect(markerFills.filter((f) => f === OVERLAY_COLOURS.right)).toHaveLength(6);
    expect(markerFills.filter((f) => f === OVERLAY_COLOURS.left)).toHaveLength(4);
  });

  it('showAngles false draws no arcs or labels; an empty frame draws nothing but save/restore', () => {
    const ctx = new RecordingContext();
    drawOverlay(ctx, opts(frameOf(IC_POSE), { showAngles: false }));
    expect(ctx.texts()).toEqual([]);
    const empty = new RecordingContext();
    drawOverlay(empty, opts([]));
    expect(empty.calls.filter((c) => !['save', 'restore', 'setLineDash'].includes(c.op))).toEqual([]);
  });

  it('missing or non-finite landmarks drop only what needs them (no NaN reaches the context)', () => {
    const ctx = new RecordingContext();
    const l = frameOf(IC_POSE);
    l[0]!.points.toe = { x: Number.NaN, y: 0.5 };
    delete l[0]!.points.hip;
    expect(() => drawOverlay(ctx, opts(l))).not.toThrow();
    expect(ctx.texts()).toEqual([]); // hip and knee need the hip; ankle needs the toe
  });
});

describe('label numbers equal the computed measures, rounded to 1 decimal', () => {
  const events = timingExampleEvents(1);
  const landmarks = events.map((e) =>
    landmarksAt(e.frame, e.side, (e.kind === 'initial_contact' ? IC_POSE : TO_POSE) as MetrePose, 'right_to_left'),
  );
  const layout = (frame: number) =>
    overlayLabelPositions(
      opts(
        landmarks.filter((l) => l.frame === frame),
        { direction: 'right_to_left' },
      ),
    );

  it('[calc] toe-off: hip label "22.5° ext" = hip extension at toe-off 22.521° → 22.5; knee "26.9°" = 26.878°', () => {
    const to = layout(60).angles;
    const hip = to.find((a) => a.joint === 'hip')!;
    expect(hip.text).toBe('22.5° ext');
    expect(to.find((a) => a.joint === 'knee')!.text).toBe('26.9°');
    expect(to.find((a) => a.joint === 'ankle')).toBeUndefined(); // no heel/toe in the toe-off example
  });
  it('[calc] initial contact: knee label = knee flexion at IC (12.529° → 12.5)', () => {
    const knee = layout(0).angles.find((a) => a.joint === 'knee')!;
    expect(knee.text).toBe('12.5°');
  });
  it('for any pose, each label is the frame angle rounded to 1 decimal (property)', () => {
    const c = fc.double({ min: 0.05, max: 0.95, noNaN: true });
    const pt = fc.record({ x: c, y: c });
    fc.assert(
      fc.property(fc.record({ hip: pt, knee: pt, ankle: pt, heel: pt, toe: pt }), fc.boolean(), (points, ltr) => {
        const direction = ltr ? ('left_to_right' as const) : ('right_to_left' as const);
        const lm: FrameLandmarks[] = [{ frame: 0, side: 'right', points }];
        const a = frameAngles(lm, { frameSize: { width: W, height: H }, direction }).right!;
        const L = overlayLabelPositions(opts(lm, { direction }));
        for (const g of L.angles) {
          const v = g.joint === 'hip' ? a.thighDeg! : g.joint === 'knee' ? a.kneeFlexionDeg! : a.ankleDeg!;
          expect(g.valueDeg).toBe(v);
          // Independent spelling: one decimal, within half a tenth of the angle; the hip says flex/ext
          // and the ankle DF/PF by the sign (none at 0.0), the knee carries a minus sign instead.
          const m = /^(−?)(\d+\.\d)°(?: (flex|ext|DF|PF))?$/.exec(g.text);
          expect(m, g.text).not.toBeNull();
          const shown = Number(m![2]);
          expect(Math.abs(shown - Math.abs(v))).toBeLessThanOrEqual(0.05 + 1e-9);
          const word = m![3];
          if (shown === 0) expect(word).toBeUndefined();
          else if (g.joint === 'knee') expect([m![1] === '−', word]).toEqual([v < 0, undefined]);
          else expect(word).toBe(g.joint === 'hip' ? (v > 0 ? 'flex' : 'ext') : v > 0 ? 'DF' : 'PF');
        }
      }),
    );
  });
});

describe('overlayLabelPositions (pure layout, frame pixels)', () => {
  it('markers sit at fraction × frame size; the selected one is flagged; far-side markers are smaller', () => {
    const L = overlayLabelPositions(
      opts(frameOf(IC_POSE, 'left_to_right', TO_POSE), { selected: { side: 'left', landmark: 'knee' }, markerRadiusPx: 6 }),
    );
    const hip = L.markers.find((m) => m.side === 'right' && m.landmark === 'hip')!;
    expect(hip.x).toBeCloseTo(640, 9); // hip at x = 0 m → column 640
    expect(hip.y).toBeCloseTo(680 - 0.9 * 400, 9);
    expect(hip.radius).toBe(6);
    expect(L.markers.find((m) => m.side === 'left' && m.landmark === 'knee')).toMatchObject({
      selected: true,
      near: false,
      radius: expect.closeTo(4.8, 9),
    });
    expect(L.markers.filter((m) => m.selected)).toHaveLength(1);
    expect(L.segments.map((s) => `${s.side}:${s.from}-${s.to}`)).toEqual([
      'left:shoulder-hip',
      'left:hip-knee',
      'left:knee-ankle',
      'right:shoulder-hip',
      'right:hip-knee',
      'right:knee-ankle',
      'right:ankle-heel',
      'right:heel-toe',
      'right:toe-ankle',
    ]);
  });

  it('[calc] the hip arc runs from straight down to the thigh (26.565°); the label sits just behind the vertical, away from the flexed thigh', () => {
    const L = overlayLabelPositions(opts(frameOf(IC_POSE)));
    const hip = L.angles.find((a) => a.joint === 'hip')!;
    expect(hip.arc.start).toBeCloseTo(Math.PI / 2, 9); // down the screen
    expect(hip.arc.end - hip.arc.start).toBeCloseTo((-26.565 * Math.PI) / 180, 4); // towards +x = forward
    expect(hip.ray).toMatchObject({ x1: hip.arc.cx, x2: hip.arc.cx }); // dashed vertical reference
    expect(Math.hypot(hip.x - hip.arc.cx, hip.y - hip.arc.cy)).toBeCloseTo(hip.arc.radius + L.style.fontPx * 0.4, 9);
    expect(Math.atan2(hip.y - hip.arc.cy, hip.x - hip.arc.cx)).toBeCloseTo(Math.PI / 2 + LABEL_OFFSET_RAD, 9);
    expect(hip.x).toBeLessThan(hip.arc.cx);
    expect(hip.align).toBe('right'); // the text runs backwards, away from the thigh
    // At toe-off the thigh is behind the vertical, so the label moves in front of it.
    const to = overlayLabelPositions(opts(frameOf(TO_POSE))).angles.find((a) => a.joint === 'hip')!;
    expect(to.x).toBeGreaterThan(to.arc.cx);
    expect(to.align).toBe('left');
  });

  it('a mirrored right-to-left frame gives the same label texts at mirrored positions', () => {
    const a = overlayLabelPositions(opts(frameOf(IC_POSE, 'left_to_right')));
    const b = overlayLabelPositions(opts(frameOf(IC_POSE, 'right_to_left'), { direction: 'right_to_left' }));
    expect(b.angles.map((x) => x.text)).toEqual(a.angles.map((x) => x.text));
    const flip = { left: 'right', right: 'left', center: 'center' } as const;
    for (let i = 0; i < a.angles.length; i++) {
      expect(b.angles[i]!.x).toBeCloseTo(W - a.angles[i]!.x, 6);
      expect(b.angles[i]!.y).toBeCloseTo(a.angles[i]!.y, 6);
      expect(b.angles[i]!.align).toBe(flip[a.angles[i]!.align]);
    }
  });

  it('scale bar: "1.00 m" label above the bar midpoint; ends with ticks', () => {
    const L = overlayLabelPositions(opts([], { scale: SCALE_1M_400PX }));
    expect(L.scaleBar).toMatchObject({ x1: 100, y1: 700, x2: 500, y2: 700, text: '1.00 m' });
    expect(L.scaleBar!.x).toBeCloseTo(300, 9);
    expect(L.scaleBar!.y).toBeLessThan(700);
  });

  it('angle arcs for the far side only when asked (angleSides: both)', () => {
    const lm = frameOf(IC_POSE, 'left_to_right', IC_POSE);
    expect(overlayLabelPositions(opts(lm)).angles.every((a) => a.side === 'right')).toBe(true);
    expect(overlayLabelPositions(opts(lm, { angleSides: 'both' })).angles.map((a) => a.side)).toEqual([
      'left',
      'left',
      'left',
      'right',
      'right',
      'right',
    ]);
  });

  it('formatAngleLabel: signs become words, half away from zero, no "−0.0"', () => {
    expect(formatAngleLabel('hip', -22.521)).toBe('22.5° ext');
    expect(formatAngleLabel('hip', 0.04)).toBe('0.0°');
    expect(formatAngleLabel('hip', -0.04)).toBe('0.0°');
    expect(formatAngleLabel('knee', -2.05)).toBe('−2.1°');
    expect(formatAngleLabel('knee', 12.25)).toBe('12.3°');
    expect(formatAngleLabel('ankle', -3.2)).toBe('3.2° PF');
  });
});

describe('@napi-rs/canvas (the server renderer) and the browser context fit Canvas2DLike', () => {
  it('type-level: both contexts are assignable to Canvas2DLike', () => {
    expectTypeOf<SKRSContext2D>().toMatchTypeOf<Canvas2DLike>();
    expectTypeOf<CanvasRenderingContext2D>().toMatchTypeOf<Canvas2DLike>();
  });

  it('renders onto a real canvas: the near-side knee marker pixel is amber, the far-side hip a faded violet', () => {
    const canvas = createCanvas(W, H);
    const ctx = canvas.getContext('2d');
    ctx.fillStyle = '#000000';
    ctx.fillRect(0, 0, W, H);
    const o = opts(frameOf(IC_POSE, 'left_to_right', { ...TO_POSE, hip: { x: -0.3, y: 0.92 } }), {
      scale: SCALE_1M_400PX,
      markerRadiusPx: 8,
    });
    drawOverlay(ctx, o);
    const L = overlayLabelPositions(o);
    const px = (side: string, name: string) => {
      const m = L.markers.find((x) => x.side === side && x.landmark === name)!;
      return Array.from(ctx.getImageData(Math.round(m.x), Math.round(m.y), 1, 1).data);
    };
    expect(px('right', 'knee')).toEqual([0xe0, 0x8a, 0x1e, 255]);
    const [r, g, b] = px('left', 'hip');
    // Violet #7B4FD6 at half strength over its own half-strength segments on black: darker than full
    // violet, brighter than violet at 50 % over black, and still violet (blue > red > green).
    for (const [v, full] of [
      [r!, 0x7b],
      [g!, 0x4f],
      [b!, 0xd6],
    ] as const) {
      expect(v).toBeLessThan(full);
      expect(v).toBeGreaterThanOrEqual(Math.floor(full / 2));
    }
    expect(b! > r! && r! > g!).toBe(true);
  });
});

describe('overlay sizes in view pixels (viewScale)', () => {
  it('labels are 13 view px (never under 12) however small the frame is shown; without viewScale they follow the frame', () => {
    const frameSize = { width: 1920, height: 1080 };
    for (const viewScale of [0.19, 0.36, 0.5, 1, 2]) {
      const s = overlaySizes(frameSize, viewScale);
      expect(s.fontPx * viewScale).toBeCloseTo(VIEW_LABEL_PX, 9);
      expect(s.fontPx * viewScale).toBeGreaterThanOrEqual(MIN_VIEW_LABEL_PX);
      const layout = overlayLabelPositions({
        frameSize,
        landmarks: [],
        nearSide: 'right',
        direction: 'left_to_right',
        showAngles: true,
        viewScale,
      });
      expect(layout.style.font).toContain(`${s.fontPx}px`);
    }
    // Frame-following sizes: 2.6 % of the shorter side, as before (1080 → 28 px, i.e. ~7 px when shown at 0.25).
    expect(overlaySizes(frameSize).fontPx).toBe(28);
  });

  it('the ghost skeleton is dashed, in lighter tints of the limb colours, with hollow markers', () => {
    // Independent tint: violet #7B4FD6 mixed 45 % with white → (182, 158, 232).
    expect(tint('#7B4FD6', 0.45)).toBe('#B69EE8');
    expect(GHOST_COLOURS.left).toBe('#B69EE8');
    const ctx = new RecordingContext();
    const landmarks = [landmarksAt(0, 'right', TO_POSE as MetrePose, 'left_to_right')];
    drawGhostSkeleton(ctx, { frameSize: { width: W, height: H }, landmarks, viewScale: 0.5 });
    const dashed = ctx.calls.filter((c) => c.op === 'setLineDash' && (c.args[0] as number[]).length > 0);
    expect(dashed.length).toBeGreaterThan(0);
    const strokes = ctx.calls.filter((c) => c.op === 'stroke').map((c) => c.state['strokeStyle']);
    expect(strokes).toContain(GHOST_COLOURS.right);
    expect(strokes).not.toContain(OVERLAY_COLOURS.right);
    expect(ctx.calls.filter((c) => c.op === 'fill')).toEqual([]); // hollow markers
    expect(ctx.depth).toBe(0);
  });
});

describe('angle labels never overlap', () => {
  it('fast-check: however small the frame is shown (labels in view pixels), no two label boxes intersect', () => {
    const ic = [
      landmarksAt(0, 'right', IC_POSE as MetrePose, 'left_to_right'),
      landmarksAt(0, 'left', TO_POSE as MetrePose, 'left_to_right'),
    ];
    fc.assert(
      fc.property(
        fc.double({ min: 0.1, max: 2, noNaN: true }),
        fc.constantFrom<'near' | 'both'>('near', 'both'),
        (viewScale, angleSides) => {
          const L = overlayLabelPositions({
            frameSize: { width: W, height: H },
            landmarks: ic,
            nearSide: 'right',
            direction: 'left_to_right',
            showAngles: true,
            viewScale,
            angleSides,
          });
          const boxes = L.angles.map((a) => labelBox(a, L.style.fontPx));
          for (let i = 0; i < boxes.length; i++)
            for (let j = 0; j < i; j++) {
              const [a, b] = [boxes[i]!, boxes[j]!];
              expect(a.left < b.right && b.left < a.right && a.top < b.bottom && b.top < a.bottom).toBe(false);
            }
        },
      ),
      { numRuns: 100 },
    );
  });
});
