'use client';
// A version's text drawn by the editor itself, read-only: the snapshot's bytes become a Y.Doc of
// this page alone (never connected to the collaboration server), so typeset math and blocks look
// exactly as in the working copy. Steps can be marked (compare view) by their step ids. Given the
// verdicts stored with the version, the claim blocks show those rather than checking afresh.
import type { Editor } from '@tiptap/core';
import { useCallback, useEffect, useMemo, useState } from 'react';
import { Awareness } from 'y-protocols/awareness';
import * as Y from 'yjs';
import { Notice } from '@/components/ui';
import { DerivationEditor } from '@/editor/DerivationEditor';
import type { EditorBinding } from '@/editor/extensions';
import { fetchTextAhead } from '@/editor/textAhead';
import type { LiveChecks } from '@/editor/blocks';
import type { VersionClaim } from '@/server/versions/types';
import { StoredEvidenceDrawer, supplyStoredVerdicts } from './StoredEvidence';

// KaTeX and the text's fonts are fetched as this code runs, before the snapshot arrives.
fetchTextAhead();

export type StepMark = 'changed' | 'added' | 'removed' | 'moved';

const markWords: Record<StepMark, string> = { changed: 'changed', added: 'added', removed: 'removed', moved: 'moved' };

export interface SnapshotDocumentProps {
  /** Where the snapshot's bytes are read (a version's or a share link's snapshot route). */
  snapshotUrl: string;
  label: string;
  /** Steps to mark, by step id. */
  marks?: Record<string, StepMark>;
  /** The verdicts stored with the version: the claim blocks show these (and their evidence). */
  stored?: readonly VersionClaim[];
  /** The text's live checks, once the editor is there (for "Check again here" elsewhere on the page). */
  onLive?: (live: LiveChecks | null) => void;
}

const uuid = /^[0-9a-f-]{36}$/i;

function markStyles(scope: string, marks: Record<string, StepMark>): string {
  const colours = `[data-snapshot="${scope}"] { --mark-changed: #1f5f5b; --mark-added: #2f6b2f; --mark-removed: #9c2f23; --mark-moved: #5b4a7a; }`;
  return colours + '\n' + Object.entries(marks)
    .filter(([stepId]) => uuid.test(stepId))
    .map(
      ([stepId, mark]) =>
        `[data-snapshot="${scope}"] .derivation-text > [data-step-id="${stepId}"] { position: relative; outline: 2px solid var(--mark-${mark}); outline-offset: 3px; border-radius: 2px; }` +
        `[data-snapshot="${scope}"] .derivation-text > [data-step-id="${stepId}"]::after { content: "${markWords[mark]}"; position: absolute; right: 0; top: -0.9rem; font-size: 0.75rem; padding: 0 0.3rem; background: var(--mark-${mark}); color: #fbfaf6; border-radius: 2px; }`,
    )
    .join('\n');
}

export function SnapshotDocument({ snapshotUrl, label, marks, stored, onLive }: SnapshotDocumentProps) {
  const [shown, setShown] = useState<{ editor: Editor; live: LiveChecks } | null>(null);
  const onReady = useCallback(
    (editor: Editor) => {
      if (!stored) return;
      const live = supplyStoredVerdicts(editor, stored);
      setShown({ editor, live });
      onLive?.(live);
    },
    [stored, onLive],
  );
  useEffect(() => () => onLive?.(null), [onLive]);
  const [state, setState] = useState<{ doc: Y.Doc; awareness: Awareness } | { error: string } | null>(null);
  const scope = useMemo(() => Math.random().toString(36).slice(2), []);

  useEffect(() => {
    let cancelled = false;
    let made: { doc: Y.Doc; awareness: Awareness } | null = null;
    fetch(snapshotUrl, { credentials: 'same-origin' })
      .then(async (response) => {
        if (!response.ok) {
          const payload = (await response.json().catch(() => null)) as { error?: string } | null;
          throw new Error(payload?.error ?? `The server answered ${response.status}.`);
        }
        return new Uint8Array(await response.arrayBuffer());
      })
      .then((bytes) => {
        if (cancelled) return;
        const doc = new Y.Doc();
        Y.applyUpdate(doc, bytes);
        made = { doc, awareness: new Awareness(doc) };
        setState(made);
      })
      .catch((error: unknown) => !cancelled && setState({ error: error instanceof Error ? error.message : String(error) }));
    return () => {
      cancelled = true;
      if (made) {
        made.awareness.destroy();
        made.doc.destroy();
      }
    };
  }, [snapshotUrl]);

  const binding = useMemo<EditorBinding | null>(
    () => (state && 'doc' in state ? { doc: state.doc, provider: { awareness: state.awareness }, user: { id: 'reader', name: 'Reader', color: '#6b6b6b' } } : null),
    [state],
  );

  if (state && 'error' in state) return <Notice kind="error">The text could not be opened: {state.error}</Notice>;
  if (!binding) return <p className="text-ink-faint" role="status">Opening the text…</p>;
  return (
    <div data-snapshot={scope} className="version-document">
      {marks && <style>{markStyles(scope, marks)}</style>}
      <DerivationEditor binding={binding} editable={false} label={label} onReady={stored ? onReady : undefined} />
      {stored && shown && <StoredEvidenceDrawer live={shown.live} editor={shown.editor} claims={stored} />}
    </div>
  );
}
