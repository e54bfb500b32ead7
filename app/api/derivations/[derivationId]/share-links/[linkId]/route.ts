// Revoking a share link (the lead): from then on it answers 410.
import { z } from 'zod';
import { idSchema } from '@/app/_lib/schemas';
import { derivationRoute } from '@/server/api/route';
import { revokeShareLink } from '@/server/versions';

const params = z.object({ derivationId: idSchema, linkId: idSchema });

export const DELETE = derivationRoute({ params, action: 'shareLink' }, async ({ params, user }) =>
  revokeShareLink({ derivationId: params.derivationId, linkId: params.linkId, userId: user.id }),
);
