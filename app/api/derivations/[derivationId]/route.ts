import { z } from 'zod';
import { derivationSchema, idSchema } from '@/app/_lib/schemas';
import { derivationRoute } from '@/server/api/route';
import { deleteDerivation, derivationView, renameDerivation } from '@/server/derivations';

const params = z.object({ derivationId: idSchema });

export const GET = derivationRoute({ params, action: 'read' }, async ({ params, access }) =>
  derivationView(params.derivationId, access.role),
);

export const PATCH = derivationRoute(
  { params, body: derivationSchema, action: 'renameDerivation' },
  async ({ params, body, user, access }) => {
    await renameDerivation(params.derivationId, access.groupId, user.id, body.title);
    return derivationView(params.derivationId, access.role);
  },
);

export const DELETE = derivationRoute({ params, action: 'deleteDerivation' }, async ({ params }) => {
  await deleteDerivation(params.derivationId);
});
