// One version: read it (every member), rename or remove it (authors, the lead); a locked version answers 409 to any change.
import { z } from 'zod';
import { idSchema } from '@/app/_lib/schemas';
import { renameVersionSchema } from '@/app/_lib/versionSchemas';
import { derivationRoute } from '@/server/api/route';
import { deleteVersion, renameVersion, versionDetail, versionRow } from '@/server/versions';

const params = z.object({ derivationId: idSchema, versionId: idSchema });

export const GET = derivationRoute({ params, action: 'read' }, async ({ params }) => {
  await versionRow(params.derivationId, params.versionId);
  return versionDetail(params.versionId);
});

export const PATCH = derivationRoute({ params, body: renameVersionSchema, action: 'saveVersion' }, async ({ params, body }) =>
  renameVersion(params.derivationId, params.versionId, body.name),
);

export const DELETE = derivationRoute({ params, action: 'saveVersion' }, async ({ params }) => {
  await deleteVersion(params.derivationId, params.versionId);
});
