// The shared locked version's check report (the bytes its SHA-256 covers).
import { z } from 'zod';
import { route } from '@/server/api/route';
import { openShareLink, reportResponse, versionRow } from '@/server/versions';

const params = z.object({ token: z.string().max(200) });

export const GET = route({ params, auth: 'public' }, async ({ params }) => {
  const { version } = await openShareLink(params.token);
  return reportResponse(await versionRow(version.derivationId, version.id));
});
