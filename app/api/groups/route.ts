import { groupSchema } from '@/app/_lib/schemas';
import { route } from '@/server/api/route';
import { createGroup, listGroupsOf } from '@/server/groups';

export const GET = route({}, async ({ user }) => ({ groups: await listGroupsOf(user.id) }));

/** Anyone signed in may start a group; they become its lead. */
export const POST = route({ body: groupSchema, status: 201 }, async ({ user, body }) => createGroup(user.id, body));
