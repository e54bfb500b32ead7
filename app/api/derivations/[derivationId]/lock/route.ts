// Locking the working copy as it stands (the lead): saved as a new version and locked, or 409 with the claims that do not hold.
import { z } from 'zod';
import { idSchema } from '@/app/_lib/schemas';
import { lockSchema } from '@/app/_lib/versionSchemas';
import { derivationRoute } from '@/server/api/route';
import { appOrigin } from '@/server/origin';
import { lockAnswer, lockVersion } from '@/server/versions';

const params = z.object({ derivationId: idSchema });

export const POST = derivationRoute({ params, body: lockSchema, action: 'lock' }, async ({ req, params, body, user }) =>
  lockAnswer(await lockVersion({ derivationId: params.derivationId, name: body.name, user, origin: appOrigin(req.headers) })),
);
