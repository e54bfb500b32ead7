// A page with a Tiptap editor holding flow blocks and trajectory plot blocks, for the browser test
// of the plot block on its own (no server). The flow block's nodes are stand-ins here that only
// hold its fields; in the app the flow block's own node view shows them.
import '../../../app/globals.css';
import { Node } from '@tiptap/core';
import type { Node as ProseMirrorNode } from '@tiptap/pm/model';
import { EditorContent, useEditor, type Editor } from '@tiptap/react';
import StarterKit from '@tiptap/starter-kit';
import { createRoot } from 'react-dom/client';
import { BLOCK_FIELD, BLOCK_ROW, FLOW_BLOCK, flowBlockNode } from '../../../flow/document';
import { plotBlockExtensions } from '../../../editor/blocks/plotBlock';
import { plotBlockNode } from '../../../editor/blocks/plotNodes';
import { StepIds } from '../../../editor/stepIds';

const field = (name: string, tag: string, content: string) =>
  Node.create({
    name,
    content,
    group: name === FLOW_BLOCK ? 'block' : undefined,
    addAttributes: () => ({ field: { default: null }, row: { default: null } }),
    parseHTML: () => [{ tag: `${tag}[data-${name}]` }],
    renderHTML: ({ HTMLAttributes }) => [tag, { ...HTMLAttributes, [`data-${name}`]: '' }, 0],
  });
const standIns = [field(FLOW_BLOCK, 'div', '(blockField | blockRow)*'), field(BLOCK_ROW, 'div', 'blockField*'), field(BLOCK_FIELD, 'span', 'text*')];

// The isotropic plus cubic flow at one loop (REFERENCES.md, Aharony 1973), n = 2, eps = 0.1.
const cubic = flowBlockNode(
  {
    couplings: ['u', 'v'],
    parameters: { n: 2, eps: 0.1 },
    convention: 'uv',
    beta: { u: '-eps*u + (n+8)/3*u^2 + 2*u*v', v: '-eps*v + 3*v^2 + 4*u*v' },
  },
  { stepId: 'flow-cubic', name: 'isotropic and cubic' },
);
// The O(n) two-loop flow (REFERENCES.md, Kleinert and Schulte-Frohlinde 2001), n = 0, eps = 0.1.
const chain = flowBlockNode(
  { couplings: ['g'], parameters: { n: 0, eps: 0.1 }, convention: 'uv', beta: { g: '-eps*g + (n+8)/3*g^2 - (3*n+14)/3*g^3' } },
  { stepId: 'flow-chain', name: 'chain' },
);

const content = {
  type: 'doc',
  content: [
    cubic,
    plotBlockNode({ stepId: 'plot-plane', caption: 'Isotropic and cubic couplings', starts: ['u = 0.01, v = 0.005', 'u = 0.06, v = 0.04', 'u = 0.001, v = 0.05'] }),
    chain,
    plotBlockNode({ stepId: 'plot-time', caption: 'The chain coupling', starts: ['g = 0.001', 'g = 0.2'], settings: { view: 'time' } }),
  ],
};

function editorOfPage(): Editor {
  return (window as unknown as { editor: Editor }).editor;
}

/** Replaces the text of the first text block inside a top-level block for which `pick` says yes. */
function setText(stepId: string, pick: (node: ProseMirrorNode, parent: ProseMirrorNode | null) => boolean, text: string): void {
  const editor = editorOfPage();
  let at: { from: number; to: number } | null = null;
  editor.state.doc.forEach((block, offset) => {
    if (at || block.attrs.stepId !== stepId) return;
    block.descendants((node, pos, parent) => {
      if (at || !node.isTextblock || !pick(node, parent)) return;
      const from = offset + 1 + pos + 1;
      at = { from, to: from + node.content.size };
    });
  });
  if (!at) throw new Error(`no such field in ${stepId}`);
  const { from, to } = at as { from: number; to: number };
  editor.view.dispatch(editor.state.tr.insertText(text, from, to));
}

const harness = {
  /** The value of the parameter `name` of a flow block. */
  setParameter(stepId: string, name: string, value: string) {
    setText(stepId, (node, parent) => parent?.attrs.row === 'parameter' && parent.firstChild?.textContent === name && node.attrs.field === 'value', value);
  },
  /** The text of the k-th starting point (from 1) of a plot block. */
  setStart(stepId: string, k: number, text: string) {
    let seen = 0;
    setText(stepId, (node) => node.attrs.field === 'start' && ++seen === k, text);
  },
};

function Page() {
  const editor = useEditor({ extensions: [StarterKit, StepIds, ...standIns, ...plotBlockExtensions], content, immediatelyRender: false });
  Object.assign(window, { editor: editor ?? undefined, harness });
  return <EditorContent editor={editor} className="derivation-text" />;
}

createRoot(document.getElementById('root')!).render(<Page />);
