// Resolve or reopen a remark thread.
import { z } from 'zod';
import { resolveSchema } from '@/app/_lib/reviewSchemas';
import { idSchema } from '@/app/_lib/schemas';
import { derivationRoute } from '@/server/api/route';
import { setThreadResolved } from '@/server/review';

const params = z.object({ derivationId: idSchema, threadId: idSchema });

export const PATCH = derivationRoute({ params, body: resolveSchema, action: 'resolveRemark' }, async ({ params, body, user }) =>
  setThreadResolved({ derivationId: params.derivationId, threadId: params.threadId, user, resolved: body.resolved }),
);
