// Input rules of review (remarks, replies, resolving, sign-offs), shared by the routes and the forms.
import { z } from 'zod';

export const MAX_REMARK = 5000;

export const stepIdSchema = z
  .string({ message: 'Say which step (stepId).' })
  .trim()
  .min(1, 'Say which step (stepId).')
  .max(100, 'That is not a step id.');

export const remarkBodySchema = z
  .string({ message: 'Write the remark first.' })
  .trim()
  .min(1, 'Write the remark first.')
  .max(MAX_REMARK, `Keep a remark to at most ${MAX_REMARK} characters.`);

export const newRemarkSchema = z.object({ stepId: stepIdSchema, body: remarkBodySchema });
export const replySchema = z.object({ body: remarkBodySchema });
export const resolveSchema = z.object({ resolved: z.boolean({ message: 'Say whether the thread is resolved (true or false).' }) });
export const signOffSchema = z.object({
  stepId: stepIdSchema,
  contentHash: z
    .string()
    .regex(/^[0-9a-f]{64}$/, 'contentHash must be the step hash the review view gave (64 hex digits).')
    .optional(),
});
