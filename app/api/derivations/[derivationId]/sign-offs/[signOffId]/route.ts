// Withdraw your own sign-off (it stays in the step's history).
import { z } from 'zod';
import { idSchema } from '@/app/_lib/schemas';
import { derivationRoute } from '@/server/api/route';
import { withdrawSignOff } from '@/server/review';

const params = z.object({ derivationId: idSchema, signOffId: idSchema });

export const DELETE = derivationRoute({ params, action: 'signOff' }, async ({ params, user }) => {
  await withdrawSignOff(params.derivationId, params.signOffId, user);
});
