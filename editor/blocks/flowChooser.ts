// Which flow block a claim is checked against, shown as a button with the current choice. The list
// to choose from is a native select made only while the user chooses: a page of claims holds no
// select. Chromium's form autofill reads every select on the page each time one is added or its
// choice changes, laying out each one's block even far off screen (measured: 70-230 ms tasks while
// a long derivation opened and its first verdicts came in, one select per claim).
import { element } from './chromeDom';

export interface FlowChoice {
  /** '' = the flow block above, 'none' = no flow, else a flow block's stepId. */
  value: string;
  label: string;
}

export class FlowChooser {
  /** The label "Flow" and the choice beside it. */
  readonly dom: HTMLElement;
  private readonly button: HTMLButtonElement;
  private select: HTMLSelectElement | null = null;
  private choices: readonly FlowChoice[] = [];
  private value = '';

  constructor(private readonly onChoose: (value: string) => void) {
    this.dom = element('span', 'block-binding');
    this.button = element('button', 'block-binding-choice');
    this.button.type = 'button';
    this.button.title = 'Which flow block this claim is checked against';
    this.button.setAttribute('aria-haspopup', 'listbox');
    this.button.addEventListener('mousedown', (event) => event.preventDefault());
    this.button.addEventListener('click', (event) => {
      event.preventDefault();
      this.open();
    });
    this.dom.append(element('span', '', 'Flow'), this.button);
  }

  /** Shows the current choice (the first when the value names none of them). */
  show(choices: readonly FlowChoice[], value: string, editable: boolean): void {
    this.choices = choices;
    this.value = value;
    const chosen = choices.find((c) => c.value === value) ?? choices[0];
    const label = chosen?.label ?? '';
    if (this.button.textContent !== label) {
      this.button.textContent = label;
      this.button.setAttribute('aria-label', `Flow: ${label}`);
    }
    this.button.disabled = !editable;
    if (!editable) this.close();
    else if (this.select) this.fill(this.select);
  }

  private fill(select: HTMLSelectElement): void {
    select.replaceChildren(
      ...this.choices.map((choice) => {
        const option = element('option', '', choice.label);
        option.value = choice.value;
        return option;
      }),
    );
    select.value = this.value;
  }

  /** Puts a select with every choice in the button's place, open where the browser can open it. */
  private open(): void {
    if (this.select || this.button.disabled) return;
    const select = element('select', 'block-select');
    select.setAttribute('aria-label', 'Flow');
    this.fill(select);
    select.addEventListener('change', () => {
      const chosen = select.value;
      this.close(true);
      if (chosen !== this.value) this.onChoose(chosen);
    });
    select.addEventListener('blur', () => this.close());
    select.addEventListener('keydown', (event) => {
      if (event.key !== 'Escape') return;
      event.preventDefault();
      this.close(true);
    });
    this.select = select;
    this.button.replaceWith(select);
    select.focus();
    try {
      select.showPicker();
    } catch {
      // Without the user's activation (or support) the select stays, focused, for the keyboard.
    }
  }

  private close(refocus = false): void {
    const select = this.select;
    if (!select) return;
    this.select = null;
    select.replaceWith(this.button);
    if (refocus) this.button.focus();
  }
}
