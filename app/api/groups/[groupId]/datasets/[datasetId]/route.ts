import { z } from 'zod';
import { idSchema } from '@/app/_lib/schemas';
import { groupRoute } from '@/server/api/route';
import { datasetDetail } from '@/server/datasets/store';

const params = z.object({ groupId: idSchema, datasetId: idSchema });

export const GET = groupRoute({ params, action: 'read' }, async ({ params }) => datasetDetail(params.groupId, params.datasetId));
