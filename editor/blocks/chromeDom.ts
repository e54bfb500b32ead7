// Plain DOM for the blocks' chrome (headers, buttons, choosers): the parts around a block's text.

export function element<K extends keyof HTMLElementTagNameMap>(tag: K, className?: string, text?: string): HTMLElementTagNameMap[K] {
  const node = document.createElement(tag);
  if (className) node.className = className;
  if (text !== undefined) node.textContent = text;
  return node;
}

/** A button in a block's chrome: it never takes the caret out of the text, and works from the keyboard. */
export function chromeButton(label: string, onPress: () => void, options: { className?: string; title?: string; editOnly?: boolean } = {}): HTMLButtonElement {
  const button = element('button', `block-button${options.editOnly ? ' block-edit-only' : ''}${options.className ? ` ${options.className}` : ''}`, label);
  button.type = 'button';
  if (options.title) button.title = options.title;
  button.addEventListener('mousedown', (event) => event.preventDefault());
  button.addEventListener('click', (event) => {
    event.preventDefault();
    onPress();
  });
  return button;
}
