import { z } from 'zod';
import { idSchema } from '@/app/_lib/schemas';
import { groupRoute } from '@/server/api/route';
import { createDataset, listDatasets } from '@/server/datasets/store';
import { readDatasetForm, refusal } from '@/server/datasets/upload';

const params = z.object({ groupId: idSchema });

export const GET = groupRoute({ params, action: 'read' }, async ({ params }) => ({
  datasets: await listDatasets(params.groupId),
}));

// The body is a multipart form (file + JSON description), read by readDatasetForm with a byte cap.
export const POST = groupRoute({ params, action: 'uploadDataset', status: 201 }, async ({ req, params, user }) => {
  const form = await readDatasetForm(req);
  if (form instanceof Response) return form;
  const outcome = await createDataset(params.groupId, user.id, form.meta, form.file);
  if (!outcome.ok) return refusal(400, outcome.issues, outcome.issueCount, outcome.error);
  return Response.json(outcome.dataset, { status: 201, headers: { 'cache-control': 'no-store' } });
});
