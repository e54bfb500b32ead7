// The server's latest verdicts on a derivation's claims (from the background re-check after
// edits), and a way to check the working copy now.
import { z } from 'zod';
import { idSchema } from '@/app/_lib/schemas';
import { ApiError } from '@/server/api/errors';
import { derivationRoute } from '@/server/api/route';
import { checksService } from '@/server/checks/access';
import { checksView } from '@/server/checks/results';

const params = z.object({ derivationId: idSchema });

async function answer(derivationId: string) {
  const view = await checksView(derivationId);
  return { ...view, pending: checksService()?.isPending(derivationId) ?? false };
}

export const GET = derivationRoute({ params, action: 'read' }, async ({ params }) => answer(params.derivationId));

/** Checks the working copy now and answers with the stored result once it is done. */
export const POST = derivationRoute({ params, action: 'recordChecks' }, async ({ params }) => {
  const service = checksService();
  if (!service) throw new ApiError(503, 'The background checks are not running on this server.');
  await service.recheckNow(params.derivationId);
  return answer(params.derivationId);
});
