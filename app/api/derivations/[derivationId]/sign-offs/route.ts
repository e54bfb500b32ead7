// Sign off a step as checked (the server records what the step and its flow block say now).
import { z } from 'zod';
import { signOffSchema } from '@/app/_lib/reviewSchemas';
import { idSchema } from '@/app/_lib/schemas';
import { derivationRoute } from '@/server/api/route';
import { signOffStep } from '@/server/review';

const params = z.object({ derivationId: idSchema });

export const POST = derivationRoute({ params, body: signOffSchema, action: 'signOff', status: 201 }, async ({ params, body, user }) =>
  signOffStep({ derivationId: params.derivationId, user, stepId: body.stepId, contentHash: body.contentHash }),
);
