'use client';
// A remark or a reply: a text area and one button. The server's message is shown under the field
// when it refuses; what was typed stays until it is stored.
import { useId, useState, type FormEvent } from 'react';
import { Button } from '../ui';

export function RemarkForm({
  label,
  submitLabel,
  onSubmit,
  autoFocus = false,
  onCancel,
}: {
  label: string;
  submitLabel: string;
  onSubmit: (body: string) => Promise<void>;
  autoFocus?: boolean;
  onCancel?: () => void;
}) {
  const id = useId();
  const [body, setBody] = useState('');
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);

  async function submit(event: FormEvent) {
    event.preventDefault();
    setBusy(true);
    setError(null);
    try {
      await onSubmit(body);
      setBody('');
    } catch (failure) {
      setError(failure instanceof Error ? failure.message : 'The remark could not be stored.');
    } finally {
      setBusy(false);
    }
  }

  return (
    <form onSubmit={submit} className="flex flex-col gap-1.5">
      <label htmlFor={id} className="text-xs font-semibold tracking-wide text-ink-soft">
        {label}
      </label>
      <textarea
        id={id}
        value={body}
        onChange={(event) => setBody(event.target.value)}
        onKeyDown={(event) => {
          if (event.key === 'Enter' && (event.ctrlKey || event.metaKey)) void submit(event);
          if (event.key === 'Escape' && onCancel) onCancel();
        }}
        rows={3}
        autoFocus={autoFocus}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${id}-error` : undefined}
        className="w-full resize-y rounded border border-rule bg-white/70 px-2 py-1 text-sm text-ink focus:border-accent aria-[invalid=true]:border-verdict-fails"
      />
      {error && (
        <p id={`${id}-error`} role="alert" className="text-xs text-verdict-fails">
          {error}
        </p>
      )}
      <div className="flex items-center gap-2">
        <Button type="submit" className="px-2 py-0.5 text-sm" busy={busy} disabled={body.trim() === ''}>
          {submitLabel}
        </Button>
        {onCancel && (
          <Button kind="quiet" className="px-2 py-0.5 text-sm" onClick={onCancel}>
            Cancel
          </Button>
        )}
        <span className="text-xs text-ink-faint">Ctrl+Enter</span>
      </div>
    </form>
  );
}
