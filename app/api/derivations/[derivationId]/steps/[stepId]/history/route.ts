// A step's review history: sign-offs and why they were cleared, remarks, resolutions.
import { z } from 'zod';
import { stepIdSchema } from '@/app/_lib/reviewSchemas';
import { idSchema } from '@/app/_lib/schemas';
import { derivationRoute } from '@/server/api/route';
import { stepHistory } from '@/server/review';

const params = z.object({ derivationId: idSchema, stepId: stepIdSchema });

export const GET = derivationRoute({ params, action: 'read' }, async ({ params }) => stepHistory(params.derivationId, params.stepId));
