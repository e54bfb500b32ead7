// The shared locked version as a LaTeX article.
import { z } from 'zod';
import { route } from '@/server/api/route';
import { articleResponse, openShareLink, versionRow } from '@/server/versions';

const params = z.object({ token: z.string().max(200) });

export const GET = route({ params, auth: 'public' }, async ({ params }) => {
  const { version } = await openShareLink(params.token);
  return articleResponse(await versionRow(version.derivationId, version.id));
});
