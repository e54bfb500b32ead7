// Share links of a locked version (the lead): the list, and a new link (its address is in the answer once).
import { z } from 'zod';
import { idSchema } from '@/app/_lib/schemas';
import { shareLinkSchema } from '@/app/_lib/versionSchemas';
import { derivationRoute } from '@/server/api/route';
import { appOrigin } from '@/server/origin';
import { createShareLink, listShareLinks, versionRow } from '@/server/versions';

const params = z.object({ derivationId: idSchema, versionId: idSchema });

export const GET = derivationRoute({ params, action: 'shareLink' }, async ({ params }) => {
  await versionRow(params.derivationId, params.versionId);
  return { links: await listShareLinks(params.versionId) };
});

export const POST = derivationRoute({ params, body: shareLinkSchema, action: 'shareLink', status: 201 }, async ({ req, params, body, user }) =>
  createShareLink({ derivationId: params.derivationId, versionId: params.versionId, userId: user.id, days: body.days, note: body.note, origin: appOrigin(req.headers) }),
);
