// The demo data's locked version and share link, made through the real lock: once the demo
// derivation's working copy has its claims (written by the demo body at start-up), version 1 is
// saved from it without the claims that do not hold (the demo keeps one failing claim in the
// working copy on purpose), locked by the demo lead (every claim re-checked on the server), and a
// share link to it is made. Its address is printed beside the demo accounts at every demo start
// (a token is shown once, so each start makes a fresh link).
import { and, eq, isNull } from 'drizzle-orm';
import * as Y from 'yjs';
import { demoAccounts, demoDerivationTitle } from '../../db/demo';
import { getDb, schema } from '../../db/client';
import { CLAIM_BLOCK } from '../../flow/document';
import { checksService } from '../checks/access';
import { collab } from '../collab/access';
import type { Service } from '../extensions';
import { startupNotes } from '../startupNotes';
import { lockVersion } from './lock';
import { createShareLink } from './shareLinks';
import { BODY_FIELD } from './snapshot';
import { listVersions, saveState } from './store';

async function demoIds(): Promise<{ derivationId: string; lead: { id: string; name: string } } | null> {
  const lead = demoAccounts.find((a) => a.role === 'lead')!;
  const [row] = await getDb()
    .select({ derivationId: schema.derivations.id, leadId: schema.users.id, leadName: schema.users.name })
    .from(schema.derivations)
    .innerJoin(schema.users, eq(schema.users.email, lead.email))
    .where(and(eq(schema.derivations.title, demoDerivationTitle), isNull(schema.derivations.deletedAt)));
  return row ? { derivationId: row.derivationId, lead: { id: row.leadId, name: row.leadName } } : null;
}

/** The working copy's state without the claim blocks whose steps are listed. */
function withoutSteps(state: Uint8Array, stepIds: ReadonlySet<string>): Uint8Array {
  const doc = new Y.Doc();
  try {
    Y.applyUpdate(doc, state);
    const body = doc.getXmlFragment(BODY_FIELD);
    doc.transact(() => {
      for (let i = body.length - 1; i >= 0; i--) {
        const child = body.get(i);
        if (child instanceof Y.XmlElement && child.nodeName === CLAIM_BLOCK && stepIds.has(String(child.getAttribute('stepId')))) body.delete(i, 1);
      }
    });
    return Y.encodeStateAsUpdate(doc);
  } finally {
    doc.destroy();
  }
}

async function makeDemoLock(origin: string): Promise<string | null> {
  const ids = await demoIds();
  const checks = checksService();
  if (!ids || !checks) return null;
  let locked = (await listVersions(ids.derivationId)).find((v) => v.locked);
  if (!locked) {
    const state = await collab().encodeState(ids.derivationId);
    const body = (await collab().readWorkingCopy(ids.derivationId)) as { content?: { type: string }[] };
    if (!(body.content ?? []).some((node) => node.type === CLAIM_BLOCK)) return null; // no demo body yet
    const check = await checks.checkDocument(body, { reuseFrom: ids.derivationId });
    const failing = new Set(check.claims.filter((c) => c.result.status !== 'holds').map((c) => c.stepId));
    const saved = await saveState(ids.derivationId, ids.lead.id, 'Before the one-loop cross-check', withoutSteps(state, failing));
    const outcome = await lockVersion({ derivationId: ids.derivationId, versionId: saved.id, user: ids.lead, origin });
    if (!outcome.locked) {
      console.warn(`demo: the demo version could not be locked: ${outcome.error}`);
      return null;
    }
    locked = outcome.version;
  }
  const { url } = await createShareLink({ derivationId: ids.derivationId, versionId: locked.id, userId: ids.lead.id, days: 30, note: 'demo share link (made at start-up)', origin });
  return `Share link to locked version ${locked.number} of the demo derivation (anyone, no sign-in): ${url}`;
}

export const versionsDemoService: Service = {
  name: 'demo locked version',
  async start(context) {
    if (!context.config.demo) return;
    try {
      const note = await makeDemoLock(context.origin);
      if (note) startupNotes.push(note);
    } catch (error) {
      console.error('demo: making the demo locked version failed:', error);
    }
  },
  stop() {},
};
