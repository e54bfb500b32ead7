'use client';
// A version's claims carry the server's verdicts, stored with the version (the check report of a
// locked one). The text shows them on the claim blocks (the editor's live checks are told to use
// them, `supplyVerdicts`), the evidence is the stored result, and "Check again here" runs a claim
// in this browser and shows its result beside the stored one. Nothing is written.
import type { Editor } from '@tiptap/core';
import { useCallback, useSyncExternalStore } from 'react';
import { EvidencePanel, type EvidenceRun, type SecondRunWords } from '@/components/checks/EvidencePanel';
import { EvidenceDrawer } from '@/editor/blocks/ChecksSidebar';
import { liveChecksOf, showStep, type LiveChecks, type LiveSnapshot } from '@/editor/blocks';
import type { TightRun } from '@/editor/blocks/live';
import { KIND_LABELS, isClaimKind } from '@/flow/document';
import type { ClaimResult } from '@/flow/types';
import type { VersionClaim } from '@/server/versions/types';

export function kindLabel(kind: string): string {
  return isClaimKind(kind) ? KIND_LABELS[kind] : kind.replace(/-/g, ' ');
}

const CHECK_HERE: SecondRunWords = {
  thisColumn: 'stored with the version',
  column: 'checked here',
  verdict: 'Checked again in this browser:',
  button: 'Check again here',
  running: 'checking in this browser…',
  cancelled: 'The check here was cancelled.',
  settings: 'Settings of the check here',
  explanation: 'Runs the claim again in your browser with the same solver. Nothing is written: the stored verdict remains the version’s.',
};

/** Tells the editor's live checks to show the stored verdicts; returns its live checks. */
export function supplyStoredVerdicts(editor: Editor, claims: readonly VersionClaim[]): LiveChecks {
  const live = liveChecksOf(editor);
  live.supplyVerdicts(new Map<string, ClaimResult>(claims.map((claim) => [claim.stepId, claim.result])));
  return live;
}

const noSnapshot = () => null;
const noSubscription = () => () => undefined;

export function useLiveSnapshot(live: LiveChecks | null): LiveSnapshot | null {
  const subscribe = useCallback((listener: () => void) => (live ? live.subscribe(listener) : noSubscription()), [live]);
  return useSyncExternalStore(subscribe, live ? () => live.snapshot() : noSnapshot, live ? () => live.snapshot() : noSnapshot);
}

function hereRun(here: TightRun | null | undefined): EvidenceRun | null {
  if (!here) return null;
  if (here.state === 'done' && here.result) return { state: here.result.status, result: here.result };
  return { state: here.state === 'running' || here.state === 'queued' ? 'checking' : here.state === 'cancelled' ? 'cancelled' : 'unchecked', result: here.result };
}

function scrollToStep(editor: Editor | null, stepId: string): void {
  if (editor) showStep(editor, stepId);
  else document.querySelector(`[data-step-id="${CSS.escape(stepId)}"]`)?.scrollIntoView({ behavior: 'smooth', block: 'center' });
}

/** One claim's stored evidence, with "Check again here" once the text is open (it holds the claim as written). */
export function StoredClaimEvidence({ claim, number, live, editor, onClose }: { claim: VersionClaim; number: number; live: LiveChecks | null; editor: Editor | null; onClose: () => void }) {
  const snapshot = useLiveSnapshot(live);
  const view = snapshot?.claims.find((c) => c.info.stepId === claim.stepId);
  const canCheckHere = Boolean(live && view?.info.hash);
  return (
    <EvidencePanel
      title={`Claim ${number} · ${kindLabel(claim.kind)}`}
      name={claim.claimId}
      note={view?.info.note ?? ''}
      flowLabel={view?.flowNumber ? `bound to flow block ${view.flowNumber}` : null}
      written={[]}
      run={{ state: claim.status, result: claim.result, message: claim.result.message }}
      tight={hereRun(view?.here)}
      notice={view?.here ? view.note : null}
      canRunTight={canCheckHere}
      onRunTight={() => live?.checkHere(claim.stepId)}
      onCancel={() => live?.cancel(claim.stepId)}
      onClose={onClose}
      onShowInText={() => scrollToStep(editor, claim.stepId)}
      secondRun={CHECK_HERE}
    />
  );
}

/** The evidence drawer opened from a claim block's Evidence button in the version's text. */
export function StoredEvidenceDrawer({ live, editor, claims }: { live: LiveChecks; editor: Editor; claims: readonly VersionClaim[] }) {
  const snapshot = useLiveSnapshot(live);
  const stepId = snapshot?.evidenceFor ?? null;
  const index = stepId ? claims.findIndex((c) => c.stepId === stepId) : -1;
  const close = useCallback(() => live.openEvidence(null), [live]);
  if (index < 0) return null;
  const claim = claims[index]!;
  const number = snapshot?.claims.find((c) => c.info.stepId === claim.stepId)?.info.number ?? index + 1;
  return (
    <EvidenceDrawer onClose={close}>
      <StoredClaimEvidence key={claim.stepId} claim={claim} number={number} live={live} editor={editor} onClose={close} />
    </EvidenceDrawer>
  );
}
