// Writing derivation bodies into a Yjs document the way the editor stores them (ProseMirror
// JSON as Y.XmlElement / Y.XmlText), for tests that edit working copies over the socket.
import * as Y from 'yjs';
import { BLOCK_FIELD, CLAIM_BLOCK, type DocNode } from '../../flow/document';

/** A block as the editor stores it in Yjs (text without marks is all these tests write). */
export function toY(node: DocNode): Y.XmlElement | Y.XmlText {
  if (node.type === 'text') {
    const text = new Y.XmlText();
    text.insert(0, node.text ?? '');
    return text;
  }
  const element = new Y.XmlElement(node.type);
  for (const [name, value] of Object.entries(node.attrs ?? {})) {
    if (value !== null && value !== undefined) element.setAttribute(name, value as string);
  }
  const children = (node.content ?? []).map(toY);
  if (children.length > 0) element.insert(0, children);
  return element;
}

/** Appends blocks to the body (one transaction). */
export function appendBlocks(doc: Y.Doc, blocks: readonly DocNode[]): void {
  const body = doc.getXmlFragment('body');
  doc.transact(() => body.insert(body.length, blocks.map(toY)));
}

export function blockOfStep(doc: Y.Doc, stepId: string): Y.XmlElement {
  const body = doc.getXmlFragment('body');
  for (const child of body.toArray()) {
    if (child instanceof Y.XmlElement && child.getAttribute('stepId') === stepId) return child;
  }
  throw new Error(`No block with step id ${stepId}`);
}

/** Replaces the text of one field of a block (as an author typing over it). */
export function setField(doc: Y.Doc, stepId: string, field: string, text: string): void {
  const block = blockOfStep(doc, stepId);
  const node = block.toArray().find((child): child is Y.XmlElement => child instanceof Y.XmlElement && child.nodeName === BLOCK_FIELD && child.getAttribute('field') === field);
  if (!node) throw new Error(`Block ${stepId} has no field ${field}`);
  doc.transact(() => {
    node.delete(0, node.length);
    const value = new Y.XmlText();
    value.insert(0, text);
    node.insert(0, [value]);
  });
}

/** Replaces the value of a row of a flow block (e.g. the first beta function). */
export function setRowValue(doc: Y.Doc, stepId: string, row: string, index: number, text: string): void {
  const block = blockOfStep(doc, stepId);
  const rows = block.toArray().filter((child): child is Y.XmlElement => child instanceof Y.XmlElement && child.getAttribute('row') === row);
  const target = rows[index];
  const value = target?.toArray().filter((child): child is Y.XmlElement => child instanceof Y.XmlElement && child.nodeName === BLOCK_FIELD)[1];
  if (!value) throw new Error(`Block ${stepId} has no ${row} row ${index}`);
  doc.transact(() => {
    value.delete(0, value.length);
    const content = new Y.XmlText();
    content.insert(0, text);
    value.insert(0, [content]);
  });
}

export function removeBlock(doc: Y.Doc, stepId: string): void {
  const body = doc.getXmlFragment('body');
  const index = body.toArray().findIndex((child) => child instanceof Y.XmlElement && child.getAttribute('stepId') === stepId);
  if (index < 0) throw new Error(`No block with step id ${stepId}`);
  doc.transact(() => body.delete(index, 1));
}

export function isClaimBlock(element: Y.XmlElement): boolean {
  return element.nodeName === CLAIM_BLOCK;
}
