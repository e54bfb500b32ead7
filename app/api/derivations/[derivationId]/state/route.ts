// The working copy's state as one Yjs update (Y.encodeStateAsUpdate, every accepted edit
// committed), read once by the derivation page while its code loads, so the text can show before
// the live connection has synced; the connection then merges whatever changed since.
import { z } from 'zod';
import { idSchema } from '@/app/_lib/schemas';
import { derivationRoute } from '@/server/api/route';
import { collab } from '@/server/collab/access';

const params = z.object({ derivationId: idSchema });

export const GET = derivationRoute({ params, action: 'read' }, async ({ params }) => {
  const state = await collab().encodeState(params.derivationId);
  return new Response(new Blob([state as Uint8Array<ArrayBuffer>]), {
    headers: { 'content-type': 'application/octet-stream', 'cache-control': 'no-store' },
  });
});
