import { z } from 'zod';
import { RouteId, RouteIndex } from '../http/validate';
import { CAPTURE_FPS_LIMITS, DIRECTIONS, SIDES } from '../../src/contracts/assessment';

export const ClipPatchBody = z
  .strictObject({
    nearSide: z.enum(SIDES, 'Near side is left or right.'),
    direction: z.enum(DIRECTIONS, 'Choose the running direction.'),
    captureFps: z
      .number('Capture frame rate must be a number.')
      .min(CAPTURE_FPS_LIMITS.min, `Capture frame rate must be ${CAPTURE_FPS_LIMITS.min}–${CAPTURE_FPS_LIMITS.max}.`)
      .max(CAPTURE_FPS_LIMITS.max, `Capture frame rate must be ${CAPTURE_FPS_LIMITS.min}–${CAPTURE_FPS_LIMITS.max}.`)
      .nullable(),
  })
  .partial();
export type ClipPatch = z.output<typeof ClipPatchBody>;

/** `:id` plus a 0-based frame or thumbnail number. */
export const MediaIndexParams = z.object({
  id: RouteId,
  n: RouteIndex(10_000_000),
});
