// Review of a derivation: its steps with their standing sign-offs, and every remark thread.
import { z } from 'zod';
import { idSchema } from '@/app/_lib/schemas';
import { derivationRoute } from '@/server/api/route';
import { reviewView } from '@/server/review';

const params = z.object({ derivationId: idSchema });

export const GET = derivationRoute({ params, action: 'read' }, async ({ params, access }) => reviewView(params.derivationId, access.role));
