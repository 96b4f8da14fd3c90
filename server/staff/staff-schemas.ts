import { z } from 'zod';

/** `POST /api/staff/:id/deactivate`: who takes the coach's athletes (default: the owner acting). */
export const DeactivateBody = z.strictObject({
  reassignTo: z.number({ error: 'Choose who takes over the athletes.' }).int().positive().optional(),
});
