// The shared locked version's snapshot bytes.
import { z } from 'zod';
import { route } from '@/server/api/route';
import { openShareLink, snapshotResponse, versionRow } from '@/server/versions';

const params = z.object({ token: z.string().max(200) });

export const GET = route({ params, auth: 'public' }, async ({ params }) => {
  const { version } = await openShareLink(params.token);
  return snapshotResponse(await versionRow(version.derivationId, version.id));
});
