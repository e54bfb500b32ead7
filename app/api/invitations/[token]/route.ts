import { z } from 'zod';
import { route } from '@/server/api/route';
import { invitationByToken } from '@/server/invitations';

export const dynamic = 'force-dynamic';

const params = z.object({ token: z.string().min(1).max(200) });

/** What an invitation link offers; the token itself is the credential. */
export const GET = route({ auth: 'public', params }, async ({ params }) => invitationByToken(params.token));
