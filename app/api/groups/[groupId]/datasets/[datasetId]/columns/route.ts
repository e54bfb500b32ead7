import { z } from 'zod';
import { idSchema } from '@/app/_lib/schemas';
import { groupRoute } from '@/server/api/route';
import { datasetSeries } from '@/server/datasets/store';

const params = z.object({ groupId: idSchema, datasetId: idSchema });

/** The x, y and error-bar columns, for plots and fits. */
export const GET = groupRoute({ params, action: 'read' }, async ({ params }) => datasetSeries(params.groupId, params.datasetId));
