import { z } from 'zod';
import { ANNOTATION_LIMITS, EVENT_ORIGINS, GAIT_EVENT_KINDS, LANDMARK_ORIGINS, LANDMARKS } from '../../src/contracts/annotations';
import { SIDES } from '../../src/contracts/assessment';

const Fraction = z
  .number('Coordinates must be numbers.')
  .min(0, 'Points must lie inside the frame (0–1).')
  .max(1, 'Points must lie inside the frame (0–1).');
const FramePoint = z.strictObject({ x: Fraction, y: Fraction });
const Frame = z.number('Frame must be a number.').int('Frame must be a whole number.').min(0, 'Frame numbers start at 0.');

/** Angle gauge: all three points on the frame, both arms with length. */
const GaugePoint = z.strictObject(
  { x: Fraction, y: Fraction },
  'An angle gauge needs three points (a, vertex and b), each inside the frame.',
);
const Gauge = z
  .strictObject({
    id: z.string('A gauge needs an id.').regex(/^[A-Za-z0-9_-]{1,40}$/, 'A gauge id is 1–40 letters, digits, - or _.'),
    frame: Frame,
    a: GaugePoint,
    vertex: GaugePoint,
    b: GaugePoint,
  })
  .refine((g) => (g.a.x !== g.vertex.x || g.a.y !== g.vertex.y) && (g.b.x !== g.vertex.x || g.b.y !== g.vertex.y), {
    message: 'Both arms of an angle gauge need length: place the vertex apart from the two ends.',
    path: ['vertex'],
  });

/** A landmark point with where it came from (left out = placed by a person) and, if automatic, a confidence. */
const LandmarkPoint = z.strictObject({
  x: Fraction,
  y: Fraction,
  origin: z.enum(LANDMARK_ORIGINS, 'Origin is placed, followed, proposed or accepted.').optional(),
  confidence: z.number('Confidence must be a number.').min(0, 'Confidence is 0–1.').max(1, 'Confidence is 0–1.').optional(),
});

const Points = z.strictObject(
  Object.fromEntries(LANDMARKS.map((l) => [l, LandmarkPoint.optional()])) as Record<
    (typeof LANDMARKS)[number],
    z.ZodOptional<typeof LandmarkPoint>
  >,
);

export const AnnotationsBody = z
  .strictObject({
    baseRevision: z.number().int().min(0),
    landmarks: z
      .array(
        z.strictObject({
          frame: Frame,
          side: z.enum(SIDES, 'Side is left or right.'),
          points: Points,
          // Earlier clients sent how the whole row was made; its points count as placed or followed.
          source: z.enum(['manual', 'tracked']).optional(),
        }),
      )
      .max(ANNOTATION_LIMITS.landmarkFrames * 2, 'Too many landmark frames.'),
    events: z
      .array(
        z.strictObject({
          frame: Frame,
          side: z.enum(SIDES, 'Side is left or right.'),
          kind: z.enum(GAIT_EVENT_KINDS, 'Unknown gait event.'),
          origin: z.enum(EVENT_ORIGINS, 'An event comes from placed, proposed or accepted.').optional(),
        }),
      )
      .max(ANNOTATION_LIMITS.events, 'Too many gait events.'),
    scale: z
      .strictObject({
        frame: Frame,
        a: FramePoint,
        b: FramePoint,
        lengthM: z
          .number('Length must be a number.')
          .min(
            ANNOTATION_LIMITS.scaleLengthM.min,
            `The scale bar's length must be ${ANNOTATION_LIMITS.scaleLengthM.min}–${ANNOTATION_LIMITS.scaleLengthM.max} m.`,
          )
          .max(
            ANNOTATION_LIMITS.scaleLengthM.max,
            `The scale bar's length must be ${ANNOTATION_LIMITS.scaleLengthM.min}–${ANNOTATION_LIMITS.scaleLengthM.max} m.`,
          ),
      })
      .refine((s) => s.a.x !== s.b.x || s.a.y !== s.b.y, {
        message: 'The scale bar has zero length: drag from one end of the object to the other.',
        path: ['b'],
      })
      .nullable(),
    gauges: z.array(Gauge).max(ANNOTATION_LIMITS.gauges, 'Too many angle gauges.').default([]),
  })
  .superRefine((v, ctx) => {
    const seen = new Set<string>();
    v.landmarks.forEach((l, i) => {
      const key = `${l.frame}:${l.side}`;
      if (seen.has(key)) ctx.addIssue({ code: 'custom', path: ['landmarks', i], message: `Frame ${l.frame} (${l.side}) is listed twice.` });
      seen.add(key);
    });
    const events = new Set<string>();
    v.events.forEach((e, i) => {
      const key = `${e.frame}:${e.side}`;
      if (events.has(key))
        ctx.addIssue({ code: 'custom', path: ['events', i], message: `Two events on frame ${e.frame} for the ${e.side} side.` });
      events.add(key);
    });
    const ids = new Set<string>();
    v.gauges.forEach((g, i) => {
      if (ids.has(g.id)) ctx.addIssue({ code: 'custom', path: ['gauges', i, 'id'], message: `Angle gauge ${g.id} is listed twice.` });
      ids.add(g.id);
    });
  });
export type AnnotationsInput = z.output<typeof AnnotationsBody>;

/** Body of `POST /api/clips/:id/events/proposals`. */
export const EventProposalsBody = z.strictObject({
  baseRevision: z.number('baseRevision must be a number.').int().min(0),
});
