import { z } from 'zod';
import { idSchema } from '@/app/_lib/schemas';
import { derivationRoute } from '@/server/api/route';
import { datasetSeries } from '@/server/datasets/store';

const params = z.object({ derivationId: idSchema, datasetId: idSchema });

/** A dataset's x, y and error bars, through a derivation of its group (any other group's dataset is 404). */
export const GET = derivationRoute({ params, action: 'read' }, async ({ params, access }) => datasetSeries(access.groupId, params.datasetId));
