// The node views of flow blocks, claim blocks, their rows and fields, in plain DOM (a long
// derivation has hundreds of fields; plain views keep opening and typing fast). Every field is
// the node's own text (contentDOM), so co-authors' carets show inside it; around it the view
// draws the field's label, its live preview (TeX, or what is wrong and where) and, on blocks,
// the header with the verdict and the block's commands. Nothing here computes: it shows what
// the workers sent (live.ts).
import type { Editor, NodeViewRendererProps } from '@tiptap/core';
import type { Node as ProseMirrorNode } from '@tiptap/pm/model';
import type { EditorView, NodeView, ViewMutationRecord } from '@tiptap/pm/view';
import { fillMessage } from '@/components/checks/MessageText';
import { verdictBadgeElement } from '@/components/checks/verdict';
import { CLAIM_KINDS, type ClaimKind } from '@/flow/types';
import { FLOW_FIELDS, FLOW_ROWS, KIND_LABELS, claimFields, isClaimKind, type FieldSpec, type RowKind } from '@/flow/document/layout';
import { liveChecksOf, type LiveChecks } from './live';
import { chromeButton, element } from './chromeDom';
import { FlowChooser, type FlowChoice } from './flowChooser';
import { cancelTypeset, typesetSoon } from './typesetQueue';
import { shownVerdict } from './verdictOf';

type GetPos = () => number | undefined;

/** How long a check runs before it offers Cancel (ms). */
const CANCEL_AFTER_MS = 400;

/** Mutations in the chrome are ours; only the text (contentDOM) is ProseMirror's. */
function chromeMutation(contentDOM: HTMLElement, mutation: ViewMutationRecord): boolean {
  if (mutation.type === 'selection') return false;
  return !contentDOM.contains(mutation.target);
}

function chromeEvent(contentDOM: HTMLElement, event: Event): boolean {
  const target = event.target;
  return target instanceof globalThis.Node && !contentDOM.contains(target) && (target as Element).closest?.('.block-chrome') !== null;
}

/** Follows one step's changes in the live state; the step can change (an id given late). */
class StepFollower {
  private stepId: string | null = null;
  private stop: (() => void) | null = null;

  constructor(
    private readonly live: LiveChecks,
    private readonly onChange: () => void,
  ) {}

  follow(stepId: string): void {
    if (stepId === this.stepId) return;
    this.stop?.();
    this.stepId = stepId;
    this.stop = stepId ? this.live.subscribeStep(stepId, this.onChange) : null;
  }

  end(): void {
    this.stop?.();
    this.stop = null;
  }
}

// ---------------------------------------------------------------------------------------------
// Fields

interface FieldContext {
  stepId: string;
  /** "near", "couplings", "beta[0].value" */
  address: string;
  label: string;
  hint: string;
  required: boolean;
  prose: boolean;
  /** The field is a name, a list of names or a number: a preview only when it says more than the text. */
  plainName: boolean;
}

const ROW_FIELD_LABELS: Record<RowKind, { name: string; value: string; nameHint: string; valueHint: string }> = {
  parameter: { name: 'Parameter', value: 'Value', nameHint: 'name, e.g. eps', valueHint: 'e.g. 0.1 or 4 - d' },
  beta: { name: 'Coupling', value: 'Beta function', nameHint: 'e.g. g', valueHint: 'e.g. -eps*g + (n+8)/3*g^2' },
  rate: { name: 'Rate', value: 'd ln X / dl', nameHint: 'name, e.g. t', valueHint: 'e.g. 2 - (n+2)/3*g' },
};

function fieldContext(view: EditorView, getPos: GetPos, node: ProseMirrorNode): FieldContext | null {
  const pos = getPos();
  if (typeof pos !== 'number') return null;
  const doc = view.state.doc;
  if (pos > doc.content.size) return null;
  const $pos = doc.resolve(pos);
  if ($pos.depth < 1) return null;
  const block = $pos.node(1);
  const stepId = typeof block.attrs.stepId === 'string' ? block.attrs.stepId : '';
  const key = typeof node.attrs.field === 'string' ? node.attrs.field : '';
  const parent = $pos.parent;
  if (parent.type.name === 'blockRow') {
    const row = parent.attrs.row as RowKind;
    const labels = ROW_FIELD_LABELS[row] ?? ROW_FIELD_LABELS.parameter;
    let index = 0;
    const rowIndex = $pos.index($pos.depth - 1);
    for (let i = 0; i < rowIndex; i++) {
      const sibling = $pos.node($pos.depth - 1).child(i);
      if (sibling.type.name === 'blockRow' && sibling.attrs.row === row) index++;
    }
    const isName = key === 'name';
    return { stepId, address: `${row}[${index}].${key}`, label: isName ? labels.name : labels.value, hint: isName ? labels.nameHint : labels.valueHint, required: true, prose: false, plainName: isName };
  }
  let spec: FieldSpec | undefined;
  if (block.type.name === 'flowBlock') spec = FLOW_FIELDS.find((f) => f.key === key);
  else if (block.type.name === 'claimBlock' && isClaimKind(block.attrs.kind)) spec = claimFields(block.attrs.kind).find((f) => f.key === key);
  if (!spec) return { stepId, address: key, label: key || 'Field', hint: 'not a field of this block: its text is kept but not checked', required: false, prose: true, plainName: false };
  return { stepId, address: key, label: spec.label, hint: spec.hint, required: spec.required, prose: spec.syntax === 'text', plainName: ['name', 'names', 'integer', 'number'].includes(spec.syntax) };
}

class FieldView implements NodeView {
  readonly dom: HTMLElement;
  readonly contentDOM: HTMLElement;
  private readonly labelElement: HTMLElement;
  private readonly previewElement: HTMLElement;
  private readonly live: LiveChecks;
  private readonly follower: StepFollower;
  private context: FieldContext | null = null;
  private shown = '';

  constructor(
    private node: ProseMirrorNode,
    editor: Editor,
    private readonly view: EditorView,
    private readonly getPos: GetPos,
  ) {
    this.live = liveChecksOf(editor);
    this.dom = element('div', 'block-field');
    this.labelElement = element('span', 'block-field-label block-chrome');
    this.labelElement.contentEditable = 'false';
    this.contentDOM = element('div', 'block-field-text');
    this.contentDOM.spellcheck = false;
    this.previewElement = element('div', 'block-field-preview block-chrome');
    this.previewElement.contentEditable = 'false';
    this.dom.append(this.labelElement, this.contentDOM, this.previewElement);
    this.follower = new StepFollower(this.live, () => this.refreshPreview());
    this.refresh();
  }

  update(node: ProseMirrorNode): boolean {
    if (node.type !== this.node.type) return false;
    this.node = node;
    this.refresh();
    return true;
  }

  private refresh(): void {
    const context = fieldContext(this.view, this.getPos, this.node);
    this.context = context;
    this.follower.follow(context?.stepId ?? '');
    const label = context?.label ?? '';
    if (this.labelElement.textContent !== label + (context?.required ? ' *' : '')) {
      this.labelElement.textContent = label;
      if (context?.required) {
        const mark = element('span', 'block-field-required', ' *');
        mark.title = 'required';
        this.labelElement.append(mark);
      }
    }
    this.dom.dataset.field = context?.address ?? '';
    this.dom.classList.toggle('is-prose', Boolean(context?.prose));
    const empty = this.node.content.size === 0;
    this.dom.classList.toggle('is-empty', empty);
    this.contentDOM.dataset.placeholder = context?.hint ?? '';
    this.contentDOM.setAttribute('aria-label', label);
    this.refreshPreview();
  }

  private refreshPreview(): void {
    const context = this.context;
    if (!context) return;
    const empty = this.node.textContent.trim() === '';
    const preview = empty ? undefined : this.live.preview(context.stepId, context.address);
    const problem = empty ? undefined : this.live.problems(context.stepId).find((p) => p.field === context.address);
    const message = preview?.message ?? problem?.message ?? null;
    let tex = message ? null : (preview?.tex ?? null);
    // A name typeset as itself ("g") says nothing new; "eps" as epsilon does.
    if (tex && context.plainName && tex.replace(/\\[ ,]|[\s,{}]/g, '') === this.node.textContent.replace(/[\s,]/g, '')) tex = null;
    const key = message ? `!${message}|${preview?.position ?? ''}` : tex ? `$${tex}` : '';
    if (key === this.shown) return;
    this.shown = key;
    this.dom.classList.toggle('has-problem', message !== null);
    cancelTypeset(this.previewElement);
    if (message) {
      const box = element('span', 'block-field-message');
      box.setAttribute('role', 'note');
      const icon = verdictBadgeElement('invalid', '');
      icon.classList.add('block-field-message-icon');
      const words = element('span', '', preview?.position ? `${message}` : message);
      box.append(icon, words);
      this.previewElement.replaceChildren(box);
    } else if (tex) {
      const target = element('span', 'block-field-tex');
      this.previewElement.replaceChildren(target);
      typesetSoon(target, tex);
    } else {
      this.previewElement.replaceChildren();
    }
  }

  ignoreMutation(mutation: ViewMutationRecord): boolean {
    return chromeMutation(this.contentDOM, mutation);
  }

  destroy(): void {
    this.follower.end();
    cancelTypeset(this.previewElement);
  }
}

export function fieldView(props: NodeViewRendererProps): NodeView {
  return new FieldView(props.node, props.editor, props.view, props.getPos as GetPos);
}

// ---------------------------------------------------------------------------------------------
// Rows of a flow block

class RowView implements NodeView {
  readonly dom: HTMLElement;
  readonly contentDOM: HTMLElement;
  private readonly labelElement: HTMLElement;
  private readonly removeButton: HTMLButtonElement;

  constructor(
    private node: ProseMirrorNode,
    private readonly editor: Editor,
    private readonly getPos: GetPos,
  ) {
    this.dom = element('div', 'block-row');
    this.labelElement = element('span', 'block-row-label block-chrome');
    this.labelElement.contentEditable = 'false';
    this.contentDOM = element('div', 'block-row-fields');
    const chrome = element('span', 'block-row-chrome block-chrome');
    chrome.contentEditable = 'false';
    this.removeButton = chromeButton('Remove', () => this.remove(), { editOnly: true, className: 'block-row-remove' });
    chrome.append(this.removeButton);
    this.dom.append(this.contentDOM, chrome);
    this.refresh();
  }

  private refresh(): void {
    const row = this.node.attrs.row as RowKind;
    const spec = FLOW_ROWS.find((r) => r.row === row);
    this.dom.dataset.row = row;
    const name = this.node.firstChild?.textContent.trim() ?? '';
    this.removeButton.setAttribute('aria-label', `Remove ${spec?.label.toLowerCase() ?? 'row'}${name ? ` ${name}` : ''}`);
  }

  private remove(): void {
    const pos = this.getPos();
    if (typeof pos !== 'number') return;
    this.editor.chain().focus().command(({ tr }) => {
      tr.delete(pos, pos + this.node.nodeSize);
      return true;
    }).run();
  }

  update(node: ProseMirrorNode): boolean {
    if (node.type !== this.node.type || node.attrs.row !== this.node.attrs.row) return false;
    this.node = node;
    this.refresh();
    return true;
  }

  stopEvent(event: Event): boolean {
    return chromeEvent(this.contentDOM, event);
  }

  ignoreMutation(mutation: ViewMutationRecord): boolean {
    return chromeMutation(this.contentDOM, mutation);
  }
}

export function rowView(props: NodeViewRendererProps): NodeView {
  return new RowView(props.node, props.editor, props.getPos as GetPos);
}

// ---------------------------------------------------------------------------------------------
// Flow blocks

class FlowBlockView implements NodeView {
  readonly dom: HTMLElement;
  readonly contentDOM: HTMLElement;
  private readonly title: HTMLElement;
  private readonly summary: HTMLElement;
  private readonly live: LiveChecks;
  private readonly follower: StepFollower;
  private shown = '';

  constructor(
    private node: ProseMirrorNode,
    private readonly editor: Editor,
    private readonly getPos: GetPos,
  ) {
    this.live = liveChecksOf(editor);
    this.dom = element('section', 'checked-block flow-block');
    const header = element('header', 'block-header block-chrome');
    header.contentEditable = 'false';
    this.title = element('h3', 'block-title', 'Flow block');
    this.summary = element('span', 'block-summary');
    const tools = element('span', 'block-tools');
    for (const row of FLOW_ROWS) tools.append(chromeButton(`Add ${row.label.toLowerCase()}`, () => this.addRow(row.row), { editOnly: true }));
    tools.append(chromeButton('Remove block', () => this.removeBlock(), { editOnly: true, className: 'block-remove', title: 'Remove this flow block (Ctrl+Z brings it back)' }));
    header.append(this.title, this.summary, tools);
    this.contentDOM = element('div', 'block-body');
    this.dom.append(header, this.contentDOM);
    this.follower = new StepFollower(this.live, () => this.refresh());
    this.refresh();
  }

  private get stepId(): string {
    return typeof this.node.attrs.stepId === 'string' ? this.node.attrs.stepId : '';
  }

  private refresh(): void {
    const stepId = this.stepId;
    if (stepId) this.dom.dataset.stepId = stepId;
    this.follower.follow(stepId);
    const flow = stepId ? this.live.flow(stepId) : undefined;
    const claims = this.live.snapshot().claims.filter((c) => c.info.flowStepId === stepId && stepId !== '');
    const title = flow ? `Flow block ${flow.number}${flow.name ? `: ${flow.name}` : ''}` : 'Flow block';
    const problems = flow?.problems.length ?? 0;
    const summary = problems > 0 ? `${problems} ${problems === 1 ? 'problem' : 'problems'} to fix` : claims.length > 0 ? `${claims.length} ${claims.length === 1 ? 'claim' : 'claims'} bound to it` : '';
    const key = `${title}|${summary}`;
    if (key === this.shown) return;
    this.shown = key;
    this.title.textContent = title;
    this.dom.setAttribute('aria-label', title);
    this.summary.textContent = summary;
    this.summary.classList.toggle('has-problem', problems > 0);
  }

  private addRow(row: RowKind): void {
    const pos = this.getPos();
    if (typeof pos === 'number') this.editor.chain().focus().addBlockRow(pos, row).run();
  }

  private removeBlock(): void {
    const pos = this.getPos();
    if (typeof pos === 'number') this.editor.chain().focus().removeCheckedBlock(pos).run();
  }

  update(node: ProseMirrorNode): boolean {
    if (node.type !== this.node.type) return false;
    this.node = node;
    this.refresh();
    return true;
  }

  stopEvent(event: Event): boolean {
    return chromeEvent(this.contentDOM, event);
  }

  ignoreMutation(mutation: ViewMutationRecord): boolean {
    return chromeMutation(this.contentDOM, mutation);
  }

  destroy(): void {
    this.follower.end();
  }
}

export function flowBlockView(props: NodeViewRendererProps): NodeView {
  return new FlowBlockView(props.node, props.editor, props.getPos as GetPos);
}

// ---------------------------------------------------------------------------------------------
// Claim blocks

class ClaimBlockView implements NodeView {
  readonly dom: HTMLElement;
  readonly contentDOM: HTMLElement;
  private readonly title: HTMLElement;
  private readonly badgeSlot: HTMLElement;
  private readonly flowChooser: FlowChooser;
  private readonly verdictLine: HTMLElement;
  private readonly noteLine: HTMLElement;
  private readonly cancelButton: HTMLButtonElement;
  private readonly againButton: HTMLButtonElement;
  private readonly evidenceButton: HTMLButtonElement;
  private readonly live: LiveChecks;
  private readonly follower: StepFollower;
  private cancelTimer: ReturnType<typeof setTimeout> | null = null;
  private shown = '';
  private shownFlows = '';

  constructor(
    private node: ProseMirrorNode,
    private readonly editor: Editor,
    private readonly getPos: GetPos,
  ) {
    this.live = liveChecksOf(editor);
    this.dom = element('section', 'checked-block claim-block');
    const header = element('header', 'block-header block-chrome');
    header.contentEditable = 'false';
    this.title = element('h3', 'block-title', 'Claim');
    this.badgeSlot = element('span', 'block-verdict');
    this.badgeSlot.setAttribute('role', 'status');
    this.flowChooser = new FlowChooser((value) => this.bind(value));
    const tools = element('span', 'block-tools');
    this.evidenceButton = chromeButton('Evidence', () => this.live.openEvidence(this.stepId), { title: 'What the solver measured, how, and how sure it is' });
    this.cancelButton = chromeButton('Cancel', () => this.live.cancel(this.stepId), { title: 'Stop this check' });
    this.againButton = chromeButton('Check again', () => this.live.checkAgain(this.stepId));
    const remove = chromeButton('Remove block', () => this.removeBlock(), { editOnly: true, className: 'block-remove', title: 'Remove this claim block (Ctrl+Z brings it back)' });
    tools.append(this.evidenceButton, this.cancelButton, this.againButton, remove);
    header.append(this.title, this.badgeSlot, this.flowChooser.dom, tools);
    this.verdictLine = element('p', 'block-verdict-message block-chrome');
    this.verdictLine.contentEditable = 'false';
    this.noteLine = element('p', 'block-verdict-note block-chrome');
    this.noteLine.contentEditable = 'false';
    this.contentDOM = element('div', 'block-body');
    this.dom.append(header, this.verdictLine, this.noteLine, this.contentDOM);
    this.follower = new StepFollower(this.live, () => this.refresh());
    this.refresh();
  }

  private get stepId(): string {
    return typeof this.node.attrs.stepId === 'string' ? this.node.attrs.stepId : '';
  }

  private refresh(): void {
    const stepId = this.stepId;
    if (stepId) this.dom.dataset.stepId = stepId;
    this.follower.follow(stepId);
    const kind = isClaimKind(this.node.attrs.kind) ? this.node.attrs.kind : null;
    const claim = stepId ? this.live.claim(stepId) : undefined;
    const verdict = shownVerdict(claim);
    const kindLabel = kind ? KIND_LABELS[kind] : `Unknown kind "${String(this.node.attrs.kind)}"`;
    const title = `Claim ${claim?.info.number ?? ''} · ${kindLabel}`.replace('Claim  ·', 'Claim ·');
    const running = claim?.state === 'running' || claim?.tight?.state === 'running';
    const since = claim?.state === 'running' ? claim.since : claim?.tight?.state === 'running' ? claim.tight.since : null;
    const longRunning = running && since !== null && performance.now() - since >= CANCEL_AFTER_MS;
    if (running && !longRunning && since !== null) {
      this.cancelTimer ??= setTimeout(() => {
        this.cancelTimer = null;
        this.refresh();
      }, CANCEL_AFTER_MS - (performance.now() - since) + 10);
    }
    const stopped = verdict.result?.method === 'stopped' || claim?.state === 'cancelled';
    // Which input the block holds and which input its verdict is for (equal once it is checked).
    const input = claim?.info.hash ?? 'as written';
    const settled = claim !== undefined && (claim.state === 'done' || claim.state === 'invalid');
    const key = [title, verdict.state, verdict.stale, verdict.message, claim?.note ?? '', longRunning, stopped, claim?.state ?? '', input, settled].join('|');
    this.refreshFlows(claim?.flowNumber ?? null);
    if (key === this.shown) return;
    this.shown = key;
    this.title.textContent = title;
    this.dom.setAttribute('aria-label', title);
    this.dom.dataset.verdict = verdict.state;
    this.dom.dataset.input = input;
    this.dom.dataset.verdictInput = settled ? input : '';
    this.dom.classList.toggle('is-stale', verdict.stale);
    const badge = verdictBadgeElement(verdict.state);
    this.badgeSlot.replaceChildren(badge);
    fillMessage(this.verdictLine, verdict.message);
    this.verdictLine.hidden = verdict.message === '';
    this.noteLine.textContent = claim?.note ? `Note: ${claim.note}.` : '';
    this.noteLine.hidden = !claim?.note;
    this.cancelButton.hidden = !longRunning;
    this.againButton.hidden = !stopped || running;
    this.evidenceButton.disabled = !claim;
  }

  /** The binding choices: the flow above (by default), no flow, or a flow block by number. */
  private refreshFlows(boundNumber: number | null): void {
    const binding = typeof this.node.attrs.flow === 'string' && this.node.attrs.flow !== '' ? this.node.attrs.flow : '';
    const flows = this.live.snapshot().flows;
    const key = `${binding}|${boundNumber}|${flows.map((f) => `${f.stepId}:${f.number}:${f.name}`).join(',')}|${this.editor.isEditable}`;
    if (key === this.shownFlows) return;
    this.shownFlows = key;
    const choices: FlowChoice[] = [
      { value: '', label: binding === '' && boundNumber !== null ? `the flow block above (${boundNumber})` : 'the flow block above' },
      { value: 'none', label: 'no flow' },
      ...flows.map((flow) => ({ value: flow.stepId, label: `flow block ${flow.number}${flow.name ? `: ${flow.name}` : ''}` })),
    ];
    if (binding !== '' && binding !== 'none' && !flows.some((f) => f.stepId === binding)) choices.push({ value: binding, label: 'a flow block no longer here' });
    this.flowChooser.show(choices, binding, this.editor.isEditable);
  }

  private bind(value: string): void {
    const pos = this.getPos();
    if (typeof pos !== 'number') return;
    this.editor.chain().command(({ tr }) => {
      tr.setNodeAttribute(pos, 'flow', value === '' ? null : value);
      return true;
    }).run();
  }

  private removeBlock(): void {
    const pos = this.getPos();
    if (typeof pos === 'number') this.editor.chain().focus().removeCheckedBlock(pos).run();
  }

  update(node: ProseMirrorNode): boolean {
    if (node.type !== this.node.type || node.attrs.kind !== this.node.attrs.kind) return false;
    this.node = node;
    this.refresh();
    return true;
  }

  stopEvent(event: Event): boolean {
    return chromeEvent(this.contentDOM, event);
  }

  ignoreMutation(mutation: ViewMutationRecord): boolean {
    return chromeMutation(this.contentDOM, mutation);
  }

  destroy(): void {
    this.follower.end();
    if (this.cancelTimer) clearTimeout(this.cancelTimer);
  }
}

export function claimBlockView(props: NodeViewRendererProps): NodeView {
  return new ClaimBlockView(props.node, props.editor, props.getPos as GetPos);
}

/** The kinds in the order offered when inserting a claim. */
export const KIND_CHOICES: readonly { kind: ClaimKind; label: string }[] = CLAIM_KINDS.map((kind) => ({ kind, label: KIND_LABELS[kind] }));
