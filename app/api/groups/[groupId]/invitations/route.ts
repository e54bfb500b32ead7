import { z } from 'zod';
import { idSchema, inviteSchema } from '@/app/_lib/schemas';
import { groupRoute } from '@/server/api/route';
import { inviteMember, listPendingInvitations } from '@/server/invitations';
import { appOrigin } from '@/server/origin';

const params = z.object({ groupId: idSchema });

export const GET = groupRoute({ params, action: 'invite' }, async ({ params }) => ({
  invitations: await listPendingInvitations(params.groupId),
}));

/** Invites an address with a role and mails the link. */
export const POST = groupRoute(
  { params, body: inviteSchema, status: 201, action: 'invite' },
  async ({ req, params, body, user }) =>
    inviteMember({ groupId: params.groupId, email: body.email, role: body.role, invitedBy: user, origin: appOrigin(req.headers) }),
);
