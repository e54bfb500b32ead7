import { z } from 'zod';
import { idSchema } from '@/app/_lib/schemas';
import { groupRoute } from '@/server/api/route';
import { listMembers } from '@/server/groups';

const params = z.object({ groupId: idSchema });

export const GET = groupRoute({ params, action: 'read' }, async ({ params }) => ({
  members: await listMembers(params.groupId),
}));
