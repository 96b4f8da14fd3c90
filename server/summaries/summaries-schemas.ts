import { z } from 'zod';
import { SUMMARY_STILLS_MAX, SUMMARY_TEXT_MAX } from '../../src/contracts/sharing';

const Text = (label: string) =>
  z.string(`${label} must be text.`).trim().max(SUMMARY_TEXT_MAX, `${label} must be at most ${SUMMARY_TEXT_MAX} characters.`);

/** `POST /api/assessments/:id/summaries`. */
export const SummaryCreateBody = z.strictObject({
  baselineAssessmentId: z.number('Baseline must be an assessment id.').int().positive().nullable().optional(),
  findings: Text('Findings'),
  planText: Text('Plan'),
  stillIds: z
    .array(z.number().int().positive(), 'Stills must be a list of still ids.')
    .max(SUMMARY_STILLS_MAX, `A visit summary can carry at most ${SUMMARY_STILLS_MAX} stills.`)
    .refine((ids) => new Set(ids).size === ids.length, 'Each still can appear only once.'),
});
