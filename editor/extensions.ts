// The derivation editor's extension list, in one place: later parts (flow blocks, claim blocks,
// plot blocks) add their nodes here. One Y.Doc per derivation; the editor binds its XmlFragment
// `body`. Other root types of the Y.Doc are reserved for later parts (e.g. a Y.Map `meta`).
import type { AnyExtension } from '@tiptap/core';
import Collaboration from '@tiptap/extension-collaboration';
import CollaborationCaret from '@tiptap/extension-collaboration-caret';
import StarterKit from '@tiptap/starter-kit';
import type { Awareness } from 'y-protocols/awareness';
import type * as Y from 'yjs';
import { CheckedBlocks } from './blocks/nodes';
import { plotBlockExtensions } from './blocks/plotBlock';
import { MathDisplay, MathInline } from './math';
import type { PresenceUser } from './presence';
import { StepIds } from './stepIds';
import { TypedTextCaret } from './typedCaret';

export const bodyField = 'body';

export interface EditorBinding {
  doc: Y.Doc;
  /** Anything with the awareness of the connection (the y-websocket provider). */
  provider: { awareness: Awareness };
  user: PresenceUser;
}

function caret(user: Record<string, unknown>): HTMLElement {
  const name = typeof user.name === 'string' ? user.name : 'Someone';
  const colour = typeof user.color === 'string' ? user.color : '#6b6b6b';
  const element = document.createElement('span');
  element.className = 'collab-caret';
  element.style.setProperty('--caret-colour', colour);
  element.setAttribute('data-name', name);
  const label = document.createElement('span');
  label.className = 'collab-caret-label';
  label.textContent = name;
  element.append(label);
  return element;
}

export function derivationExtensions({ doc, provider, user }: EditorBinding): AnyExtension[] {
  return [
    StarterKit.configure({
      // Collaboration brings its own undo, which undoes only this author's changes.
      undoRedo: false,
      // An automatic empty last line, added by every author at once, would pile up.
      trailingNode: false,
      heading: { levels: [1, 2, 3] },
      link: { openOnClick: false, autolink: true },
    }),
    StepIds,
    TypedTextCaret,
    MathInline,
    MathDisplay,
    CheckedBlocks,
    ...plotBlockExtensions,
    Collaboration.configure({ document: doc, field: bodyField }),
    CollaborationCaret.configure({
      provider,
      user,
      render: caret,
      selectionRender: (other: Record<string, unknown>) => ({
        nodeName: 'span',
        class: 'collab-selection',
        style: `background-color: ${typeof other.color === 'string' ? other.color : '#6b6b6b'}33`,
      }),
    }),
  ];
}
