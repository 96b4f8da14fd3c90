import { z } from 'zod';
import { RETENTION_MAX_MONTHS } from '../../src/contracts/privacy';

export const ErasureBody = z.strictObject({ confirmName: z.string().max(200) });

export const ClipErasureBody = z.strictObject({ confirm: z.literal(true, { error: 'Confirm that the clips are to be erased.' }) });

export const RetentionBody = z.strictObject({
  months: z
    .number()
    .int('Whole months only.')
    .min(1, 'At least 1 month, or off.')
    .max(RETENTION_MAX_MONTHS, `At most ${RETENTION_MAX_MONTHS} months.`)
    .nullable(),
});
