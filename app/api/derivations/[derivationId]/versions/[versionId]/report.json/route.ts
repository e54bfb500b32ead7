// A locked version's check report: exactly the bytes its SHA-256 covers.
import { z } from 'zod';
import { idSchema } from '@/app/_lib/schemas';
import { derivationRoute } from '@/server/api/route';
import { reportResponse, versionRow } from '@/server/versions';

const params = z.object({ derivationId: idSchema, versionId: idSchema });

export const GET = derivationRoute({ params, action: 'read' }, async ({ params }) => reportResponse(await versionRow(params.derivationId, params.versionId)));
