import { z } from 'zod';

const Frame = z.number('Frame must be a number.').int('Frame must be a whole number.').min(0, 'Frame numbers start at 0.');

/** Body of `POST /api/clips/:id/follow`. */
export const FollowMarkersBody = z
  .strictObject({ startFrame: Frame, from: Frame, to: Frame })
  .refine((b) => b.from <= b.startFrame && b.startFrame <= b.to, {
    message: 'The start frame must lie inside the range to follow (from ≤ start frame ≤ to).',
    path: ['startFrame'],
  })
  .refine((b) => b.from < b.to, { message: 'Follow over at least two frames.', path: ['to'] });
