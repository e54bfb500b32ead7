// A version's snapshot: the Yjs state of the whole working copy, and what it holds read back as
// ProseMirror JSON (the body the editor renders), with a hash of that content. The Y.Doc made
// here never leaves this module: only bytes and plain data cross it.
import { createHash } from 'node:crypto';
import { yXmlFragmentToProsemirrorJSON } from 'y-prosemirror';
import * as Y from 'yjs';
import type { DocNode } from '../../flow/document';
import { stableJson } from '../../flow/stableJson';

/** The editor's XmlFragment of a derivation's Y.Doc (server/collab binds the same one). */
export const BODY_FIELD = 'body';

/** JSON with object keys in sorted order and no spaces (flow/stableJson.ts), so equal content gives equal text. */
export const canonicalJson = stableJson;

export function sha256Hex(data: string | Uint8Array): string {
  return createHash('sha256').update(data).digest('hex');
}

/** The body held by a snapshot, as ProseMirror JSON. */
export function bodyOfState(state: Uint8Array): DocNode {
  const doc = new Y.Doc();
  try {
    Y.applyUpdate(doc, state);
    return yXmlFragmentToProsemirrorJSON(doc.getXmlFragment(BODY_FIELD)) as DocNode;
  } finally {
    doc.destroy();
  }
}

/** SHA-256 of the body's canonical JSON: the same text and blocks give the same hash. */
export function contentHash(body: DocNode): string {
  return sha256Hex(canonicalJson(body));
}
