import { z } from 'zod';
import { idSchema } from '@/app/_lib/schemas';
import { groupRoute } from '@/server/api/route';
import { datasetDownload } from '@/server/datasets/store';

const params = z.object({ groupId: idSchema, datasetId: idSchema });
const query = z.object({ original: z.enum(['1', 'true']).optional() });

/** The dataset as CSV (parsed columns), or with ?original=1 the file exactly as uploaded. */
export const GET = groupRoute({ params, query, action: 'read' }, async ({ params, query }) => {
  const file = await datasetDownload(params.groupId, params.datasetId, query.original !== undefined);
  return new Response(file.text, {
    headers: {
      'content-type': `${file.contentType}; charset=utf-8`,
      'content-disposition': `attachment; filename="${file.fileName.replace(/[^\x20-\x7e]|"/g, '_')}"; filename*=UTF-8''${encodeURIComponent(file.fileName)}`,
      'cache-control': 'no-store',
    },
  });
});
