// A verdict message with its exponents raised whole ("eps^3.01" shows 3.01 as the exponent),
// for React panels and for the claim blocks' plain-DOM views alike. The caret stays in the text,
// unseen, so copying a message gives back what the solver wrote.
import type { CSSProperties } from 'react';
import { messageParts } from '@/flow/format';

const unseen: CSSProperties = { position: 'absolute', width: '1px', height: '1px', overflow: 'hidden', clipPath: 'inset(50%)', whiteSpace: 'nowrap' };
const unseenText = 'position:absolute;width:1px;height:1px;overflow:hidden;clip-path:inset(50%);white-space:nowrap';

export function MessageText({ message }: { message: string }) {
  return (
    <>
      {messageParts(message).map((part, i) =>
        part.exponent ? (
          <span key={i}>
            <span style={unseen}>{part.around?.[0] ?? '^'}</span>
            <sup>{part.text}</sup>
            {part.around?.[1] ? <span style={unseen}>{part.around[1]}</span> : null}
          </span>
        ) : (
          <span key={i}>{part.text}</span>
        ),
      )}
    </>
  );
}

/** Fills an element with the message as text nodes and <sup> exponents (no HTML is parsed). */
export function fillMessage(target: HTMLElement, message: string): void {
  const nodes: Node[] = [];
  for (const part of messageParts(message)) {
    if (!part.exponent) {
      nodes.push(document.createTextNode(part.text));
      continue;
    }
    const hidden = (text: string) => {
      const span = document.createElement('span');
      span.setAttribute('style', unseenText);
      span.textContent = text;
      return span;
    };
    const sup = document.createElement('sup');
    sup.textContent = part.text;
    nodes.push(hidden(part.around?.[0] ?? '^'), sup);
    if (part.around?.[1]) nodes.push(hidden(part.around[1]));
  }
  target.replaceChildren(...nodes);
}
