'use client';
// A setting shown as a button naming its current choice; the list to choose from is a native select
// made only while the user chooses, and a value typed in is an input only while it is edited.
// Chromium's form autofill reads every form control on the page each time one is added or changes,
// laying out each one's block even far off screen: a long derivation's plot blocks, a handful of
// selects each, cost it tens of milliseconds whenever the page changed them.
import { useId, useLayoutEffect, useRef, useState, type KeyboardEvent } from 'react';

export interface Choice<T extends string> {
  value: T;
  label: string;
}

const LOOK =
  'inline-flex max-w-[16rem] items-center gap-1 truncate rounded border border-rule bg-paper px-1 py-0.5 text-left text-ink hover:border-ink-faint disabled:cursor-default disabled:border-transparent disabled:bg-transparent';

/** The small down-pointing mark after a choice that can be changed. */
function Mark() {
  return (
    <svg aria-hidden="true" width="8" height="5" viewBox="0 0 8 5" className="shrink-0 text-ink-faint">
      <path d="M0 0h8L4 5z" fill="currentColor" />
    </svg>
  );
}

/** While open, the form control has the focus (and a select its list open); closed, the button gets it back if asked. */
function useOpenFocus<E extends HTMLElement>(open: boolean, setOpen: (open: boolean) => void, onOpened: (element: E) => void) {
  const control = useRef<E>(null);
  const button = useRef<HTMLButtonElement>(null);
  /** How the control was left, once it was: the blur that follows a choice or Esc changes nothing. */
  const left = useRef<'refocus' | 'away' | null>(null);
  useLayoutEffect(() => {
    if (open && control.current) {
      left.current = null;
      onOpened(control.current);
    } else if (!open && left.current === 'refocus') {
      button.current?.focus();
    }
    // onOpened runs when the control appears, not on every render.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [open]);
  /** Leaves the control (the first call counts); says whether this call did. */
  const leave = (refocus: boolean): boolean => {
    if (left.current !== null) return false;
    left.current = refocus ? 'refocus' : 'away';
    setOpen(false);
    return true;
  };
  return { control, button, leave };
}

/** Esc leaves the control without changing anything and goes no further (an open drawer stays). */
function onEscape(event: KeyboardEvent, leave: () => void): void {
  if (event.key !== 'Escape') return;
  event.preventDefault();
  event.stopPropagation();
  leave();
}

export function ChoiceButton<T extends string>({
  label,
  value,
  options,
  onChange,
  onOpen,
  disabled = false,
}: {
  /** What is chosen ("View"), for the accessible name: "View: coupling space". */
  label: string;
  value: T;
  options: readonly Choice<T>[];
  onChange: (value: T) => void;
  /** The user starts choosing (e.g. to fetch what there is to choose from). */
  onOpen?: () => void;
  disabled?: boolean;
}) {
  const [open, setOpen] = useState(false);
  const { control, button, leave } = useOpenFocus<HTMLSelectElement>(open, setOpen, (select) => {
    select.focus();
    try {
      select.showPicker();
    } catch {
      // Without the user's activation (or support) the select stays, focused, for the keyboard.
    }
  });
  const current = options.find((o) => o.value === value) ?? options[0];
  if (open && !disabled) {
    return (
      <select
        ref={control}
        aria-label={label}
        className="max-w-[16rem] rounded border border-rule bg-paper px-1 py-0.5 text-ink"
        value={value}
        onChange={(event) => {
          const chosen = event.target.value as T;
          if (leave(true) && chosen !== value) onChange(chosen);
        }}
        onBlur={() => leave(false)}
        onKeyDown={(event) => onEscape(event, () => leave(true))}
      >
        {options.map((option) => (
          <option key={option.value} value={option.value}>
            {option.label}
          </option>
        ))}
      </select>
    );
  }
  return (
    <button
      ref={button}
      type="button"
      className={LOOK}
      aria-haspopup="listbox"
      aria-label={`${label}: ${current?.label ?? ''}`}
      disabled={disabled}
      onClick={() => {
        onOpen?.();
        setOpen(true);
      }}
    >
      <span className="truncate">{current?.label ?? ''}</span>
      {!disabled && <Mark />}
    </button>
  );
}

/**
 * A value typed in, shown as a button (the value, or `empty` when there is none); an input while
 * edited. Enter or leaving the field hands the text to `onCommit`, which answers what is wrong with
 * it or null; Esc leaves the value as it was. What was wrong is said beside the value, which stays.
 */
export function ValueButton({
  label,
  text,
  empty,
  onCommit,
  disabled = false,
  inputMode,
}: {
  label: string;
  /** The value as text ('' for none). */
  text: string;
  /** What the button says when there is no value ("automatic"). */
  empty: string;
  onCommit: (text: string) => string | null;
  disabled?: boolean;
  inputMode?: 'decimal' | 'numeric' | 'text';
}) {
  const [open, setOpen] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const { control, button, leave } = useOpenFocus<HTMLInputElement>(open, setOpen, (input) => {
    input.focus();
    input.select();
  });
  const problemId = useId();
  const said = problem && (
    <span id={problemId} role="alert" className="text-xs text-verdict-invalid">
      {problem}; it stays {text || empty}
    </span>
  );
  if (open && !disabled) {
    return (
      <>
        <input
          ref={control}
          aria-label={label}
          aria-invalid={problem !== null}
          aria-describedby={problem ? problemId : undefined}
          className="w-24 rounded border border-rule bg-paper px-1 py-0.5 font-mono text-ink"
          inputMode={inputMode}
          defaultValue={text}
          placeholder={empty}
          onBlur={(event) => {
            if (leave(false)) setProblem(onCommit(event.target.value));
          }}
          onKeyDown={(event) => {
            if (event.key === 'Enter') {
              event.preventDefault();
              // Enter with something wrong keeps the field open to mend it.
              const wrong = onCommit(event.currentTarget.value);
              setProblem(wrong);
              if (!wrong) leave(true);
              return;
            }
            onEscape(event, () => {
              setProblem(null);
              leave(true);
            });
          }}
        />
        {said}
      </>
    );
  }
  return (
    <>
      <button
        ref={button}
        type="button"
        className={`${LOOK} font-mono`}
        aria-label={`${label}: ${text || empty}`}
        disabled={disabled}
        onClick={() => {
          setProblem(null);
          setOpen(true);
        }}
      >
        {text || <span className="font-serif text-ink-faint">{empty}</span>}
      </button>
      {said}
    </>
  );
}
