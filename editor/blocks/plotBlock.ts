// The trajectory plot block and its text fields as Tiptap nodes, and the command that inserts one
// below the caret, bound to the nearest flow block above with a starting point to edit.
import { Node, mergeAttributes } from '@tiptap/core';
import { TextSelection } from '@tiptap/pm/state';
import { ReactNodeViewRenderer } from '@tiptap/react';
import { FLOW_BLOCK } from '@/flow/document';
import { defaultPlotSettings } from './plotData';
import { PLOT_DATASET, PLOT_FIELD, PLOT_FLOW, TRAJECTORY_PLOT, plotBlockNode } from './plotNodes';
import { PlotBlockView } from './PlotBlockView';

declare module '@tiptap/core' {
  interface Commands<ReturnType> {
    trajectoryPlot: {
      /** Inserts a trajectory plot below the current block, following the nearest flow block above. */
      insertTrajectoryPlot: () => ReturnType;
    };
  }
}

/** A caption or a starting point of a trajectory plot: plain text, merged per character. */
export const PlotField = Node.create({
  name: PLOT_FIELD,
  content: 'text*',
  marks: '',
  defining: true,
  selectable: false,
  addAttributes() {
    return {
      field: {
        default: 'start',
        parseHTML: (element) => element.getAttribute('data-plot-field') ?? 'start',
        renderHTML: (attributes) => ({ 'data-plot-field': attributes.field }),
      },
    };
  },
  parseHTML() {
    return [{ tag: 'div[data-plot-field]' }];
  },
  renderHTML({ HTMLAttributes }) {
    return ['div', mergeAttributes(HTMLAttributes, { class: 'plot-field', spellcheck: 'false' }), 0];
  },
  addKeyboardShortcuts() {
    return {
      // Enter in a caption or a starting point adds a starting point below it.
      Enter: ({ editor }) => {
        const { $from } = editor.state.selection;
        if ($from.parent.type.name !== PLOT_FIELD) return false;
        const after = $from.after();
        const tr = editor.state.tr.insert(after, editor.schema.nodes[PLOT_FIELD]!.create({ field: 'start' }));
        tr.setSelection(TextSelection.create(tr.doc, after + 1));
        editor.view.dispatch(tr.scrollIntoView());
        return true;
      },
      // Backspace in an empty starting point (not the only one) removes it.
      Backspace: ({ editor }) => {
        const { $from, empty } = editor.state.selection;
        const field = $from.parent;
        if (!empty || field.type.name !== PLOT_FIELD || field.attrs.field !== 'start' || field.content.size > 0) return false;
        const plot = $from.node($from.depth - 1);
        let starts = 0;
        plot.forEach((child) => {
          if (child.attrs.field === 'start') starts++;
        });
        if (starts <= 1) return true;
        const from = $from.before();
        const tr = editor.state.tr.delete(from, $from.after());
        tr.setSelection(TextSelection.near(tr.doc.resolve(Math.max(0, from - 1)), -1));
        editor.view.dispatch(tr);
        return true;
      },
    };
  },
});

export const TrajectoryPlot = Node.create({
  name: TRAJECTORY_PLOT,
  group: 'block',
  content: `${PLOT_FIELD}+`,
  isolating: true,
  defining: true,
  selectable: false,
  draggable: false,
  addAttributes() {
    const plain = (name: string, fallback: unknown) => ({
      default: fallback,
      parseHTML: (element: HTMLElement) => {
        const raw = element.getAttribute(`data-${name}`);
        return raw === null ? fallback : name === 'span' ? Number(raw) || null : raw;
      },
      renderHTML: (attributes: Record<string, unknown>) => (attributes[name] == null || attributes[name] === '' ? {} : { [`data-${name}`]: String(attributes[name]) }),
    });
    return {
      [PLOT_FLOW]: plain(PLOT_FLOW, null),
      [PLOT_DATASET]: plain(PLOT_DATASET, null),
      view: plain('view', defaultPlotSettings.view),
      x: plain('x', ''),
      y: plain('y', ''),
      timeScale: plain('timeScale', defaultPlotSettings.timeScale),
      valueScale: plain('valueScale', defaultPlotSettings.valueScale),
      direction: plain('direction', defaultPlotSettings.direction),
      span: plain('span', null),
    };
  },
  parseHTML() {
    return [{ tag: 'section[data-trajectory-plot]' }];
  },
  renderHTML({ HTMLAttributes }) {
    return ['section', mergeAttributes(HTMLAttributes, { 'data-trajectory-plot': '' }), 0];
  },
  addNodeView() {
    return ReactNodeViewRenderer(PlotBlockView, { className: 'plot-block-view' });
  },
  addCommands() {
    return {
      insertTrajectoryPlot:
        () =>
        ({ state, chain }) => {
          // A starting point for every coupling of the nearest flow block above, to edit.
          const { $from } = state.selection;
          const at = $from.depth > 0 ? $from.after(1) : $from.pos;
          let couplings: string[] = [];
          state.doc.forEach((child, offset) => {
            if (offset >= at || child.type.name !== FLOW_BLOCK) return;
            child.forEach((field) => {
              if (field.attrs.field === 'couplings') couplings = field.textContent.split(/[\s,]+/).filter(Boolean);
            });
          });
          const start = (couplings.length ? couplings : ['g']).map((c) => `${c} = 0.1`).join(', ');
          const json = plotBlockNode({ starts: [start] });
          return chain()
            .insertContentAt(at, json)
            .setTextSelection(at + 2)
            .run();
        },
    };
  },
});

export const plotBlockExtensions = [PlotField, TrajectoryPlot];
