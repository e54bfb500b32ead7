import { route } from '@/server/api/route';
import { listGroupsOf } from '@/server/groups';
import { sinkInUse } from '@/server/mail';

export const dynamic = 'force-dynamic';

/** Who is signed in (or null), their groups, and whether the local mailbox is open. */
export const GET = route({ auth: 'optional' }, async ({ user }) => ({
  user,
  groups: user ? await listGroupsOf(user.id) : [],
  mailbox: sinkInUse(),
}));
