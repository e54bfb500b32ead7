// Imported blocks as the editor's document: ProseMirror JSON (Tiptap's StarterKit nodes and marks,
// the editor's mathInline / mathDisplay, every top-level block a step with its own stepId), and
// that document as a Yjs update of the XmlFragment `body`, in the form the editor's binding reads.
import * as Y from 'yjs';
import type { ProseMirrorJson } from '../collab';
import type { Block, Inline, LeftOut, Mark } from './parse';

export const bodyField = 'body';
export const stepIdAttribute = 'stepId';

function markJson(mark: Mark): NonNullable<ProseMirrorJson['marks']>[number] {
  return mark.type === 'link' ? { type: 'link', attrs: { href: mark.href } } : { type: mark.type };
}

function inlineJson(content: readonly Inline[]): ProseMirrorJson[] {
  const out: ProseMirrorJson[] = [];
  for (const item of content) {
    if (item.kind === 'math') {
      if (item.latex) out.push({ type: 'mathInline', content: [{ type: 'text', text: item.latex }] });
      continue;
    }
    if (!item.text) continue;
    // Code excludes every other mark in the editor's schema.
    const marks = item.marks.some((m) => m.type === 'code') ? [{ type: 'code' }] : item.marks.map(markJson);
    out.push(marks.length ? { type: 'text', text: item.text, marks } : { type: 'text', text: item.text });
  }
  return out;
}

function blockJson(block: Block, topLevel: boolean, newId: () => string): ProseMirrorJson[] {
  const attrs = (extra: Record<string, unknown> = {}) => (topLevel ? { ...extra, [stepIdAttribute]: newId() } : Object.keys(extra).length ? extra : undefined);
  const withAttrs = (node: ProseMirrorJson, extra?: Record<string, unknown>): ProseMirrorJson => {
    const a = attrs(extra);
    return a ? { ...node, attrs: a } : node;
  };
  switch (block.kind) {
    case 'heading': {
      const content = inlineJson(block.content);
      if (!topLevel) return [withAttrs({ type: 'paragraph', content: [...content].map((c) => (c.type === 'text' ? { ...c, marks: [{ type: 'bold' }] } : c)) })];
      return content.length ? [withAttrs({ type: 'heading', content }, { level: block.level })] : [];
    }
    case 'paragraph': {
      const content = inlineJson(block.content);
      return content.length ? [withAttrs({ type: 'paragraph', content })] : [];
    }
    case 'math':
      return block.latex ? [withAttrs({ type: 'mathDisplay', content: [{ type: 'text', text: block.latex }] })] : [];
    case 'list': {
      const items: ProseMirrorJson[] = block.items.map((item) => {
        const content = item.flatMap((b) => blockJson(b, false, newId));
        // A list item opens with a paragraph in the editor's schema.
        if (content[0]?.type !== 'paragraph') content.unshift({ type: 'paragraph' });
        return { type: 'listItem', content };
      });
      return items.length ? [withAttrs({ type: block.ordered ? 'orderedList' : 'bulletList', content: items })] : [];
    }
  }
}

/** The note at the end of an imported derivation: what the file held that was not imported, with lines. */
export function leftOutBlocks(fileName: string, leftOut: readonly LeftOut[]): Block[] {
  if (leftOut.length === 0) return [];
  return [
    { kind: 'heading', level: 2, content: [{ kind: 'text', text: `Not imported from ${fileName}`, marks: [] }] },
    {
      kind: 'list',
      ordered: false,
      items: leftOut.map((item) => [
        {
          kind: 'paragraph',
          content: [
            { kind: 'text', text: item.what, marks: [{ type: 'code' }] },
            { kind: 'text', text: `${describeWhere(item)}: ${item.detail}.`, marks: [] },
          ],
        },
      ]),
    },
  ];
}

export function describeWhere(item: LeftOut): string {
  const times = item.count > 1 ? `, ${item.count} times` : '';
  if (item.lines.length === 0) return item.count > 1 ? ` (${item.count})` : '';
  const lines = item.lines.length === 1 ? `line ${item.lines[0]}` : `lines ${item.lines.join(', ')}${item.count > item.lines.length ? ', …' : ''}`;
  return ` (${lines}${times})`;
}

/** The blocks as a ProseMirror document whose top-level blocks carry fresh step ids. */
export function toProseMirror(blocks: readonly Block[], newId: () => string): ProseMirrorJson {
  return { type: 'doc', content: blocks.flatMap((b) => blockJson(b, true, newId)) };
}

// ---- Yjs ---------------------------------------------------------------------------------------

function markAttributes(marks: ProseMirrorJson['marks']): Record<string, unknown> | undefined {
  if (!marks?.length) return undefined;
  const attributes: Record<string, unknown> = {};
  for (const mark of marks) attributes[mark.type] = mark.attrs ?? {};
  return attributes;
}

function yNode(node: ProseMirrorJson): Y.XmlElement {
  const element = new Y.XmlElement(node.type);
  for (const [key, value] of Object.entries(node.attrs ?? {})) if (value !== null && value !== undefined) element.setAttribute(key, value as string);
  const children: (Y.XmlElement | Y.XmlText)[] = [];
  let run: ProseMirrorJson[] = [];
  const flushText = () => {
    if (run.length === 0) return;
    const text = new Y.XmlText();
    text.applyDelta(run.map((t) => ({ insert: t.text ?? '', attributes: markAttributes(t.marks) })));
    children.push(text);
    run = [];
  };
  for (const child of node.content ?? []) {
    if (child.type === 'text') run.push(child);
    else {
      flushText();
      children.push(yNode(child));
    }
  }
  flushText();
  element.insert(0, children);
  return element;
}

/** The document as one Yjs update that fills an empty `body`. */
export function toYjsUpdate(doc: ProseMirrorJson): Uint8Array {
  const ydoc = new Y.Doc();
  const body = ydoc.getXmlFragment(bodyField);
  ydoc.transact(() => body.insert(0, (doc.content ?? []).map(yNode)));
  const update = Y.encodeStateAsUpdate(ydoc);
  ydoc.destroy();
  return update;
}
