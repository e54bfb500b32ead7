// Which steps (top-level blocks of the body, each with a stepId attribute) a Yjs transaction
// touched: for the "document changed" events that clear sign-offs and send mail.
import * as Y from 'yjs';

export const bodyField = 'body';
export const stepIdAttribute = 'stepId';

function stepIdOf(type: Y.AbstractType<any>): string | null {
  if (!(type instanceof Y.XmlElement)) return null;
  const id = type.getAttribute(stepIdAttribute);
  return typeof id === 'string' && id ? id : null;
}

/** The top-level block of the body containing this type, or null if it is not inside the body. */
function stepOf(type: Y.AbstractType<any>, body: Y.XmlFragment): Y.AbstractType<any> | null {
  let current: Y.AbstractType<any> = type;
  for (;;) {
    const item = current._item;
    if (!item) return null; // a root type: the body itself, or another root
    const parent = item.parent;
    if (parent === body) return current;
    if (!(parent instanceof Y.AbstractType)) return null;
    current = parent;
  }
}

/** Ids of the steps whose text or attributes changed, or that were added, in this transaction. */
export function changedStepIds(transaction: Y.Transaction, body: Y.XmlFragment): string[] {
  const ids = new Set<string>();
  for (const type of transaction.changed.keys()) {
    if ((type as unknown) === body) {
      // Blocks added at the top level: their items are newer than the state before the transaction.
      for (let item = body._start; item !== null; item = item.right) {
        if (item.deleted || !(item.content instanceof Y.ContentType)) continue;
        const before = transaction.beforeState.get(item.id.client) ?? 0;
        if (item.id.clock >= before) {
          const id = stepIdOf(item.content.type);
          if (id) ids.add(id);
        }
      }
      continue;
    }
    const step = stepOf(type, body);
    if (step) {
      const id = stepIdOf(step);
      if (id) ids.add(id);
    }
  }
  return [...ids];
}
