import { z } from 'zod';
import { route } from '@/server/api/route';
import { listMail } from '@/server/mailbox';

export const dynamic = 'force-dynamic';

const query = z.object({
  to: z.string().max(254).optional(),
  limit: z.coerce.number().int().min(1).max(500).default(100),
});

/** The local sink's messages, newest first; 404 when mail goes out through SMTP. */
export const GET = route({ auth: 'public', query }, async ({ query }) => ({ messages: await listMail(query) }));
