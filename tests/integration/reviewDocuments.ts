// Writing steps into a derivation's Y.Doc from a Node client, shaped as the editor stores them
// (ProseMirror JSON through y-prosemirror: elements with attributes, text as XmlText).
import { randomUUID } from 'node:crypto';
import * as Y from 'yjs';
import type { DocNode } from '../../flow/document';
import { toY } from './checksDocument';

export function body(doc: Y.Doc): Y.XmlFragment {
  return doc.getXmlFragment('body');
}

/** A paragraph step with a fresh stepId. */
export function paragraph(text: string, stepId: string = randomUUID()): DocNode {
  return { type: 'paragraph', attrs: { stepId }, content: text ? [{ type: 'text', text }] : [] };
}

export function withStepId(node: DocNode, stepId: string = randomUUID()): DocNode {
  return { ...node, attrs: { ...node.attrs, stepId } };
}

export function appendSteps(doc: Y.Doc, nodes: readonly DocNode[]): void {
  const fragment = body(doc);
  doc.transact(() => fragment.insert(fragment.length, nodes.map(toY)));
}

export function findStep(doc: Y.Doc, stepId: string): Y.XmlElement {
  for (const child of body(doc).toArray()) {
    if (child instanceof Y.XmlElement && child.getAttribute('stepId') === stepId) return child;
  }
  throw new Error(`No step ${stepId} in the document.`);
}

function replaceText(text: Y.XmlText, value: string): void {
  text.doc!.transact(() => {
    text.delete(0, text.length);
    text.insert(0, value);
  });
}

/** Appends text to a paragraph step. */
export function appendToParagraph(doc: Y.Doc, stepId: string, more: string): void {
  const step = findStep(doc, stepId);
  const text = step.toArray().find((c): c is Y.XmlText => c instanceof Y.XmlText);
  if (!text) throw new Error(`Step ${stepId} has no text.`);
  text.insert(text.length, more);
}

/** Sets a block field (a claim's or flow's `field`, or the value of the first row of a kind). */
export function setField(doc: Y.Doc, stepId: string, field: string, value: string, row?: 'parameter' | 'beta' | 'rate'): void {
  const step = findStep(doc, stepId);
  let holder: Y.XmlElement = step;
  if (row) {
    const found = step.toArray().find((c): c is Y.XmlElement => c instanceof Y.XmlElement && c.nodeName === 'blockRow' && c.getAttribute('row') === row);
    if (!found) throw new Error(`Step ${stepId} has no ${row} row.`);
    holder = found;
  }
  const fieldNode = holder.toArray().find((c): c is Y.XmlElement => c instanceof Y.XmlElement && c.getAttribute('field') === field);
  if (!fieldNode) throw new Error(`Step ${stepId} has no field ${field}.`);
  const text = fieldNode.toArray().find((c): c is Y.XmlText => c instanceof Y.XmlText);
  if (text) replaceText(text, value);
  else {
    const created = new Y.XmlText();
    created.insert(0, value);
    fieldNode.insert(0, [created]);
  }
}

export function removeStep(doc: Y.Doc, stepId: string): void {
  const fragment = body(doc);
  const index = fragment.toArray().findIndex((c) => c instanceof Y.XmlElement && c.getAttribute('stepId') === stepId);
  if (index < 0) throw new Error(`No step ${stepId} in the document.`);
  fragment.delete(index, 1);
}
