import { z } from 'zod';
import { idSchema } from '@/app/_lib/schemas';
import { groupRoute } from '@/server/api/route';
import { revokeInvitation } from '@/server/invitations';

const params = z.object({ groupId: idSchema, invitationId: idSchema });

/** Withdraws a pending invitation: its link stops working. */
export const DELETE = groupRoute({ params, action: 'invite' }, async ({ params }) => {
  await revokeInvitation(params.groupId, params.invitationId);
});
