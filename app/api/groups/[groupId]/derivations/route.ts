import { z } from 'zod';
import { derivationSchema, idSchema } from '@/app/_lib/schemas';
import { groupRoute } from '@/server/api/route';
import { createDerivation, listDerivations } from '@/server/derivations';

const params = z.object({ groupId: idSchema });

export const GET = groupRoute({ params, action: 'read' }, async ({ params }) => ({
  derivations: await listDerivations(params.groupId),
}));

export const POST = groupRoute(
  { params, body: derivationSchema, status: 201, action: 'createDerivation' },
  async ({ params, body, user }) => createDerivation(params.groupId, user.id, body.title),
);
