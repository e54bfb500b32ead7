'use client';
// The trajectory plot block as the author sees it: which flow block it follows, the view (coupling
// space or a coupling against RG time) and its axes, the caption and starting points as text
// fields, and the plot itself (components/plot), drawn from trajectories the plot worker follows
// with flow/trajectory.ts a moment after the flow or the starts change.
import type { Node as ProseMirrorNode } from '@tiptap/pm/model';
import { NodeViewContent, NodeViewWrapper, type NodeViewProps } from '@tiptap/react';
import { startTransition, useEffect, useMemo, useRef, useState, type RefObject } from 'react';
import { ChoiceButton, ValueButton } from '@/components/ChoiceButton';
import { DatasetChoiceButton, useDatasetOverlay } from '@/components/datasets/attach';
import { PlotFrame } from '@/components/plot';
import type { FlowSpec, TrajectoryResult, ValueInput } from '@/flow';
import { BLOCK_FIELD, FLOW_BLOCK, FieldSyntaxError, fieldValue, readDocument, type DocNode, type FlowReading } from '@/flow/document';
import { plotPicture, resolveAxes, traceOptions, withOverlay, type PlotSettings } from './plotData';
import { useDerivationId } from '../derivationContext';
import { PLOT_DATASET, PLOT_FIELD, PLOT_FLOW, plotSettingsOf } from './plotNodes';
import { traceInWorker } from './plotTraces';
import './plotBlock.css';

/** The flow changes this long after the last edit before the plot follows it again. */
const SETTLE_MS = 150;

interface FlowChoice {
  stepId: string;
  label: string;
}

interface BoundFlow {
  /** The flow block's reading, or null when there is none to follow. */
  reading: FlowReading | null;
  /** "flow 2: two-loop O(n) flow", for messages. */
  label: string;
  choices: FlowChoice[];
  /** Why there is no flow to follow, in words. */
  missing: string | null;
}

function flowName(node: ProseMirrorNode): string {
  let name = '';
  node.forEach((child) => {
    if (!name && child.type.name === BLOCK_FIELD && child.attrs.field === 'name') name = child.textContent.trim();
  });
  return name;
}

/** The flow block the plot follows: the one it is bound to, or the nearest above it. */
function findBoundFlow(doc: ProseMirrorNode, position: number | undefined, binding: unknown): BoundFlow {
  const choices: FlowChoice[] = [];
  const flows: { node: ProseMirrorNode; label: string; stepId: string; offset: number }[] = [];
  doc.forEach((child, offset) => {
    if (child.type.name !== FLOW_BLOCK) return;
    const name = flowName(child);
    const label = `flow ${flows.length + 1}${name ? `: ${name}` : ''}`;
    const stepId = typeof child.attrs.stepId === 'string' ? child.attrs.stepId : '';
    if (stepId) choices.push({ stepId, label });
    flows.push({ node: child, label, stepId, offset });
  });
  const chosen =
    typeof binding === 'string' && binding
      ? flows.find((f) => f.stepId === binding)
      : flows.filter((f) => position !== undefined && f.offset < position).pop();
  if (!chosen) {
    return {
      reading: null,
      label: '',
      choices,
      missing:
        typeof binding === 'string' && binding
          ? 'The flow block this plot was bound to is no longer in the derivation: choose another.'
          : 'There is no flow block above this plot: insert one above it, or choose a flow block to follow.',
    };
  }
  const reading = readDocument([chosen.node.toJSON() as DocNode]).flows[0] ?? null;
  return { reading, label: chosen.label, choices, missing: null };
}

function useBoundFlow(props: NodeViewProps): BoundFlow {
  const { editor, getPos, node } = props;
  const binding = node.attrs[PLOT_FLOW];
  const compute = () => findBoundFlow(editor.state.doc, getPos(), binding);
  const [bound, setBound] = useState<BoundFlow>(compute);
  const key = useRef('');
  useEffect(() => {
    let timer: ReturnType<typeof setTimeout> | null = null;
    const refresh = () => {
      const next = compute();
      const nextKey = JSON.stringify([next.reading?.spec, next.reading?.problems, next.label, next.choices, next.missing]);
      if (nextKey !== key.current) {
        key.current = nextKey;
        setBound(next);
      }
    };
    refresh();
    const onUpdate = () => {
      if (timer) clearTimeout(timer);
      timer = setTimeout(refresh, SETTLE_MS);
    };
    editor.on('update', onUpdate);
    return () => {
      editor.off('update', onUpdate);
      if (timer) clearTimeout(timer);
    };
    // compute reads the editor's current state; the binding is the only input of ours.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [editor, binding]);
  return bound;
}

interface StartField {
  text: string;
  start: Record<string, ValueInput> | null;
  problem: string | null;
}

function readStarts(node: ProseMirrorNode, couplings: readonly string[]): { caption: string; starts: StartField[] } {
  let caption = '';
  const starts: StartField[] = [];
  node.forEach((child) => {
    if (child.type.name !== PLOT_FIELD) return;
    const text = child.textContent.trim();
    if (child.attrs.field === 'caption') {
      caption ||= text;
      return;
    }
    // Without a flow to follow there is nothing to read a start against (the plot says so).
    if (text === '' || couplings.length === 0) {
      starts.push({ text, start: null, problem: null });
      return;
    }
    try {
      const start = fieldValue('point', text, couplings) as Record<string, ValueInput>;
      const unknown = Object.keys(start).find((name) => !couplings.includes(name));
      const missing = couplings.find((name) => !(name in start));
      if (unknown) starts.push({ text, start: null, problem: `"${unknown}" is not a coupling of the flow (couplings: ${couplings.join(', ')})` });
      else if (missing) starts.push({ text, start: null, problem: `give a value for ${missing} too, e.g. ${couplings.map((c) => `${c} = 0.1`).join(', ')}` });
      else starts.push({ text, start, problem: null });
    } catch (error) {
      if (!(error instanceof FieldSyntaxError)) throw error;
      starts.push({ text, start: null, problem: error.message });
    }
  });
  return { caption, starts };
}

/** How far outside the screen a plot is followed and drawn ahead of scrolling to it (px). */
const NEAR_SCREEN_MARGIN = '600px';

/**
 * Whether the element is on screen or near it. A chart costs a few hundred milliseconds to draw and
 * its trajectories a worker's time: off screen both wait until it comes near, not on every change of its flow.
 */
function useNearScreen(ref: RefObject<HTMLElement | null>): boolean {
  const [near, setNear] = useState(() => typeof IntersectionObserver === 'undefined');
  useEffect(() => {
    const element = ref.current;
    if (!element || typeof IntersectionObserver === 'undefined') return;
    const observer = new IntersectionObserver((entries) => setNear(entries.some((entry) => entry.isIntersecting)), { rootMargin: NEAR_SCREEN_MARGIN });
    observer.observe(element);
    return () => observer.disconnect();
  }, [ref]);
  return near;
}

/** A setting of the plot: its name, then the choice as a button (a select only while choosing). */
function Choice<T extends string>({ label, value, options, onChange, disabled }: { label: string; value: T; options: { value: T; label: string }[]; onChange: (value: T) => void; disabled: boolean }) {
  return (
    <span className="inline-flex items-center gap-1">
      <span className="text-ink-soft" aria-hidden="true">
        {label}
      </span>
      <ChoiceButton label={label} value={value} options={options} onChange={onChange} disabled={disabled} />
    </span>
  );
}

export function PlotBlockView(props: NodeViewProps) {
  const { node, editor, updateAttributes, deleteNode } = props;
  const editable = editor.isEditable;
  const settings = plotSettingsOf(node.attrs);
  const bound = useBoundFlow(props);
  const spec: FlowSpec | null = bound.reading?.spec ?? null;
  const couplings = useMemo(() => spec?.couplings ?? bound.reading?.symbols.couplings ?? [], [spec, bound.reading]);
  const { caption, starts } = readStarts(node, couplings);
  const axes = resolveAxes(settings, couplings);
  const owner = useRef(`plot-${Math.random().toString(36).slice(2)}`);
  const derivationId = useDerivationId();
  const datasetId = typeof node.attrs[PLOT_DATASET] === 'string' && node.attrs[PLOT_DATASET] ? (node.attrs[PLOT_DATASET] as string) : null;
  const overlay = useDatasetOverlay(derivationId ?? '', derivationId ? datasetId : null);

  const ready = starts.filter((s) => s.start !== null);
  const request = spec && ready.length > 0 ? JSON.stringify({ spec, starts: ready.map((s) => s.start), settings: { ...settings, x: '', y: '' } }) : null;
  const [traced, setTraced] = useState<{ request: string; texts: string[]; numbers: number[]; results: (TrajectoryResult | null)[]; error: string | null } | null>(null);
  const [following, setFollowing] = useState(false);

  // Off screen nothing is followed: a long derivation's plots would otherwise take the machine while
  // its first checks run. A plot is traced when it comes near the screen, with the flow as it is then.
  const output = useRef<HTMLDivElement>(null);
  const near = useNearScreen(output);

  useEffect(() => {
    // Back near the screen with nothing changed meanwhile: the curves drawn are the flow's.
    if (!request || !spec || !near || traced?.request === request) return;
    let current = true;
    const timer = setTimeout(() => {
      setFollowing(true);
      const texts = ready.map((s) => s.text);
      const numbers = ready.map((s) => starts.indexOf(s) + 1);
      void traceInWorker(owner.current, spec, traceOptions(settings, ready.map((s) => s.start!), spec.convention, spec.couplings)).then((answer) => {
        if (!current || answer === null) return;
        // Drawing the new curves may take a while: as a transition React does it in slices,
        // so typing elsewhere is never held up by a plot.
        startTransition(() => {
          setFollowing(false);
          setTraced(answer.ok ? { request, texts, numbers, results: answer.results, error: null } : { request, texts, numbers, results: [], error: answer.error });
        });
      });
    }, SETTLE_MS);
    return () => {
      current = false;
      clearTimeout(timer);
    };
    // The request string holds every input of the trace; traced is read only to skip a trace already done.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [request, near]);

  const traces = useMemo(
    () => (traced && spec ? plotPicture(settings, spec.couplings, spec.convention, traced.texts, traced.results) : null),
    // settings and couplings are part of what the picture shows; traced changes with each answer.
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [traced, JSON.stringify(settings), spec?.couplings.join(','), spec?.convention],
  );
  const picture = useMemo(() => (traces && overlay.series.length ? withOverlay(traces, overlay.series) : traces), [traces, overlay.series]);
  // The chart shows the latest picture while near the screen; off screen it keeps the last one drawn.
  const drawn = useRef(picture);
  if (near) drawn.current = picture;
  const shown = drawn.current;

  const problems: string[] = [];
  if (bound.missing) problems.push(bound.missing);
  if (bound.reading && !spec) {
    const first = bound.reading.problems[0];
    problems.push(`The flow block it follows (${bound.label}) has a problem${first ? `: ${first.message}` : ''}.`);
  }
  starts.forEach((s, i) => {
    if (s.problem) problems.push(`Start ${i + 1}: ${s.problem}.`);
  });
  if (traced?.error) problems.push(traced.error);
  picture?.problems.forEach((p) => problems.push(`Start ${traced?.numbers[p.start] ?? p.start + 1}: ${p.message}.`));

  if (overlay.note) problems.push(overlay.note);
  const set = (attrs: Partial<Record<keyof PlotSettings | typeof PLOT_FLOW | typeof PLOT_DATASET, unknown>>) => updateAttributes(attrs);
  const couplingOptions = couplings.map((c) => ({ value: c, label: c }));
  const spanLabel = spec?.convention === 'map' ? 'Steps' : 'RG time up to';
  const title = caption || `Trajectories of ${bound.label || 'the flow'}`;
  const chart = useMemo(
    () => (shown ? <PlotFrame title={title} x={shown.x} y={shown.y} series={shown.series} markers={shown.markers} notes={shown.notes} height={320} /> : null),
    [shown, title],
  );

  return (
    <NodeViewWrapper as="section" className="plot-block" data-trajectory-plot="" data-step-id={typeof node.attrs.stepId === "string" ? node.attrs.stepId : undefined} aria-label="Trajectory plot">
      <div contentEditable={false} className="plot-block-controls flex flex-wrap items-center gap-x-4 gap-y-1 text-sm" suppressContentEditableWarning>
        <span className="font-semibold tracking-wide text-ink-soft">Trajectory plot</span>
        <Choice
          label="Follows"
          value={typeof node.attrs[PLOT_FLOW] === 'string' && node.attrs[PLOT_FLOW] ? (node.attrs[PLOT_FLOW] as string) : ''}
          options={[{ value: '', label: 'the flow block above' }, ...bound.choices.map((c) => ({ value: c.stepId, label: c.label }))]}
          onChange={(value) => set({ [PLOT_FLOW]: value || null })}
          disabled={!editable}
        />
        <Choice
          label="View"
          value={axes.view}
          options={[
            { value: 'plane', label: 'coupling space' },
            { value: 'time', label: 'against RG time' },
          ]}
          onChange={(view) => set({ view })}
          disabled={!editable}
        />
        {axes.view === 'plane' ? (
          <>
            <Choice label="Across" value={axes.x} options={couplingOptions} onChange={(x) => set({ x })} disabled={!editable || couplings.length < 2} />
            <Choice label="Up" value={axes.y} options={couplingOptions} onChange={(y) => set({ y })} disabled={!editable || couplings.length < 2} />
          </>
        ) : (
          <>
            <Choice label="Coupling" value={axes.y} options={couplingOptions} onChange={(y) => set({ y })} disabled={!editable || couplings.length < 2} />
            <Choice
              label="RG time axis"
              value={settings.timeScale}
              options={[
                { value: 'log', label: 'logarithmic' },
                { value: 'linear', label: 'linear' },
              ]}
              onChange={(timeScale) => set({ timeScale })}
              disabled={!editable}
            />
          </>
        )}
        <Choice
          label="Coupling axes"
          value={settings.valueScale}
          options={[
            { value: 'linear', label: 'linear' },
            { value: 'log', label: 'logarithmic' },
          ]}
          onChange={(valueScale) => set({ valueScale })}
          disabled={!editable}
        />
        <Choice
          label="Direction"
          value={settings.direction}
          options={[
            { value: 'ir', label: 'infrared' },
            { value: 'both', label: 'infrared and ultraviolet' },
          ]}
          onChange={(direction) => set({ direction })}
          disabled={!editable || spec?.convention === 'map'}
        />
        <span className="inline-flex items-center gap-1">
          <span className="text-ink-soft" aria-hidden="true">
            {spanLabel}
          </span>
          <ValueButton
            label={spanLabel}
            text={settings.span === null ? '' : String(settings.span)}
            empty="automatic"
            inputMode="decimal"
            disabled={!editable}
            onCommit={(typed) => {
              const text = typed.trim();
              const value = Number(text);
              if (text === '') set({ span: null });
              else if (Number.isFinite(value) && value > 0) set({ span: value });
              else return `"${text}" is not a positive number`;
              return null;
            }}
          />
        </span>
        {derivationId && (
          <DatasetChoiceButton derivationId={derivationId} datasetId={datasetId} onChange={(dataset) => set({ [PLOT_DATASET]: dataset })} disabled={!editable} />
        )}
        {editable && (
          <button type="button" className="rounded border border-rule px-2 py-0.5 text-ink-soft hover:border-ink-faint hover:text-ink" onClick={() => deleteNode()}>
            Remove plot
          </button>
        )}
      </div>
      <NodeViewContent className="plot-block-fields" />
      <div ref={output} contentEditable={false} suppressContentEditableWarning className="plot-block-output">
        {editable && <p className="text-xs text-ink-faint">Caption first, then one starting point per line, e.g. {couplings.length ? couplings.map((c) => `${c} = 0.1`).join(', ') : 'g = 0.1'}; Enter adds a line.</p>}
        {problems.length > 0 && (
          <ul className="mt-1 text-sm text-verdict-invalid" role="status" data-plot-problems="">
            {problems.map((p) => (
              <li key={p}>{p}</li>
            ))}
          </ul>
        )}
        {/* Always one line high, so the text below does not jump while the plot follows an edit. */}
        <p className="h-5 text-sm text-ink-faint" role="status">
          {following ? 'Following the flow…' : ''}
        </p>
        {chart}
      </div>
    </NodeViewWrapper>
  );
}
