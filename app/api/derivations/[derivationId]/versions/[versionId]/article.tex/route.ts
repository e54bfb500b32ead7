// A locked version as a LaTeX article: text and math, each claim marked with its verdict, the check report and hash in an appendix.
import { z } from 'zod';
import { idSchema } from '@/app/_lib/schemas';
import { derivationRoute } from '@/server/api/route';
import { articleResponse, versionRow } from '@/server/versions';

const params = z.object({ derivationId: idSchema, versionId: idSchema });

export const GET = derivationRoute({ params, action: 'read' }, async ({ params }) => articleResponse(await versionRow(params.derivationId, params.versionId)));
