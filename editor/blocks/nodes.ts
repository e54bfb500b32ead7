// The flow and claim blocks as Tiptap nodes, in the layout of flow/document.ts: top-level blocks
// (steps, with their stepId) whose fields are text nodes of their own, so two authors editing one
// field merge per character. Commands insert and edit blocks; a field keeps the caret inside it
// (Enter goes to the next field, Backspace at its start does not merge it into the one before);
// a small repair after each local edit puts back a field that a deletion took away.
import { Extension, Node, type Editor } from '@tiptap/core';
import type { Node as ProseMirrorNode, Schema } from '@tiptap/pm/model';
import { Plugin, PluginKey, TextSelection, type EditorState, type Transaction } from '@tiptap/pm/state';
import { isChangeOrigin } from '@tiptap/extension-collaboration';
import {
  BLOCK_FIELD,
  BLOCK_ROW,
  CLAIM_BLOCK,
  FLOW_BLOCK,
  FLOW_FIELDS,
  claimFields,
  emptyClaimBlock,
  emptyFlowBlock,
  isClaimKind,
  rowNode,
  type DocNode,
  type RowKind,
} from '@/flow/document';
import type { ClaimKind } from '@/flow/types';
import { checkedBlocks, dropLiveChecks, liveChecksOf } from './live';
import { claimBlockView, fieldView, flowBlockView, rowView } from './views';

declare module '@tiptap/core' {
  interface Commands<ReturnType> {
    checkedBlocks: {
      /** Inserts an empty flow block after the current step, with the caret in its first field. */
      insertFlowBlock: () => ReturnType;
      /** Inserts an empty claim block of this kind after the current step (bound to the flow block above). */
      insertClaimBlock: (kind: ClaimKind) => ReturnType;
      /** Inserts blocks (e.g. from an imported claim file) after the current step. */
      insertCheckedBlocks: (blocks: DocNode[]) => ReturnType;
      /** Adds an empty row (parameter, beta function or rate) to the flow block at this position. */
      addBlockRow: (blockPos: number, row: RowKind) => ReturnType;
      /** Removes the flow or claim block at this position. */
      removeCheckedBlock: (blockPos: number) => ReturnType;
    };
  }
}

export const BlockField = Node.create({
  name: BLOCK_FIELD,
  content: 'text*',
  marks: '',
  // Code: no input rules (a "- " must not turn a field into a list) and text kept as typed.
  code: true,
  whitespace: 'pre',
  defining: true,
  isolating: true,
  selectable: false,
  draggable: false,

  addAttributes() {
    return {
      field: {
        default: null,
        parseHTML: (element) => element.getAttribute('data-block-field'),
        renderHTML: (attributes) => ({ 'data-block-field': attributes.field }),
      },
    };
  },

  parseHTML() {
    return [{ tag: 'div[data-block-field]', preserveWhitespace: 'full' }];
  },

  renderHTML({ HTMLAttributes }) {
    return ['div', HTMLAttributes, 0];
  },

  addNodeView() {
    return fieldView;
  },
});

export const BlockRow = Node.create({
  name: BLOCK_ROW,
  content: `${BLOCK_FIELD}*`,
  defining: true,
  isolating: true,
  selectable: false,

  addAttributes() {
    return {
      row: {
        default: 'parameter',
        parseHTML: (element) => element.getAttribute('data-block-row'),
        renderHTML: (attributes) => ({ 'data-block-row': attributes.row }),
      },
    };
  },

  parseHTML() {
    return [{ tag: 'div[data-block-row]' }];
  },

  renderHTML({ HTMLAttributes }) {
    return ['div', HTMLAttributes, 0];
  },

  addNodeView() {
    return rowView;
  },
});

export const FlowBlock = Node.create({
  name: FLOW_BLOCK,
  group: 'block',
  content: `(${BLOCK_FIELD} | ${BLOCK_ROW})*`,
  defining: true,
  isolating: true,
  draggable: false,

  parseHTML() {
    return [{ tag: 'section[data-flow-block]' }];
  },

  renderHTML({ HTMLAttributes }) {
    return ['section', { ...HTMLAttributes, 'data-flow-block': '' }, 0];
  },

  addNodeView() {
    return flowBlockView;
  },
});

export const ClaimBlock = Node.create({
  name: CLAIM_BLOCK,
  group: 'block',
  content: `${BLOCK_FIELD}*`,
  defining: true,
  isolating: true,
  draggable: false,

  addAttributes() {
    return {
      kind: {
        default: 'identity',
        parseHTML: (element) => element.getAttribute('data-kind'),
        renderHTML: (attributes) => ({ 'data-kind': attributes.kind }),
      },
      flow: {
        default: null,
        parseHTML: (element) => element.getAttribute('data-flow'),
        renderHTML: (attributes) => (attributes.flow ? { 'data-flow': attributes.flow } : {}),
      },
      // A dataset of the group the claim's evidence compares with (log-exponent claims).
      dataset: {
        default: null,
        parseHTML: (element) => element.getAttribute('data-dataset'),
        renderHTML: (attributes) => (attributes.dataset ? { 'data-dataset': attributes.dataset } : {}),
      },
    };
  },

  parseHTML() {
    return [{ tag: 'section[data-claim-block]' }];
  },

  renderHTML({ HTMLAttributes }) {
    return ['section', { ...HTMLAttributes, 'data-claim-block': '' }, 0];
  },

  addNodeView() {
    return claimBlockView;
  },
});

// ---------------------------------------------------------------------------------------------
// Inserting

/** Where a new top-level block goes: after the step holding the caret (or instead of an empty paragraph). */
function insertionRange(state: EditorState): { from: number; to: number } {
  const { $from } = state.selection;
  if ($from.depth === 0) return { from: $from.pos, to: $from.pos };
  const top = $from.node(1);
  const start = $from.before(1);
  if (top.type.name === 'paragraph' && top.content.size === 0) return { from: start, to: start + top.nodeSize };
  const after = $from.after(1);
  return { from: after, to: after };
}

function nodesFromJson(schema: Schema, blocks: readonly DocNode[]): ProseMirrorNode[] {
  return blocks.map((block) => schema.nodeFromJSON(block));
}

/** The position inside the first field of the block starting at `pos`. */
function firstFieldPosition(doc: ProseMirrorNode, pos: number): number | null {
  const block = doc.nodeAt(pos);
  if (!block) return null;
  let found: number | null = null;
  block.descendants((node, offset) => {
    if (found !== null) return false;
    if (node.type.name === BLOCK_FIELD) {
      found = pos + 1 + offset + 1;
      return false;
    }
    return true;
  });
  return found;
}

function insertBlocks(blocks: DocNode[]) {
  return ({ state, tr, dispatch }: { state: EditorState; tr: Transaction; dispatch?: (tr: Transaction) => void }): boolean => {
    let nodes: ProseMirrorNode[];
    try {
      nodes = nodesFromJson(state.schema, blocks);
    } catch {
      return false;
    }
    if (nodes.length === 0) return false;
    if (dispatch) {
      const { from, to } = insertionRange(state);
      tr.replaceWith(from, to, nodes);
      const caret = firstFieldPosition(tr.doc, from);
      if (caret !== null) tr.setSelection(TextSelection.create(tr.doc, caret));
      tr.scrollIntoView();
    }
    return true;
  };
}

// ---------------------------------------------------------------------------------------------
// Moving between fields

/** Positions inside each field (textblock) of the top-level block around `$pos`, in order. */
function fieldStarts(state: EditorState, blockStart: number): { from: number; to: number }[] {
  const block = state.doc.nodeAt(blockStart);
  const fields: { from: number; to: number }[] = [];
  block?.descendants((node, offset) => {
    if (node.type.name === BLOCK_FIELD) {
      const from = blockStart + 1 + offset + 1;
      fields.push({ from, to: from + node.content.size });
      return false;
    }
    return true;
  });
  return fields;
}

function inField(state: EditorState): { blockStart: number; index: number; fields: { from: number; to: number }[] } | null {
  const { $head } = state.selection;
  if ($head.parent.type.name !== BLOCK_FIELD || $head.depth < 2) return null;
  const blockStart = $head.before(1);
  const fields = fieldStarts(state, blockStart);
  const here = $head.start();
  const index = fields.findIndex((f) => f.from === here);
  return index < 0 ? null : { blockStart, index, fields };
}

/** Enter: the next field, or out of the block below it. */
function nextField(editor: Editor): boolean {
  const { state } = editor;
  const place = inField(state);
  if (!place) return false;
  const next = place.fields[place.index + 1];
  const tr = state.tr;
  if (next) {
    tr.setSelection(TextSelection.create(tr.doc, next.to));
  } else {
    const blockEnd = place.blockStart + state.doc.nodeAt(place.blockStart)!.nodeSize;
    const after = state.doc.resolve(blockEnd).nodeAfter;
    if (!after || !after.isTextblock) tr.insert(blockEnd, state.schema.nodes.paragraph!.create());
    tr.setSelection(TextSelection.near(tr.doc.resolve(blockEnd + 1)));
  }
  editor.view.dispatch(tr.scrollIntoView());
  return true;
}

/** Backspace at a field's start: to the end of the field before (never merging the two). */
function previousField(editor: Editor): boolean {
  const { state } = editor;
  const { $head, empty } = state.selection;
  if (!empty || $head.parent.type.name !== BLOCK_FIELD || $head.parentOffset !== 0) return false;
  const place = inField(state);
  if (!place) return true;
  const previous = place.fields[place.index - 1];
  if (previous) editor.view.dispatch(state.tr.setSelection(TextSelection.create(state.doc, previous.to)).scrollIntoView());
  return true;
}

/** Delete at a field's end does nothing (it would merge the next field into this one). */
function stayAtEnd(editor: Editor): boolean {
  const { $head, empty } = editor.state.selection;
  return empty && $head.parent.type.name === BLOCK_FIELD && $head.parentOffset === $head.parent.content.size;
}

// ---------------------------------------------------------------------------------------------
// Keeping every field in place

function fieldNode(schema: Schema, key: string): ProseMirrorNode {
  return schema.nodes[BLOCK_FIELD]!.create({ field: key });
}

/** The fields a block should have, in order, and the fields it has (key -> first position). */
function missingFields(block: ProseMirrorNode): { key: string; index: number }[] {
  const expected =
    block.type.name === FLOW_BLOCK ? FLOW_FIELDS.map((f) => f.key) : isClaimKind(block.attrs.kind) ? claimFields(block.attrs.kind).map((f) => f.key) : [];
  const present = new Map<string, number>();
  block.forEach((child, _offset, index) => {
    if (child.type.name === BLOCK_FIELD && typeof child.attrs.field === 'string' && !present.has(child.attrs.field)) present.set(child.attrs.field, index);
  });
  const missing: { key: string; index: number }[] = [];
  let insertAt = 0;
  for (const key of expected) {
    const at = present.get(key);
    if (at !== undefined) insertAt = at + 1;
    else missing.push({ key, index: insertAt });
  }
  return missing;
}

function repair(state: EditorState): Transaction | null {
  const { schema } = state;
  const tr = state.tr;
  const fixes: { pos: number; node: ProseMirrorNode }[] = [];
  state.doc.forEach((block, blockPos) => {
    if (block.type.name !== FLOW_BLOCK && block.type.name !== CLAIM_BLOCK) return;
    for (const { key, index } of missingFields(block)) {
      let pos = blockPos + 1;
      for (let i = 0; i < index && i < block.childCount; i++) pos += block.child(i).nodeSize;
      fixes.push({ pos, node: fieldNode(schema, key) });
    }
    if (block.type.name !== FLOW_BLOCK) return;
    block.forEach((row, offset) => {
      if (row.type.name !== BLOCK_ROW) return;
      const keys = new Set<string>();
      row.forEach((f) => typeof f.attrs.field === 'string' && keys.add(f.attrs.field));
      const rowPos = blockPos + 1 + offset;
      if (!keys.has('name')) fixes.push({ pos: rowPos + 1, node: fieldNode(schema, 'name') });
      if (!keys.has('value')) fixes.push({ pos: rowPos + row.nodeSize - 1, node: fieldNode(schema, 'value') });
    });
  });
  if (fixes.length === 0) return null;
  // From the end, so earlier positions stay right.
  fixes.sort((a, b) => b.pos - a.pos);
  for (const fix of fixes) tr.insert(fix.pos, fix.node);
  tr.setMeta('addToHistory', false);
  return tr;
}

// ---------------------------------------------------------------------------------------------

export const CheckedBlocks = Extension.create({
  name: 'checkedBlocks',

  addExtensions() {
    return [BlockField, BlockRow, FlowBlock, ClaimBlock];
  },

  addCommands() {
    return {
      insertFlowBlock:
        () =>
        (props) =>
          insertBlocks([emptyFlowBlock()])(props),
      insertClaimBlock:
        (kind) =>
        (props) =>
          insertBlocks([emptyClaimBlock(kind)])(props),
      insertCheckedBlocks:
        (blocks) =>
        (props) =>
          insertBlocks(blocks)(props),
      addBlockRow:
        (blockPos, row) =>
        ({ state, tr, dispatch }) => {
          const block = state.doc.nodeAt(blockPos);
          if (!block || block.type.name !== FLOW_BLOCK) return false;
          // After the last row of the same kind, else after the rows of the kinds before it.
          const order: RowKind[] = ['parameter', 'beta', 'rate'];
          let insertAt = blockPos + 1;
          block.forEach((child, offset) => {
            const end = blockPos + 1 + offset + child.nodeSize;
            if (child.type.name === BLOCK_FIELD) insertAt = Math.max(insertAt, end);
            else if (child.type.name === BLOCK_ROW && order.indexOf(child.attrs.row as RowKind) <= order.indexOf(row)) insertAt = Math.max(insertAt, end);
          });
          if (dispatch) {
            const node = state.schema.nodeFromJSON(rowNode(row, '', ''));
            tr.insert(insertAt, node);
            tr.setSelection(TextSelection.create(tr.doc, insertAt + 2));
            tr.scrollIntoView();
          }
          return true;
        },
      removeCheckedBlock:
        (blockPos) =>
        ({ state, tr, dispatch }) => {
          const block = state.doc.nodeAt(blockPos);
          if (!block || (block.type.name !== FLOW_BLOCK && block.type.name !== CLAIM_BLOCK)) return false;
          if (dispatch) {
            if (state.doc.childCount === 1) tr.replaceWith(blockPos, blockPos + block.nodeSize, state.schema.nodes.paragraph!.create());
            else tr.delete(blockPos, blockPos + block.nodeSize);
          }
          return true;
        },
    };
  },

  addKeyboardShortcuts() {
    return {
      Enter: () => nextField(this.editor),
      'Shift-Enter': () => nextField(this.editor),
      'Mod-Enter': () => nextField(this.editor),
      Backspace: () => previousField(this.editor),
      Delete: () => stayAtEnd(this.editor),
    };
  },

  onDestroy() {
    dropLiveChecks(this.editor);
  },

  addProseMirrorPlugins() {
    const editor = this.editor;
    return [
      new Plugin({
        key: new PluginKey('checkedBlocksRepair'),
        appendTransaction: (transactions, _oldState, newState) => {
          if (!transactions.some((tr) => tr.docChanged && !isChangeOrigin(tr))) return null;
          return repair(newState);
        },
      }),
      new Plugin({
        key: new PluginKey('checkedBlocksReader'),
        view: (view) => {
          const live = liveChecksOf(editor);
          const blocks = () => checkedBlocks(view.state.doc);
          live.track(blocks);
          live.documentChanged(blocks, true);
          return {
            update: (updated, previous) => {
              if (updated.state.doc !== previous.doc) live.documentChanged(blocks);
            },
          };
        },
      }),
    ];
  },
});
