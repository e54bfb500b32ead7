// The field worker: previews every field of the document's flow and claim blocks with flow/
// (TeX from mathjs, or the solver's message), and turns claim files into blocks for an import.
// Nothing it is sent can stop it: a failure is answered as a message.
import type { DocNode } from '@/flow/document';
import { previewDocument } from '@/flow/document/preview';
import { importClaimFile } from './reading';
import type { FieldAnswer, FieldRequest } from './protocol';

interface Scope {
  postMessage(message: FieldAnswer): void;
  onmessage: ((event: { data: FieldRequest }) => void) | null;
}
const scope = self as unknown as Scope;

scope.onmessage = ({ data }) => {
  try {
    if (data.type === 'read') scope.postMessage({ type: 'previews', seq: data.seq, previews: previewDocument(data.blocks as DocNode[]) });
    else if (data.type === 'import') scope.postMessage({ type: 'imported', seq: data.seq, answer: importClaimFile(data.text) });
  } catch (error) {
    scope.postMessage({ type: 'failed', seq: data.seq, message: error instanceof Error ? error.message : String(error) });
  }
};
