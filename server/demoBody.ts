// The demo derivation's body (db/demoBody.ts) written into its document through the
// collaboration service, once, at a demo start: prose and formulas as the editor keeps them, the
// flow and claim blocks built by flow/document.ts, a trajectory plot in the plot block's layout.
// Runs after the background checks start (they hear the change and check it) and before the demo
// version and review, which read the body.
import { randomUUID } from 'node:crypto';
import { and, eq, isNull } from 'drizzle-orm';
import { getDb, schema } from '../db/client';
import { demoDerivationTitle } from '../db/demo';
import { demoBody, type DemoStep } from '../db/demoBody';
import { claimBlockNode, flowBlockNode, type DocNode } from '../flow/document';
import type { ClaimKind } from '../flow/types';
import { checksService } from './checks/access';
import { collab } from './collab/access';
import type { Service } from './extensions';
import { toYjsUpdate } from './latexImport/document';

/** Prose with $...$ as text and inline math nodes. */
function inline(text: string): DocNode[] {
  const nodes: DocNode[] = [];
  const parts = text.split(/\$([^$]+)\$/);
  parts.forEach((part, i) => {
    if (part === '') return;
    nodes.push(i % 2 === 1 ? { type: 'mathInline', content: [{ type: 'text', text: part }] } : { type: 'text', text: part });
  });
  return nodes;
}

/** The body as ProseMirror JSON in the editor's schema, each top-level block a step with its own id. */
export function demoBodyDocument(steps: readonly DemoStep[] = demoBody, newId: () => string = randomUUID): DocNode {
  const content: DocNode[] = steps.map((step): DocNode => {
    const stepId = newId();
    if ('heading' in step) return { type: 'heading', attrs: { stepId, level: 2 }, content: inline(step.heading) };
    if ('paragraph' in step) return { type: 'paragraph', attrs: { stepId }, content: inline(step.paragraph) };
    if ('display' in step) return { type: 'mathDisplay', attrs: { stepId }, content: [{ type: 'text', text: step.display }] };
    if ('claim' in step) return claimBlockNode(step.claim as { kind: ClaimKind; id: string }, { stepId, flow: step.flow ?? null });
    if ('flow' in step) {
      const { name, ...spec } = step.flow;
      return flowBlockNode(spec, { stepId, name });
    }
    const { caption, starts, ...settings } = step.plot;
    const field = (kind: 'caption' | 'start', text: string): DocNode => ({ type: 'plotField', attrs: { field: kind }, content: [{ type: 'text', text }] });
    return {
      type: 'trajectoryPlot',
      attrs: { stepId, flow: null, x: '', direction: 'ir', ...settings },
      content: [field('caption', caption), ...starts.map((start) => field('start', start))],
    };
  });
  return { type: 'doc', content };
}

async function demoDerivationId(): Promise<string | null> {
  const [row] = await getDb()
    .select({ id: schema.derivations.id })
    .from(schema.derivations)
    .where(and(eq(schema.derivations.title, demoDerivationTitle), isNull(schema.derivations.deletedAt)));
  return row?.id ?? null;
}

/** Writes the demo body into the demo derivation if its document was never written; returns whether it did. */
export async function writeDemoBody(): Promise<boolean> {
  const derivationId = await demoDerivationId();
  if (!derivationId) return false;
  const current = (await collab().readWorkingCopy(derivationId)) as DocNode;
  if ((current.content ?? []).length > 0) return false;
  await collab().applyUpdate(derivationId, toYjsUpdate(demoBodyDocument() as Parameters<typeof toYjsUpdate>[0]));
  // Store the verdicts now, so the derivations table and the parts after this one see them.
  await checksService()?.recheckNow(derivationId);
  return true;
}

export const demoBodyService: Service = {
  name: 'demo derivation body',
  async start(context) {
    if (!context.config.demo) return;
    try {
      await writeDemoBody();
    } catch (error) {
      console.error('demo: writing the demo derivation body failed:', error);
    }
  },
  stop() {},
};
