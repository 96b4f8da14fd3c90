import { z } from 'zod';
import { CLIP_CAPTION_MAX, SLOW_MOTION_FACTORS } from '../../src/contracts/annotated-clips';

const FrameIndex = z.number('Frame must be a number.').int('Frame must be a whole number.').min(0, 'Frame cannot be negative.');
const Caption = z.string('Caption must be text.').trim().max(CLIP_CAPTION_MAX, `Caption must be at most ${CLIP_CAPTION_MAX} characters.`);
const Factor = z.union(
  SLOW_MOTION_FACTORS.map((f) => z.literal(f)),
  'Choose a speed of 1, 1/2, 1/4 or 1/8 of real time.',
);
const ClipId = z.number('Clip must be an id.').int('Clip must be an id.').positive('Clip must be an id.');

/** `POST /api/clips/:id/annotated-clips`. */
export const AnnotatedClipCreateBody = z.strictObject({
  fromFrame: FrameIndex,
  toFrame: FrameIndex,
  factor: Factor,
  caption: Caption.default(''),
  showAngles: z.boolean('Show angles must be true or false.').default(true),
});

/** `POST /api/athletes/:id/side-by-side-clips`. */
export const SideBySideClipCreateBody = z.strictObject({
  baselineClipId: ClipId,
  retestClipId: ClipId,
  fromFrame: FrameIndex.optional(),
  toFrame: FrameIndex.optional(),
  factor: Factor,
  caption: Caption.default(''),
  showAngles: z.boolean('Show angles must be true or false.').default(true),
});
