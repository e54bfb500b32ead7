import { z } from 'zod';
import { idSchema, roleChangeSchema } from '@/app/_lib/schemas';
import { groupRoute } from '@/server/api/route';
import { changeRole, listMembers, removeMember } from '@/server/groups';

const params = z.object({ groupId: idSchema, userId: idSchema });

export const PATCH = groupRoute(
  { params, body: roleChangeSchema, action: 'changeRole' },
  async ({ params, body }) => {
    await changeRole(params.groupId, params.userId, body.role);
    return { members: await listMembers(params.groupId) };
  },
);

export const DELETE = groupRoute({ params, action: 'removeMember' }, async ({ params }) => {
  await removeMember(params.groupId, params.userId);
  return { members: await listMembers(params.groupId) };
});
