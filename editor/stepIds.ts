// Every top-level block of the body is a step with a stable, unique `stepId` (remarks, sign-offs
// and imports refer to steps by it). After each local change, blocks without an id get one, and
// where an id appears twice (a paste, a split) the block that was already there keeps it.
// Changes arriving from other authors are left alone: their editor does the same on their side.
import { Extension } from '@tiptap/core';
import type { Node as ProseMirrorNode } from '@tiptap/pm/model';
import { Plugin, PluginKey } from '@tiptap/pm/state';
import { isChangeOrigin } from '@tiptap/extension-collaboration';
import { uuidv4 } from 'lib0/random';

export const stepIdAttribute = 'stepId';

export function newStepId(): string {
  return uuidv4();
}

/** The positions and new ids of top-level blocks that need one; empty when all is well. */
export function missingOrDuplicateStepIds(doc: ProseMirrorNode, before: ProseMirrorNode | null): { pos: number; id: string }[] {
  const untouched = new Set<ProseMirrorNode>();
  before?.forEach((node) => untouched.add(node));
  const blocks: { node: ProseMirrorNode; pos: number; id: string | null }[] = [];
  doc.forEach((node, pos) => {
    const id = node.attrs[stepIdAttribute];
    blocks.push({ node, pos, id: typeof id === 'string' && id ? id : null });
  });
  const keeper = new Map<string, ProseMirrorNode>();
  for (const block of blocks) {
    if (!block.id) continue;
    const kept = keeper.get(block.id);
    // The block the change did not touch keeps the id; otherwise the first one does.
    if (!kept || (!untouched.has(kept) && untouched.has(block.node))) keeper.set(block.id, block.node);
  }
  const fixes: { pos: number; id: string }[] = [];
  for (const block of blocks) {
    if (!(stepIdAttribute in block.node.attrs)) continue;
    if (!block.id || keeper.get(block.id) !== block.node) fixes.push({ pos: block.pos, id: newStepId() });
  }
  return fixes;
}

export const StepIds = Extension.create({
  name: 'stepIds',

  addGlobalAttributes() {
    return [
      {
        types: 'nodes',
        attributes: {
          [stepIdAttribute]: {
            default: null,
            keepOnSplit: false,
            parseHTML: (element) => element.getAttribute('data-step-id'),
            renderHTML: (attributes) => (attributes[stepIdAttribute] ? { 'data-step-id': attributes[stepIdAttribute] } : {}),
          },
        },
      },
    ];
  },

  addProseMirrorPlugins() {
    return [
      new Plugin({
        key: new PluginKey('stepIds'),
        appendTransaction: (transactions, oldState, newState) => {
          if (!transactions.some((tr) => tr.docChanged && !isChangeOrigin(tr))) return null;
          const fixes = missingOrDuplicateStepIds(newState.doc, oldState.doc);
          if (fixes.length === 0) return null;
          const tr = newState.tr;
          for (const fix of fixes) tr.setNodeAttribute(fix.pos, stepIdAttribute, fix.id);
          return tr;
        },
      }),
    ];
  },
});
