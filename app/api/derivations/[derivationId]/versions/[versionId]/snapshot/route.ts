// The version's snapshot bytes (Y.encodeStateAsUpdate), e.g. to recompute a locked version's SHA-256.
import { z } from 'zod';
import { idSchema } from '@/app/_lib/schemas';
import { derivationRoute } from '@/server/api/route';
import { snapshotResponse, versionRow } from '@/server/versions';

const params = z.object({ derivationId: idSchema, versionId: idSchema });

export const GET = derivationRoute({ params, action: 'read' }, async ({ params }) => snapshotResponse(await versionRow(params.derivationId, params.versionId)));
