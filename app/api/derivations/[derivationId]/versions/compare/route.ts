// Two versions (or a version and the working copy) compared: steps added, removed, changed, and claims whose verdict changed.
import { z } from 'zod';
import { idSchema } from '@/app/_lib/schemas';
import { compareQuerySchema } from '@/app/_lib/versionSchemas';
import { derivationRoute } from '@/server/api/route';
import { compareVersions } from '@/server/versions';

const params = z.object({ derivationId: idSchema });

export const GET = derivationRoute({ params, query: compareQuerySchema, action: 'read' }, async ({ params, query }) =>
  compareVersions(params.derivationId, query.from, query.to),
);
