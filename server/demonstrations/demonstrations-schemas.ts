import { z } from 'zod';
import { DEMO_LIMITS } from '../../src/contracts/demonstrations';

const caption = z
  .string('Give the caption as text.')
  .trim()
  .max(DEMO_LIMITS.caption, `Caption: at most ${DEMO_LIMITS.caption} characters.`)
  .refine((s) => !/[\r\n]/.test(s), 'Caption: one line only.');

/** The text fields sent beside a picture upload. */
export const PictureUploadFields = z.object({ caption: caption.optional().default('') });

/** Body of PATCH /api/demo-pictures/:id. */
export const DemoPictureUpdateBody = z
  .strictObject({
    caption: caption.optional(),
    position: z
      .number('Give the place as a number.')
      .int('The place is a whole number.')
      .min(0, 'The first place is 0.')
      .max(DEMO_LIMITS.pictures - 1, `The last place is ${DEMO_LIMITS.pictures - 1}.`)
      .optional(),
  })
  .refine((b) => b.caption !== undefined || b.position !== undefined, 'Send a caption or a position.');

/** Body of PATCH /api/demo-clips/:id (its place among the pictures: 0 = first, {@link DEMO_LIMITS.pictures} = last). */
export const DemoClipUpdateBody = z
  .strictObject({
    caption: caption.optional(),
    position: z
      .number('Give the place as a number.')
      .int('The place is a whole number.')
      .min(0, 'The first place is 0.')
      .max(DEMO_LIMITS.pictures, `The last place is ${DEMO_LIMITS.pictures}.`)
      .optional(),
  })
  .refine((b) => b.caption !== undefined || b.position !== undefined, 'Send a caption or a position.');
