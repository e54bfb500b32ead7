// Plain building blocks of Marginalia's pages: buttons, fields, notices. Calm, legible, keyboard first.
import { forwardRef, type ButtonHTMLAttributes, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes } from 'react';

type ButtonKind = 'primary' | 'quiet' | 'danger';

const buttonLook: Record<ButtonKind, string> = {
  primary: 'bg-accent text-paper hover:bg-accent-strong border border-accent',
  quiet: 'bg-transparent text-ink border border-rule hover:border-ink-faint',
  danger: 'bg-transparent text-verdict-fails border border-verdict-fails/50 hover:border-verdict-fails',
};

export function Button({
  kind = 'primary',
  className = '',
  busy = false,
  children,
  disabled,
  ...props
}: ButtonHTMLAttributes<HTMLButtonElement> & { kind?: ButtonKind; busy?: boolean }) {
  return (
    <button
      type="button"
      className={`inline-flex items-center justify-center gap-2 rounded px-3 py-1.5 text-base transition-colors disabled:cursor-not-allowed disabled:opacity-60 ${buttonLook[kind]} ${className}`}
      disabled={disabled || busy}
      aria-busy={busy || undefined}
      {...props}
    >
      {children}
    </button>
  );
}

interface FieldShellProps {
  id: string;
  label: string;
  error?: string;
  hint?: string;
  children: ReactNode;
}

export function FieldShell({ id, label, error, hint, children }: FieldShellProps) {
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-sm font-semibold tracking-wide text-ink-soft">
        {label}
      </label>
      {children}
      {hint && !error && (
        <p id={`${id}-hint`} className="text-sm text-ink-faint">
          {hint}
        </p>
      )}
      {error && (
        <p id={`${id}-error`} role="alert" className="text-sm text-verdict-fails">
          {error}
        </p>
      )}
    </div>
  );
}

const inputLook =
  'w-full rounded border border-rule bg-white/70 px-2.5 py-1.5 text-base text-ink placeholder:text-ink-faint focus:border-accent aria-[invalid=true]:border-verdict-fails';

export const TextField = forwardRef<
  HTMLInputElement,
  InputHTMLAttributes<HTMLInputElement> & { id: string; label: string; error?: string; hint?: string }
>(function TextField({ id, label, error, hint, className = '', ...props }, ref) {
  return (
    <FieldShell id={id} label={label} error={error} hint={hint}>
      <input
        ref={ref}
        id={id}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${id}-error` : hint ? `${id}-hint` : undefined}
        className={`${inputLook} ${className}`}
        {...props}
      />
    </FieldShell>
  );
});

export const SelectField = forwardRef<
  HTMLSelectElement,
  SelectHTMLAttributes<HTMLSelectElement> & { id: string; label: string; error?: string; options: readonly { value: string; label: string }[] }
>(function SelectField({ id, label, error, options, className = '', ...props }, ref) {
  return (
    <FieldShell id={id} label={label} error={error}>
      <select
        ref={ref}
        id={id}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${id}-error` : undefined}
        className={`${inputLook} ${className}`}
        {...props}
      >
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </FieldShell>
  );
});

export function Notice({ kind = 'info', children }: { kind?: 'info' | 'error' | 'done'; children: ReactNode }) {
  const look = {
    info: 'border-rule bg-white/60 text-ink-soft',
    error: 'border-verdict-fails/40 bg-verdict-fails/5 text-verdict-fails',
    done: 'border-verdict-holds/40 bg-verdict-holds/5 text-verdict-holds',
  }[kind];
  return (
    <div role={kind === 'error' ? 'alert' : 'status'} className={`rounded border px-3 py-2 ${look}`}>
      {children}
    </div>
  );
}

export function PageTitle({ children, eyebrow }: { children: ReactNode; eyebrow?: ReactNode }) {
  return (
    <header className="mb-6">
      {eyebrow && <p className="mb-1 text-sm uppercase tracking-[0.14em] text-ink-faint">{eyebrow}</p>}
      <h1 className="text-3xl leading-tight">{children}</h1>
    </header>
  );
}

export function Section({ title, children, actions }: { title: string; children: ReactNode; actions?: ReactNode }) {
  return (
    <section className="mt-8" aria-label={title}>
      <div className="mb-3 flex items-baseline justify-between gap-4 border-b border-rule pb-1">
        <h2 className="text-xl">{title}</h2>
        {actions}
      </div>
      {children}
    </section>
  );
}

export function Loading({ what }: { what: string }) {
  return (
    <p className="text-ink-faint" role="status">
      Loading {what}…
    </p>
  );
}

const dateFormat = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric', hour: '2-digit', minute: '2-digit' });

export function When({ iso }: { iso: string | Date }) {
  const date = typeof iso === 'string' ? new Date(iso) : iso;
  return <time dateTime={date.toISOString()}>{dateFormat.format(date)}</time>;
}
