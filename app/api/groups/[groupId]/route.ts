import { z } from 'zod';
import { groupUpdateSchema, idSchema } from '@/app/_lib/schemas';
import { groupRoute } from '@/server/api/route';
import { groupView, updateGroup } from '@/server/groups';

const params = z.object({ groupId: idSchema });

export const GET = groupRoute({ params, action: 'read' }, async ({ params, access }) =>
  groupView(params.groupId, access.role),
);

export const PATCH = groupRoute(
  { params, body: groupUpdateSchema, action: 'manageGroup' },
  async ({ params, body, access }) => {
    await updateGroup(params.groupId, body);
    return groupView(params.groupId, access.role);
  },
);
