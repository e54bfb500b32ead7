// The derivation's versions: the history (every member), saving the working copy as a named version (authors, the lead).
import { z } from 'zod';
import { idSchema } from '@/app/_lib/schemas';
import { saveVersionSchema } from '@/app/_lib/versionSchemas';
import { derivationRoute } from '@/server/api/route';
import { listVersions, saveVersion } from '@/server/versions';

const params = z.object({ derivationId: idSchema });

export const GET = derivationRoute({ params, action: 'read' }, async ({ params }) => ({ versions: await listVersions(params.derivationId) }));

export const POST = derivationRoute({ params, body: saveVersionSchema, action: 'saveVersion', status: 201 }, async ({ params, body, user }) =>
  saveVersion(params.derivationId, user.id, body.name),
);
