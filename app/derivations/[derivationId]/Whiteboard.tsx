'use client';
// The derivation's whiteboard: who is here, the connection state, and the shared text.
import { IntentLink } from '@/components/IntentLink';
import { useEffect, useMemo, useState } from 'react';
import type { Editor } from '@tiptap/core';
import { ConnectionState } from '@/components/ConnectionState';
import { mark } from '@/components/performanceMark';
import { PresenceList } from '@/components/PresenceList';
import { Notice } from '@/components/ui';
import { ChecksSidebar } from '@/editor/blocks/ChecksSidebar';
import { DerivationEditor } from '@/editor/DerivationEditor';
import { DerivationContext } from '@/editor/derivationContext';
import type { EditorBinding } from '@/editor/extensions';
import { usePresence } from '@/editor/presence';
import { closeCodes } from '@/server/collab/closeReasons';
import * as Y from 'yjs';
import { useCollabSession } from './collabSession';
import { takeServerCopy } from './serverCopy';

const nextTask = <T,>(value: T) => new Promise<T>((resolve) => setTimeout(() => resolve(value), 0));

export interface WhiteboardProps {
  derivationId: string;
  title: string;
  user: { id: string; name: string };
  role: string;
  canEdit: boolean;
  onRoleChanged: () => void;
  /** The text is ready and shown (from the server's copy, the connection, this device, or a wait). */
  onTextShown?: () => void;
}

export default function Whiteboard({ derivationId, title, user, role, canEdit, onRoleChanged, onTextShown }: WhiteboardProps) {
  const session = useCollabSession({ derivationId, user: { ...user, role }, onRoleChanged });
  const people = usePresence(session?.provider.awareness ?? null, user.id);
  const binding = useMemo<EditorBinding | null>(
    () => (session ? { doc: session.doc, provider: session.provider, user: session.user } : null),
    // The binding follows the session's document and connection, not its changing state.
    [session?.doc, session?.provider, session?.user],
  );

  const derivation = useMemo(() => ({ derivationId }), [derivationId]);
  const [editor, setEditor] = useState<Editor | null>(null);

  // The server's copy fetched as the page opened goes into the document at once, so the text shows
  // before the connection has synced (which then merges what changed since; the connection state
  // says "connecting" until then, and edits made meanwhile merge too).
  const [serverCopy] = useState(() => takeServerCopy(derivationId));
  const [copiedInto, setCopiedInto] = useState<Y.Doc | null>(null);
  const doc = session?.doc ?? null;
  const provider = session?.provider ?? null;
  useEffect(() => {
    if (!doc || !provider || !serverCopy) return;
    let current = true;
    // In a task of its own: building a long text's views is the page's longest piece of work, and
    // the editor mounting just before it is another.
    void serverCopy.then(nextTask).then((state) => {
      if (!current || !state || doc.isDestroyed) return;
      // Applied as if the connection brought it: the provider does not send it back to the server
      // (a whole copy sent back would count against the document size limit, and a reader's would
      // be logged as a dropped edit); this device's copy still stores it.
      Y.applyUpdate(doc, state, provider);
      mark('marginalia:copy-applied');
      setCopiedInto(doc);
    });
    return () => {
      current = false;
    };
  }, [doc, provider, serverCopy]);

  // Performance marks for the benchmark's profile: the editor mounted, the text ready to show.
  const ready = (session?.ready ?? false) || (doc !== null && copiedInto === doc);
  useEffect(() => {
    if (doc) mark('marginalia:session-opened');
  }, [doc]);
  useEffect(() => {
    if (editor) mark('marginalia:editor-mounted');
  }, [editor]);
  useEffect(() => {
    if (!ready) return;
    mark('marginalia:text-ready');
    onTextShown?.();
  }, [ready, onTextShown]);

  if (!session || !binding) return <p className="text-ink-faint" role="status">Opening the derivation…</p>;
  const final = session.final;
  const editable = canEdit && (!final || final.keepEditing);

  return (
    <section aria-label="Whiteboard" className="mt-6">
      <div className="mb-2 flex flex-wrap items-center justify-between gap-x-6 gap-y-2">
        <ConnectionState phase={session.phase} />
        <PresenceList people={people} />
      </div>
      {final && (
        <div className="mb-3">
          <Notice kind="error">
            {final.message}{' '}
            {final.code === closeCodes.sessionExpired && (
              <>
                Your changes are kept on this device.{' '}
                <IntentLink className="underline" href={`/signin?callbackUrl=${encodeURIComponent(`/derivations/${derivationId}`)}`}>
                  Sign in again
                </IntentLink>
              </>
            )}
          </Notice>
        </div>
      )}
      {!canEdit && (
        <p className="mb-2 text-sm text-ink-soft" data-read-only>
          Read-only: as {role} you can read this derivation and follow it; the text can be changed by its authors.
        </p>
      )}
      {/* The editor is mounted at once, on the document as it is (usually empty), and shown when
          the text is ready: the text arriving then builds its views once, and layout waits for it. */}
      {!ready && (
        <p className="text-ink-faint" role="status">
          Loading the text…
        </p>
      )}
      <DerivationContext.Provider value={derivation}>
        {editor && ready && <ChecksSidebar editor={editor} title={title} canEdit={editable} />}
        <div hidden={!ready}>
          <DerivationEditor binding={binding} editable={editable} label={title} onReady={setEditor} />
        </div>
      </DerivationContext.Provider>
    </section>
  );
}
