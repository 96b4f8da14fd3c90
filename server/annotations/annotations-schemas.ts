import { z } from 'zod';
import { ANNOTATION_LIMITS, GAIT_EVENT_KINDS, LANDMARKS } from '../../src/contracts/annotations';
import { SIDES } from '../../src/contracts/assessment';

const Fraction = z
  .number('Coordinates must be numbers.')
  .min(0, 'Points must lie inside the frame (0–1).')
  .max(1, 'Points must lie inside the frame (0–1).');
const FramePoint = z.strictObject({ x: Fraction, y: Fraction });
const Frame = z.number('Frame must be a number.').int('Frame must be a whole number.').min(0, 'Frame numbers start at 0.');

const Points = z.strictObject(Object.fromEntries(LANDMARKS.map((l) => [l, FramePoint.optional()])) as Record<(typeof LANDMARKS)[number], z.ZodOptional<typeof FramePoint>>);

export const AnnotationsBody = z
  .strictObject({
    baseRevision: z.number().int().min(0),
    landmarks: z
      .array(
        z.strictObject({
          frame: Frame,
          side: z.enum(SIDES, 'Side is left or right.'),
          points: Points,
          source: z.enum(['manual', 'tracked']).optional(),
        }),
      )
      .max(ANNOTATION_LIMITS.landmarkFrames * 2, 'Too many landmark frames.'),
    events: z
      .array(z.strictObject({ frame: Frame, side: z.enum(SIDES, 'Side is left or right.'), kind: z.enum(GAIT_EVENT_KINDS, 'Unknown gait event.') }))
      .max(ANNOTATION_LIMITS.events, 'Too many gait events.'),
    scale: z
      .strictObject({
        frame: Frame,
        a: FramePoint,
        b: FramePoint,
        lengthM: z
          .number('Length must be a number.')
          .min(ANNOTATION_LIMITS.scaleLengthM.min, `The scale bar's length must be ${ANNOTATION_LIMITS.scaleLengthM.min}–${ANNOTATION_LIMITS.scaleLengthM.max} m.`)
          .max(ANNOTATION_LIMITS.scaleLengthM.max, `The scale bar's length must be ${ANNOTATION_LIMITS.scaleLengthM.min}–${ANNOTATION_LIMITS.scaleLengthM.max} m.`),
      })
      .refine((s) => s.a.x !== s.b.x || s.a.y !== s.b.y, { message: 'The scale bar has zero length: drag from one end of the object to the other.', path: ['b'] })
      .nullable(),
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
      if (events.has(key)) ctx.addIssue({ code: 'custom', path: ['events', i], message: `Two events on frame ${e.frame} for the ${e.side} side.` });
      events.add(key);
    });
  });
export type AnnotationsInput = z.output<typeof AnnotationsBody>;
