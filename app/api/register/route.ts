import { registerSchema } from '@/app/_lib/schemas';
import { route } from '@/server/api/route';
import { registerUser } from '@/server/users';

/** Creates an account (and joins the group of an invitation, when one comes along). */
export const POST = route({ auth: 'public', body: registerSchema, status: 201 }, async ({ body }) => {
  const user = await registerUser(body);
  return { id: user.id, email: user.email, name: user.name, joinedGroupId: user.joinedGroupId };
});
