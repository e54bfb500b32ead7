import { z } from 'zod';
import { route } from '@/server/api/route';
import { acceptInvitation } from '@/server/invitations';

const params = z.object({ token: z.string().min(1).max(200) });

export const POST = route({ params }, async ({ params, user }) => acceptInvitation(params.token, user));
