// Review in the demo data, through the real review code: the demo reviewer's remark thread (with
// the author's reply) on the derivation's first quantitative step, a resolved thread on a line of
// prose, and the reviewer's sign-off of a claim that holds. Invented, like all demo data.
import { eq } from 'drizzle-orm';
import { getDb, schema } from '../../db/client';
import { demoAccounts } from '../../db/demo';
import type { MemberRole } from '../../db/schema';
import type { SessionUser } from '../session';
import { replyToThread, setThreadResolved, startThread } from './remarks';
import { readWorkingSteps, signOffStep } from './signOffs';

async function demoUser(role: MemberRole): Promise<SessionUser | null> {
  const account = demoAccounts.find((a) => a.role === role);
  if (!account) return null;
  const [user] = await getDb().select({ id: schema.users.id, email: schema.users.email, name: schema.users.name }).from(schema.users).where(eq(schema.users.email, account.email));
  return user ?? null;
}

/**
 * Adds the demo review to a derivation that has a body and no remarks yet. `holdingClaimStepId`:
 * a claim step that holds (signed off); otherwise the first claim block is.
 */
export async function addDemoReview(input: { derivationId: string; origin: string; holdingClaimStepId?: string }): Promise<{ threads: number; signOffs: number }> {
  const [existing] = await getDb().select({ id: schema.remarkThreads.id }).from(schema.remarkThreads).where(eq(schema.remarkThreads.derivationId, input.derivationId)).limit(1);
  if (existing) return { threads: 0, signOffs: 0 };
  const reviewer = await demoUser('reviewer');
  const author = await demoUser('author');
  if (!reviewer || !author) return { threads: 0, signOffs: 0 };
  const steps = [...(await readWorkingSteps(input.derivationId)).values()].sort((a, b) => a.position - b.position);
  const flow = steps.find((s) => s.type === 'flowBlock');
  const claims = steps.filter((s) => s.type === 'claimBlock');
  const prose = steps.find((s) => s.type === 'paragraph' && s.excerpt.length > 40);
  const signed = steps.find((s) => s.stepId === input.holdingClaimStepId) ?? claims[0];

  let threads = 0;
  const asked = flow ?? claims[0];
  if (asked) {
    const thread = await startThread({
      derivationId: input.derivationId,
      user: reviewer,
      stepId: asked.stepId,
      body: 'Is the two-loop coefficient of the beta function written for the chain (n = 0) already, or for general n? The (3n + 14) term suggests general n.',
      origin: input.origin,
    });
    await replyToThread({
      derivationId: input.derivationId,
      threadId: thread.id,
      user: author,
      body: 'General n: the chain is the parameter n = 0 set in the block, so every claim below reads it at n = 0.',
      origin: input.origin,
    });
    threads++;
  }
  if (prose) {
    const thread = await startThread({
      derivationId: input.derivationId,
      user: reviewer,
      stepId: prose.stepId,
      body: 'Say once which lattice the walks live on; the amplitude depends on it, the exponents do not.',
      origin: input.origin,
    });
    await setThreadResolved({ derivationId: input.derivationId, threadId: thread.id, user: author, resolved: true });
    threads++;
  }
  let signOffs = 0;
  if (signed) {
    await signOffStep({ derivationId: input.derivationId, user: reviewer, stepId: signed.stepId });
    signOffs++;
  }
  return { threads, signOffs };
}
