// The trajectory plot block's place in the document: a top-level node (a step with its stepId)
// bound to a flow block, its settings as attributes, and its caption and starting points as text
// fields of their own (child nodes), so two authors editing one starting point merge per
// character. Pure data helpers; the node view is in ./PlotBlockView.tsx.
import type { DocNode } from '@/flow/document';
import { defaultPlotSettings, type AxisScale, type PlotSettings, type PlotView } from './plotData';

export const TRAJECTORY_PLOT = 'trajectoryPlot';
export const PLOT_FIELD = 'plotField';
/** Attribute of the plot block: null = the nearest flow block above, or a flow block's stepId. */
export const PLOT_FLOW = 'flow';
/** Attribute of the plot block: the id of a dataset of the group drawn beside the flow, or null. */
export const PLOT_DATASET = 'dataset';

export type PlotFieldKind = 'caption' | 'start';

const VIEWS: readonly PlotView[] = ['plane', 'time'];
const SCALES: readonly AxisScale[] = ['linear', 'log'];

function choice<T extends string>(value: unknown, choices: readonly T[], fallback: T): T {
  return typeof value === 'string' && (choices as readonly string[]).includes(value) ? (value as T) : fallback;
}

/** The block's settings from its attributes, with defaults for anything missing or unknown. */
export function plotSettingsOf(attrs: Record<string, unknown> | undefined): PlotSettings {
  const a = attrs ?? {};
  const span = typeof a.span === 'number' ? a.span : typeof a.span === 'string' && a.span.trim() !== '' ? Number(a.span) : null;
  return {
    view: choice(a.view, VIEWS, defaultPlotSettings.view),
    x: typeof a.x === 'string' ? a.x : '',
    y: typeof a.y === 'string' ? a.y : '',
    timeScale: choice(a.timeScale, SCALES, defaultPlotSettings.timeScale),
    valueScale: choice(a.valueScale, SCALES, defaultPlotSettings.valueScale),
    direction: a.direction === 'both' ? 'both' : 'ir',
    span: span !== null && Number.isFinite(span) && span > 0 ? span : null,
  };
}

/** A new trajectory plot block with one starting point per coupling list given. */
export function plotBlockNode(options: { stepId?: string | null; flow?: string | null; caption?: string; starts: string[]; settings?: Partial<PlotSettings> }): DocNode {
  const field = (kind: PlotFieldKind, text: string): DocNode => ({ type: PLOT_FIELD, attrs: { field: kind }, ...(text ? { content: [{ type: 'text', text }] } : {}) });
  return {
    type: TRAJECTORY_PLOT,
    attrs: { stepId: options.stepId ?? null, [PLOT_FLOW]: options.flow ?? null, ...defaultPlotSettings, ...options.settings },
    content: [field('caption', options.caption ?? ''), ...(options.starts.length ? options.starts : ['']).map((text) => field('start', text))],
  };
}

function textOf(node: DocNode): string {
  if (typeof node.text === 'string') return node.text;
  return (node.content ?? []).map(textOf).join('');
}

/** The caption and the starting points' texts of a plot block. */
export function plotFieldsOf(block: DocNode): { caption: string; starts: string[] } {
  let caption = '';
  const starts: string[] = [];
  for (const child of block.content ?? []) {
    if (child.type !== PLOT_FIELD) continue;
    if (child.attrs?.field === 'caption') caption ||= textOf(child).trim();
    else starts.push(textOf(child).trim());
  }
  return { caption, starts };
}
