// A reply in a remark thread.
import { z } from 'zod';
import { replySchema } from '@/app/_lib/reviewSchemas';
import { idSchema } from '@/app/_lib/schemas';
import { derivationRoute } from '@/server/api/route';
import { appOrigin } from '@/server/origin';
import { replyToThread } from '@/server/review';

const params = z.object({ derivationId: idSchema, threadId: idSchema });

export const POST = derivationRoute({ params, body: replySchema, action: 'remark', status: 201 }, async ({ req, params, body, user }) =>
  replyToThread({ derivationId: params.derivationId, threadId: params.threadId, user, body: body.body, origin: appOrigin(req.headers) }),
);
