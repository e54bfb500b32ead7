import { z } from 'zod';
import { idSchema } from '@/app/_lib/schemas';
import { derivationRoute } from '@/server/api/route';
import { listDatasets } from '@/server/datasets/store';

const params = z.object({ derivationId: idSchema });

/** The datasets of the derivation's group, for a block that attaches one (the editor knows its derivation, not its group). */
export const GET = derivationRoute({ params, action: 'read' }, async ({ access }) => ({
  groupId: access.groupId,
  datasets: await listDatasets(access.groupId),
}));
