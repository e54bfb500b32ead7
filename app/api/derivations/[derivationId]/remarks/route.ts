// A new remark thread on a step of the derivation.
import { z } from 'zod';
import { newRemarkSchema } from '@/app/_lib/reviewSchemas';
import { idSchema } from '@/app/_lib/schemas';
import { derivationRoute } from '@/server/api/route';
import { appOrigin } from '@/server/origin';
import { startThread } from '@/server/review';

const params = z.object({ derivationId: idSchema });

export const POST = derivationRoute({ params, body: newRemarkSchema, action: 'remark', status: 201 }, async ({ req, params, body, user }) =>
  startThread({ derivationId: params.derivationId, user, stepId: body.stepId, body: body.body, origin: appOrigin(req.headers) }),
);
