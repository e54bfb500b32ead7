// A share link's locked version, for anyone holding the link (signed in or not): 404 unknown, 410 expired or revoked.
import { z } from 'zod';
import { route } from '@/server/api/route';
import { openShareLink } from '@/server/versions';

const params = z.object({ token: z.string().max(200) });

export const GET = route({ params, auth: 'public' }, async ({ params }) => {
  const { version, expiresAt } = await openShareLink(params.token);
  return { version, expiresAt };
});
