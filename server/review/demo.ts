// Review in the demo data, through the real review code: the demo reviewer's remark thread (with
// the author's reply) on the derivation's first quantitative step, a resolved thread on a line of
// prose, and the reviewer's sign-off of a claim that holds. Invented, like all demo data.
import { and, asc, eq, isNull } from 'drizzle-orm';
import { getDb, schema } from '../../db/client';
import { demoAccounts, demoDerivationTitle } from '../../db/demo';
import type { MemberRole } from '../../db/schema';
import { checksService } from '../checks/access';
import type { Service } from '../extensions';
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

/** The demo review, once the demo derivation has its body and its checks have run (in the background). */
async function addDemoReviewWhenChecked(origin: string): Promise<void> {
  const [derivation] = await getDb()
    .select({ id: schema.derivations.id })
    .from(schema.derivations)
    .where(and(eq(schema.derivations.title, demoDerivationTitle), isNull(schema.derivations.deletedAt)));
  if (!derivation) return;
  await checksService()?.whenSettled(derivation.id);
  if (stopping) return;
  // The reviewer signs off a claim the server found holding (the demo keeps one failing on purpose).
  const [holding] = await getDb()
    .select({ stepId: schema.claimChecks.stepId })
    .from(schema.claimChecks)
    .where(and(eq(schema.claimChecks.derivationId, derivation.id), eq(schema.claimChecks.status, 'holds')))
    .orderBy(asc(schema.claimChecks.position))
    .limit(1);
  if (stopping) return;
  writing = addDemoReview({ derivationId: derivation.id, origin, holdingClaimStepId: holding?.stepId }).then(() => undefined);
  await writing;
}

let stopping = false;
/** The demo review's writes, once begun (a stop waits for them, not for the checks before them). */
let writing: Promise<void> | null = null;

export const reviewDemoService: Service = {
  name: 'demo review',
  start(context) {
    if (!context.config.demo) return;
    stopping = false;
    // Not awaited: the server is ready before the demo's checks have run.
    void addDemoReviewWhenChecked(context.origin).catch((error: unknown) => console.error('demo: adding the demo review failed:', error));
  },
  async stop() {
    stopping = true;
    await writing?.catch(() => undefined);
    writing = null;
  },
};
