import { z } from 'zod';
import { idSchema } from '@/app/_lib/schemas';
import { route } from '@/server/api/route';
import { mailById } from '@/server/mailbox';

export const dynamic = 'force-dynamic';

const params = z.object({ messageId: idSchema });

export const GET = route({ auth: 'public', params }, async ({ params }) => mailById(params.messageId));
