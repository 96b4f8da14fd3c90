import { z } from 'zod';
import { CAPTION_MAX } from '../../src/contracts/sharing';

const FrameIndex = z.number('Frame must be a number.').int('Frame must be a whole number.').min(0, 'Frame cannot be negative.');
const Caption = z.string('Caption must be text.').trim().max(CAPTION_MAX, `Caption must be at most ${CAPTION_MAX} characters.`);

/** `POST /api/clips/:id/stills`. */
export const StillCreateBody = z.strictObject({
  frameIndex: FrameIndex,
  caption: Caption,
  showAngles: z.boolean('Show angles must be true or false.').default(true),
  pairWith: z
    .strictObject({ clipId: z.number().int().positive('Pair clip must be an id.'), frameIndex: FrameIndex })
    .nullable()
    .optional(),
});

/** `PATCH /api/stills/:id`. */
export const StillUpdateBody = z.strictObject({ caption: Caption });
