'use client';
// Beside the document: the check summary (every claim with its verdict; choosing one scrolls to
// it), the evidence of the claim opened from its block, and the claim file: export the
// derivation's checks as the solver's claim file, or import one as new flow and claim blocks.
import type { Editor } from '@tiptap/core';
import type { Node as ProseMirrorNode } from '@tiptap/pm/model';
import { startTransition, useEffect, useId, useMemo, useRef, useState, type ChangeEvent, type ReactNode } from 'react';
import { CheckSummary, type SummaryEntry } from '@/components/checks/CheckSummary';
import { EvidencePanel, type EvidenceRun } from '@/components/checks/EvidencePanel';
import { ClaimDatasetSection } from '@/components/datasets/attach';
import { downloadText } from '@/components/plot';
import { KIND_LABELS, claimFields, isClaimKind } from '@/flow/document/layout';
import type { FieldError } from '@/flow/types';
import { tightItem } from '../worker/reading';
import { useDerivationId } from '../derivationContext';
import { liveChecksOf, type ClaimView, type ExportChoice, type LiveChecks, type LiveSnapshot } from './live';
import { shownVerdict } from './verdictOf';

/** Scrolls the text to a step and marks it for a moment; puts the caret in it when the text is editable. */
export function showStep(editor: Editor, stepId: string): void {
  const target = editor.view.dom.querySelector<HTMLElement>(`[data-step-id="${CSS.escape(stepId)}"]`);
  if (!target) return;
  target.scrollIntoView({ block: 'center', behavior: 'smooth' });
  target.classList.add('is-shown');
  setTimeout(() => target.classList.remove('is-shown'), 1600);
  if (!editor.isEditable) return;
  let pos: number | null = null;
  editor.state.doc.forEach((node, offset) => {
    if (pos === null && node.attrs.stepId === stepId) pos = offset;
  });
  if (pos !== null) {
    const inside = Math.min((pos as number) + 2, editor.state.doc.content.size);
    editor.chain().setTextSelection(inside).focus(undefined, { scrollIntoView: false }).run();
  }
}

function writtenFields(editor: Editor, stepId: string): { label: string; text: string }[] {
  let found: { label: string; text: string }[] = [];
  editor.state.doc.forEach((node) => {
    if (node.attrs.stepId !== stepId || node.type.name !== 'claimBlock' || !isClaimKind(node.attrs.kind)) return;
    const specs = claimFields(node.attrs.kind);
    const texts = new Map<string, string>();
    node.forEach((field) => {
      const key = field.attrs.field as string;
      if (!texts.has(key) || texts.get(key)!.trim() === '') texts.set(key, field.textContent);
    });
    found = specs.filter((spec) => (texts.get(spec.key) ?? '').trim() !== '').map((spec) => ({ label: spec.label, text: texts.get(spec.key)!.trim() }));
  });
  return found;
}

/** The claim block of a step, for the dataset attached to it. */
function claimNode(editor: Editor, stepId: string): { node: ProseMirrorNode; pos: number } | null {
  let found: { node: ProseMirrorNode; pos: number } | null = null;
  editor.state.doc.forEach((node, pos) => {
    if (node.attrs.stepId === stepId && node.type.name === 'claimBlock') found = { node, pos };
  });
  return found;
}

function claimDataset(editor: Editor, stepId: string): string | null {
  const dataset = claimNode(editor, stepId)?.node.attrs.dataset;
  return typeof dataset === 'string' && dataset ? dataset : null;
}

function setClaimDataset(editor: Editor, stepId: string, dataset: string | null): void {
  const found = claimNode(editor, stepId);
  if (found) editor.view.dispatch(editor.state.tr.setNodeAttribute(found.pos, 'dataset', dataset));
}

/** The fields of a claim that are filled in, by key. */
function writtenKeys(editor: Editor, stepId: string): Set<string> {
  const keys = new Set<string>();
  claimNode(editor, stepId)?.node.forEach((field) => {
    if (typeof field.attrs.field === 'string' && field.textContent.trim() !== '') keys.add(field.attrs.field);
  });
  return keys;
}

function flowLabel(view: ClaimView): string | null {
  if (view.flowNumber !== null) return `bound to flow block ${view.flowNumber}`;
  return view.info.binding === 'none' || view.info.kind === null ? 'no flow' : null;
}

function summaryEntries(claims: readonly ClaimView[]): SummaryEntry[] {
  return claims.map((view) => {
    const verdict = shownVerdict(view);
    return {
      stepId: view.info.stepId,
      number: view.info.number,
      kindLabel: view.info.kind ? KIND_LABELS[view.info.kind] : 'Unknown kind',
      name: view.info.name || view.info.note,
      flowLabel: flowLabel(view),
      state: verdict.state,
      stale: verdict.stale,
    };
  });
}

function fileStem(title: string): string {
  return (
    title
      .normalize('NFKD')
      .replace(/[^\w\s-]/g, '')
      .trim()
      .replace(/\s+/g, '-')
      .toLowerCase()
      .slice(0, 60) || 'derivation'
  );
}

function ExportClaimFile({ live, title }: { live: LiveChecks; title: string }) {
  const [choices, setChoices] = useState<ExportChoice[] | null>(null);
  const [said, setSaid] = useState<string | null>(null);
  const save = (choice: ExportChoice, many: boolean) => {
    const name = `${fileStem(title)}${many ? `-${choice.key === 'none' ? 'no-flow' : `flow-${choice.label.match(/\d+/)?.[0] ?? '1'}`}` : ''}-claims.json`;
    downloadText(`${JSON.stringify(choice.file, null, 2)}\n`, name, 'application/json');
    const left = choice.leftOut.length;
    setSaid(
      `Saved ${name}: ${choice.claimCount} ${choice.claimCount === 1 ? 'claim' : 'claims'}.` +
        (left > 0 ? ` Left out, as they cannot be checked as written: ${choice.leftOut.map((c) => `claim ${c.number}`).join(', ')}.` : ''),
    );
  };
  const start = () => {
    const found = live.exportChoices();
    setSaid(null);
    if (found.length === 0) {
      setChoices(null);
      setSaid('There is nothing to export yet: no claim can be checked as written.');
    } else if (found.length === 1) {
      setChoices(null);
      save(found[0]!, false);
    } else {
      setChoices(found);
    }
  };
  return (
    <div>
      <button type="button" className="rounded border border-rule px-2 py-0.5 text-sm hover:border-ink-faint" onClick={start}>
        Export claim file
      </button>
      {choices && (
        <div className="mt-2 text-sm">
          <p className="text-ink-soft">A claim file holds one flow. Save which?</p>
          <ul className="mt-1 flex flex-col gap-1">
            {choices.map((choice) => (
              <li key={choice.key}>
                <button type="button" className="underline decoration-rule hover:decoration-ink" onClick={() => save(choice, true)}>
                  {choice.label} ({choice.claimCount} {choice.claimCount === 1 ? 'claim' : 'claims'})
                </button>
              </li>
            ))}
          </ul>
        </div>
      )}
      {said && (
        <p className="mt-1 text-sm text-ink-soft" role="status">
          {said}
        </p>
      )}
    </div>
  );
}

function ImportClaimFile({ editor, live }: { editor: Editor; live: LiveChecks }) {
  const id = useId();
  const [errors, setErrors] = useState<FieldError[] | null>(null);
  const [said, setSaid] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const onFile = async (event: ChangeEvent<HTMLInputElement>) => {
    const input = event.currentTarget;
    const file = input.files?.[0];
    input.value = '';
    if (!file) return;
    setErrors(null);
    setSaid(null);
    if (file.size > 2 * 1024 * 1024) {
      setErrors([{ field: 'file', message: `${file.name} is larger than 2 MB; a claim file is much smaller` }]);
      return;
    }
    setBusy(true);
    try {
      const answer = await live.importText(await file.text());
      if (!answer.ok) {
        setErrors(answer.errors);
        return;
      }
      if (!editor.isEditable || !editor.commands.insertCheckedBlocks(answer.blocks)) {
        setErrors([{ field: 'file', message: 'the blocks could not be inserted here; put the caret in the text and try again' }]);
        return;
      }
      setSaid(`Imported ${file.name}: ${answer.flow ? 'a flow block and ' : ''}${answer.claimCount} ${answer.claimCount === 1 ? 'claim block' : 'claim blocks'}, inserted after the step with the caret.`);
    } finally {
      setBusy(false);
    }
  };
  return (
    <div>
      <label htmlFor={id} className="text-sm text-ink-soft">
        Import a claim file
      </label>
      <input id={id} type="file" accept=".json,application/json" className="mt-1 block w-full text-sm" disabled={busy} onChange={(event) => void onFile(event)} />
      {errors && (
        <div role="alert" className="mt-1 text-sm text-verdict-invalid">
          <p>Nothing was inserted: the file cannot be imported as it is.</p>
          <ul className="list-disc pl-5">
            {errors.slice(0, 12).map((error) => (
              <li key={`${error.field}-${error.message}`}>{error.message}</li>
            ))}
          </ul>
          {errors.length > 12 && <p>and {errors.length - 12} more.</p>}
        </div>
      )}
      {said && (
        <p className="mt-1 text-sm text-ink-soft" role="status">
          {said}
        </p>
      )}
    </div>
  );
}

/**
 * The live state for the panels, redrawn in a transition: they follow the claims a moment after the
 * blocks, in tasks of their own, so a keystroke's frame never waits for React (whose every commit,
 * while the caret is in the text, also walks the text to keep the selection).
 */
function useLiveSnapshot(live: LiveChecks): LiveSnapshot {
  const [snapshot, setSnapshot] = useState(() => live.snapshot());
  useEffect(() => {
    setSnapshot(live.snapshot());
    return live.subscribe(() => startTransition(() => setSnapshot(live.snapshot())));
  }, [live]);
  return snapshot;
}

export function ChecksSidebar({ editor, title, canEdit }: { editor: Editor; title: string; canEdit: boolean }) {
  const live = liveChecksOf(editor);
  const snapshot = useLiveSnapshot(live);
  const entries = useMemo(() => summaryEntries(snapshot.claims), [snapshot.claims]);
  const open = snapshot.evidenceFor ? snapshot.claims.find((c) => c.info.stepId === snapshot.evidenceFor) : undefined;
  const derivationId = useDerivationId();

  // The open claim's view object changes only when what it shows changes: the plots redraw then only.
  const openDataset = open ? claimDataset(editor, open.info.stepId) : null;
  const evidence = useMemo(() => {
    if (!open) return null;
    const verdict = shownVerdict(open);
    const run: EvidenceRun = { state: verdict.state, result: verdict.result, stale: verdict.stale, message: verdict.message };
    const tight: EvidenceRun | null = open.tight
      ? { state: open.tight.state === 'done' && open.tight.result ? open.tight.result.status : open.tight.state === 'running' || open.tight.state === 'queued' ? 'checking' : open.tight.state === 'cancelled' ? 'cancelled' : 'unchecked', result: open.tight.result }
      : null;
    const stepId = open.info.stepId;
    return (
      <EvidencePanel
        key={stepId}
        title={`Claim ${open.info.number} · ${open.info.kind ? KIND_LABELS[open.info.kind] : 'unknown kind'}`}
        name={open.info.name}
        note={open.info.note}
        flowLabel={flowLabel(open)}
        written={writtenFields(editor, stepId)}
        run={run}
        tight={tight}
        notice={open.note}
        canRunTight={open.state !== 'invalid'}
        onRunTight={() => live.runTight(stepId, tightItem)}
        onCancel={() => live.cancel(stepId)}
        onClose={() => live.openEvidence(null)}
        onShowInText={() => showStep(editor, stepId)}
        extra={
          open.info.kind === 'log-exponent' && derivationId ? (
            <ClaimDatasetSection
              derivationId={derivationId}
              datasetId={claimDataset(editor, stepId)}
              onChange={(dataset) => setClaimDataset(editor, stepId, dataset)}
              canEdit={canEdit}
              result={verdict.result}
              writes={{ value: writtenKeys(editor, stepId).has('value'), power: writtenKeys(editor, stepId).has('power') }}
            />
          ) : undefined
        }
      />
    );
    // openDataset: the claim's dataset is an attribute of its block, not part of its verdict.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [open, editor, live, derivationId, canEdit, openDataset]);

  return (
    <>
      <aside aria-label="Checks" className="checks-panel">
        {snapshot.failure && (
          <p role="alert" className="text-sm text-verdict-invalid">
            {snapshot.failure}
          </p>
        )}
        <details open className="checks-panel-details">
          <summary className="cursor-pointer text-base font-semibold">Checks</summary>
          <div className="checks-panel-list mt-1">
            {snapshot.ready ? (
              <CheckSummary entries={entries} selected={snapshot.evidenceFor} checking={snapshot.busy} onSelect={(stepId) => showStep(editor, stepId)} />
            ) : (
              <p className="text-sm text-ink-faint" role="status">
                Reading the claims…
              </p>
            )}
          </div>
          <section aria-label="Claim file" className="mt-2 flex flex-col gap-3 border-t border-rule pt-2">
            <ExportClaimFile live={live} title={title} />
            {canEdit && <ImportClaimFile editor={editor} live={live} />}
          </section>
        </details>
      </aside>
      {evidence && <EvidenceDrawer onClose={() => live.openEvidence(null)}>{evidence}</EvidenceDrawer>}
    </>
  );
}

/** The evidence beside the text, over the right edge of the page; Esc closes it. */
export function EvidenceDrawer({ children, onClose }: { children: ReactNode; onClose: () => void }) {
  const box = useRef<HTMLDivElement | null>(null);
  useEffect(() => {
    // Focus moves into the evidence and back to where it came from (the claim's Evidence button) on close.
    const from = document.activeElement instanceof HTMLElement ? document.activeElement : null;
    box.current?.focus({ preventScroll: true });
    return () => {
      if (from?.isConnected) from.focus({ preventScroll: true });
    };
  }, []);
  useEffect(() => {
    const onKey = (event: KeyboardEvent) => {
      if (event.key === 'Escape') onClose();
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [onClose]);
  return (
    <div ref={box} tabIndex={-1} className="evidence-drawer" role="complementary" aria-label="Evidence of the claim">
      {children}
    </div>
  );
}
