// Locking a saved version (the lead): 200 with the locked version, or 409 with the claims that do not hold.
import { z } from 'zod';
import { idSchema } from '@/app/_lib/schemas';
import { derivationRoute } from '@/server/api/route';
import { appOrigin } from '@/server/origin';
import { lockAnswer, lockVersion } from '@/server/versions';

const params = z.object({ derivationId: idSchema, versionId: idSchema });

export const POST = derivationRoute({ params, action: 'lock' }, async ({ req, params, user }) =>
  lockAnswer(await lockVersion({ derivationId: params.derivationId, versionId: params.versionId, user, origin: appOrigin(req.headers) })),
);
