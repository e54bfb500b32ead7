// Inline math ($...$) and display math (a block of its own). The LaTeX source is the node's text
// content, so two authors editing one formula merge per character and see each other's carets in
// it. The formula is typeset with KaTeX while the caret is elsewhere; clicking it (or moving the
// caret into it) shows the source again.
import { InputRule, Node, textblockTypeInputRule, type Editor, type NodeViewRenderer } from '@tiptap/core';
import type { Node as ProseMirrorNode, NodeType } from '@tiptap/pm/model';
import { Plugin, PluginKey, TextSelection, type EditorState } from '@tiptap/pm/state';
import { Decoration, DecorationSet } from '@tiptap/pm/view';
import { drawSoon } from './blocks/typesetQueue';
import { katexNow } from './katex';
import { showPending, typeset } from './mathRender';

declare module '@tiptap/core' {
  interface Commands<ReturnType> {
    math: {
      /** Inserts inline math (the selected text becomes its source) with the caret inside. */
      insertInlineMath: () => ReturnType;
      /** Turns the current empty block into display math, or adds one below, with the caret inside. */
      insertDisplayMath: () => ReturnType;
    };
  }
}

export const inlineMathName = 'mathInline';
export const displayMathName = 'mathDisplay';

/** $...$ not preceded by $ or a backslash, with no space just inside the dollars (so "$5 and $6" stays text). */
const inlineMathPattern = /(?:^|[^$\\])(\$([^$\s](?:[^$\n]*[^$\s\\])?)\$)$/;

const editingKey = new PluginKey<DecorationSet>('mathEditing');

/** Marks the formula holding the caret, so its node view shows the source instead of the typeset math. */
function editingDecorations(state: EditorState, editor: Editor): DecorationSet {
  if (!editor.isEditable) return DecorationSet.empty;
  const { $head } = state.selection;
  for (let depth = $head.depth; depth > 0; depth--) {
    const node = $head.node(depth);
    if (node.type.name === inlineMathName || node.type.name === displayMathName) {
      const from = $head.before(depth);
      return DecorationSet.create(state.doc, [Decoration.node(from, from + node.nodeSize, { class: 'math-editing' }, { mathEditing: true })]);
    }
  }
  return DecorationSet.empty;
}

/** Formulas typeset at once when one task builds many (opening a long derivation, a long paste):
 * about a screenful. The rest show their source and are typeset in the next frames, top first. */
const TYPESET_AT_ONCE = 40;
let builtThisTask = 0;

/** Whether this formula is past the first screenful built in the current task (or KaTeX is not there yet). */
function builtInCrowd(): boolean {
  if (builtThisTask === 0) queueMicrotask(() => (builtThisTask = 0));
  builtThisTask++;
  return builtThisTask > TYPESET_AT_ONCE || katexNow() === null;
}

function mathNodeView(display: boolean): NodeViewRenderer {
  return ({ node, editor, getPos }) => {
    let current = node;
    const dom = document.createElement(display ? 'div' : 'span');
    dom.className = display ? 'math-display' : 'math-inline';
    const rendered = document.createElement(display ? 'div' : 'span');
    rendered.className = 'math-rendered';
    rendered.contentEditable = 'false';
    const source = document.createElement(display ? 'div' : 'span');
    source.className = 'math-source';
    source.spellcheck = false;
    dom.append(rendered, source);

    let typesetSource: string | null = null;
    const draw = () => {
      const text = current.textContent;
      if (text === typesetSource) return;
      const result = typeset(rendered, text, display);
      if (!result) return drawSoon(rendered, draw);
      typesetSource = text;
      dom.classList.toggle('math-has-error', !result.ok);
    };
    const refresh = () => {
      if (!builtInCrowd()) return draw();
      showPending(rendered, current.textContent, display);
      typesetSource = null;
      drawSoon(rendered, draw);
    };
    refresh();

    // A click on the typeset formula puts the caret at the end of its source.
    rendered.addEventListener('mousedown', (event) => {
      if (!editor.isEditable) return;
      event.preventDefault();
      const pos = getPos();
      if (typeof pos !== 'number') return;
      editor.chain().focus().setTextSelection(pos + 1 + current.content.size).run();
    });

    return {
      dom,
      contentDOM: source,
      update(updated) {
        if (updated.type !== current.type) return false;
        current = updated;
        refresh();
        return true;
      },
      stopEvent(event) {
        return event.target instanceof globalThis.Node && rendered.contains(event.target);
      },
      ignoreMutation(mutation) {
        if (mutation.type === 'selection') return false;
        return rendered.contains(mutation.target);
      },
    };
  };
}

/** Moves the caret out of the formula it is in (after it; for display math into the next block). */
function leaveMath(editor: Editor, direction: 'after' | 'before'): boolean {
  const { state } = editor;
  const { $head, empty } = state.selection;
  if (!empty) return false;
  const node = $head.parent;
  const isInline = node.type.name === inlineMathName;
  const isDisplay = node.type.name === displayMathName;
  if (!isInline && !isDisplay) return false;
  const start = $head.before();
  const end = $head.after();
  const tr = state.tr;
  if (isInline) {
    if (node.content.size === 0) {
      tr.delete(start, end);
      tr.setSelection(TextSelection.create(tr.doc, start));
    } else {
      tr.setSelection(TextSelection.create(tr.doc, direction === 'after' ? end : start));
    }
  } else {
    const paragraph = state.schema.nodes.paragraph!;
    if (direction === 'after') {
      const next = state.doc.resolve(end).nodeAfter;
      if (!next || !next.isTextblock) tr.insert(end, paragraph.create());
      tr.setSelection(TextSelection.near(tr.doc.resolve(end + 1)));
    } else {
      const previous = state.doc.resolve(start).nodeBefore;
      if (!previous || !previous.isTextblock) {
        tr.insert(start, paragraph.create());
        tr.setSelection(TextSelection.create(tr.doc, start + 1));
      } else {
        tr.setSelection(TextSelection.near(tr.doc.resolve(start - 1), -1));
      }
    }
  }
  editor.view.dispatch(tr.scrollIntoView());
  return true;
}

/** With the caret beside inline math, arrow keys and Backspace step into its source. */
function enterInlineMath(editor: Editor, side: 'before' | 'after'): boolean {
  const { state } = editor;
  const { $head, empty } = state.selection;
  if (!empty || !editor.isEditable) return false;
  const neighbour = side === 'before' ? $head.nodeBefore : $head.nodeAfter;
  if (!neighbour || neighbour.type.name !== inlineMathName) return false;
  const target = side === 'before' ? $head.pos - 1 : $head.pos + 1;
  editor.view.dispatch(state.tr.setSelection(TextSelection.create(state.doc, target)).scrollIntoView());
  return true;
}

/** With the caret at the edge of a block beside display math, up and down step into its source. */
function enterDisplayMath(editor: Editor, direction: 'up' | 'down'): boolean {
  const { state } = editor;
  const { $head, empty } = state.selection;
  if (!empty || !editor.isEditable || $head.depth === 0) return false;
  const atEdge = direction === 'down' ? $head.parentOffset === $head.parent.content.size : $head.parentOffset === 0;
  if (!atEdge) return false;
  const blockPos = direction === 'down' ? $head.after() : $head.before();
  const $block = state.doc.resolve(blockPos);
  const neighbour = direction === 'down' ? $block.nodeAfter : $block.nodeBefore;
  if (!neighbour || neighbour.type.name !== displayMathName) return false;
  const target = direction === 'down' ? blockPos + 1 : blockPos - 1;
  editor.view.dispatch(state.tr.setSelection(TextSelection.create(state.doc, target)).scrollIntoView());
  return true;
}

function inlineMathInputRule(type: NodeType): InputRule {
  return new InputRule({
    find: inlineMathPattern,
    handler: ({ state, range, match }) => {
      const whole = match[0];
      const latex = match[2];
      if (!latex) return null;
      const start = range.from + whole.indexOf('$');
      const node = type.create(null, state.schema.text(latex));
      const tr = state.tr;
      tr.replaceWith(start, range.to, node);
      tr.setSelection(TextSelection.create(tr.doc, start + node.nodeSize));
      return undefined;
    },
  });
}

// Above the default keymap (priority 100), whose Enter would put a line break into the formula.
const keymapFirst = 150;

export const MathInline = Node.create({
  name: inlineMathName,
  priority: keymapFirst,
  group: 'inline',
  inline: true,
  content: 'text*',
  marks: '',
  code: true,
  whitespace: 'pre',
  defining: true,

  parseHTML() {
    return [{ tag: 'span[data-math-inline]', preserveWhitespace: 'full' }];
  },

  renderHTML() {
    return ['span', { 'data-math-inline': '' }, 0];
  },

  renderText({ node }) {
    return `$${node.textContent}$`;
  },

  addNodeView() {
    return mathNodeView(false);
  },

  addInputRules() {
    return [inlineMathInputRule(this.type)];
  },

  addCommands() {
    return {
      insertInlineMath:
        () =>
        ({ state, dispatch }) => {
          const { from, to } = state.selection;
          const selected = state.doc.textBetween(from, to, ' ');
          const node = this.type.create(null, selected ? state.schema.text(selected) : null);
          const { $from, $to } = state.selection;
          if (!$from.sameParent($to) || !$from.parent.canReplaceWith($from.index(), $to.index(), this.type)) return false;
          if (dispatch) {
            const tr = state.tr.replaceSelectionWith(node, false);
            const inside = from + 1 + node.content.size;
            tr.setSelection(TextSelection.create(tr.doc, inside));
            dispatch(tr.scrollIntoView());
          }
          return true;
        },
    };
  },

  addKeyboardShortcuts() {
    return {
      Enter: () => leaveMath(this.editor, 'after'),
      Escape: () => leaveMath(this.editor, 'after'),
      ArrowRight: () => {
        const { $head, empty } = this.editor.state.selection;
        if (empty && $head.parent.type === this.type && $head.parentOffset === $head.parent.content.size) {
          return leaveMath(this.editor, 'after');
        }
        return enterInlineMath(this.editor, 'after');
      },
      ArrowLeft: () => {
        const { $head, empty } = this.editor.state.selection;
        if (empty && $head.parent.type === this.type && $head.parentOffset === 0) return leaveMath(this.editor, 'before');
        return enterInlineMath(this.editor, 'before');
      },
      Backspace: () => enterInlineMath(this.editor, 'before'),
    };
  },

  addProseMirrorPlugins() {
    const editor = this.editor;
    return [
      new Plugin({
        key: editingKey,
        props: { decorations: (state) => editingDecorations(state, editor) },
      }),
    ];
  },
});

export const MathDisplay = Node.create({
  name: displayMathName,
  priority: keymapFirst,
  group: 'block',
  content: 'text*',
  marks: '',
  code: true,
  whitespace: 'pre',
  defining: true,

  parseHTML() {
    return [{ tag: 'div[data-math-display]', preserveWhitespace: 'full' }];
  },

  renderHTML() {
    return ['div', { 'data-math-display': '' }, 0];
  },

  renderText({ node }) {
    return `$$${node.textContent}$$`;
  },

  addNodeView() {
    return mathNodeView(true);
  },

  addInputRules() {
    // "$$ " at the start of an empty line turns it into display math.
    return [textblockTypeInputRule({ find: /^\$\$\s$/, type: this.type })];
  },

  addCommands() {
    return {
      insertDisplayMath:
        () =>
        ({ state, chain }) => {
          const { $from } = state.selection;
          if ($from.parent.isTextblock && $from.parent.content.size === 0 && $from.parent.type.name === 'paragraph') {
            return chain().setNode(this.name).run();
          }
          const after = $from.depth > 0 ? $from.after(1) : $from.pos;
          return chain()
            .insertContentAt(after, { type: this.name })
            .setTextSelection(after + 1)
            .scrollIntoView()
            .run();
        },
    };
  },

  addKeyboardShortcuts() {
    return {
      'Mod-Enter': () => leaveMath(this.editor, 'after'),
      Escape: () => leaveMath(this.editor, 'after'),
      ArrowDown: () => {
        const { $head, empty } = this.editor.state.selection;
        if (empty && $head.parent.type === this.type && $head.parentOffset === $head.parent.content.size) {
          return leaveMath(this.editor, 'after');
        }
        return enterDisplayMath(this.editor, 'down');
      },
      ArrowUp: () => {
        const { $head, empty } = this.editor.state.selection;
        if (empty && $head.parent.type === this.type && $head.parentOffset === 0) return leaveMath(this.editor, 'before');
        return enterDisplayMath(this.editor, 'up');
      },
      // "$$" then Enter on an otherwise empty line also opens display math.
      Enter: () => {
        const { $head, empty } = this.editor.state.selection;
        if (!empty || $head.parent.type.name !== 'paragraph' || $head.parent.textContent !== '$$') return false;
        const start = $head.before();
        return this.editor
          .chain()
          .command(({ tr }) => {
            tr.delete(start + 1, start + 1 + $head.parent.content.size);
            return true;
          })
          .setNode(this.name)
          .run();
      },
    };
  },
});

/** The formulas' source text in document order (for tests and checks). */
export function mathSources(doc: ProseMirrorNode): { display: boolean; source: string }[] {
  const found: { display: boolean; source: string }[] = [];
  doc.descendants((node) => {
    if (node.type.name === inlineMathName || node.type.name === displayMathName) {
      found.push({ display: node.type.name === displayMathName, source: node.textContent });
      return false;
    }
    return true;
  });
  return found;
}
