'use client';
// A claim's evidence: what the solver measured beside what the claim says, how sure it is, how it
// was measured (method, settings, statistics, time), the sanity flags, and the plots that show
// convergence (the effective exponent against 1/ln of RG time, the fit against eps). A reviewer
// can run it again with tighter settings and compare. A numerical check is evidence, not a proof.
import type { ReactNode } from 'react';
import type { ClaimResult, Complex, Measured, PlotData, SettingsRecord } from '@/flow/types';
import { PlotFrame } from '../plot';
import { evidencePlot } from '../plot/evidence';
import { formatMeasurement, formatNumber as formatFlowNumber, formatUncertainty, formatValueAt } from '@/flow/format';
import { MessageText } from './MessageText';
import { VerdictBadge } from './VerdictBadge';
import type { VerdictState } from './verdict';

export interface EvidenceRun {
  state: VerdictState;
  result: ClaimResult | null;
  /** The result is from before the latest edit (the claim is being checked again). */
  stale?: boolean;
  message?: string;
}

export interface EvidencePanelProps {
  /** e.g. "Claim 3 · Fixed point" */
  title: string;
  name: string;
  note: string;
  flowLabel: string | null;
  /** The claim's fields as written, label and text. */
  written: { label: string; text: string }[];
  run: EvidenceRun;
  tight: EvidenceRun | null;
  /** Something the user should know about the check (a restart of the worker). */
  notice: string | null;
  canRunTight: boolean;
  onRunTight: () => void;
  onCancel: () => void;
  onClose: () => void;
  onShowInText: () => void;
  /** Further evidence from elsewhere, e.g. an attached dataset (components/datasets). */
  extra?: ReactNode;
  /** Words for the second run beside this one; by default the reviewer's run with tighter settings. */
  secondRun?: SecondRunWords;
}

export interface SecondRunWords {
  /** Column heads: this run and the second one. */
  thisColumn: string;
  column: string;
  /** Before the second run's verdict, e.g. "With tighter settings:". */
  verdict: string;
  button: string;
  running: string;
  cancelled: string;
  /** Heading of the second run's settings. */
  settings: string;
  /** Under the button: what the second run is. */
  explanation: string;
}

const TIGHTER_RUN: SecondRunWords = {
  thisColumn: 'this check',
  column: 'tighter settings',
  verdict: 'With tighter settings:',
  button: 'Run again with tighter settings',
  running: 'running with tighter settings…',
  cancelled: 'The tighter run was cancelled.',
  settings: 'Tighter settings',
  explanation: 'Tighter settings: smaller tolerances, longer RG time, more points and starts; a longer time bound.',
};

// ----- numbers ---------------------------------------------------------------------------------

export function formatNumber(value: number, digits = 12): string {
  return formatFlowNumber(value, digits);
}

function formatComplex(value: number | Complex): string {
  if (typeof value === 'number') return formatNumber(value);
  if (Math.abs(value.im) < 1e-300) return formatNumber(value.re);
  return `${formatNumber(value.re)} ${value.im < 0 ? '−' : '+'} ${formatNumber(Math.abs(value.im))} i`;
}

/** A measured value; given its uncertainty, each real number is written to the digit the uncertainty reaches. */
export function formatMeasured(value: Measured | null, uncertainty: number | null = null): string {
  const real = (v: number) => (uncertainty === null ? formatNumber(v) : formatValueAt(v, uncertainty));
  if (value === null || value === undefined) return '—';
  if (typeof value === 'number') return real(value);
  if (Array.isArray(value)) return value.map((v) => (typeof v === 'number' ? real(v) : formatComplex(v))).join(', ');
  // Several named values may each have their own uncertainty (p and x of a log exponent): full digits then.
  const entries = Object.entries(value);
  return entries.map(([name, v]) => `${name} = ${entries.length === 1 ? real(v) : formatNumber(v)}`).join(', ');
}

function difference(measured: Measured | null, expected: Measured | null): string | null {
  if (typeof measured === 'number' && typeof expected === 'number') return formatNumber(measured - expected, 3);
  if (measured && expected && !Array.isArray(measured) && !Array.isArray(expected) && typeof measured === 'object' && typeof expected === 'object') {
    const parts = Object.keys(expected)
      .filter((k) => typeof measured[k] === 'number' && typeof expected[k] === 'number')
      .map((k) => `${k}: ${formatNumber(measured[k]! - expected[k]!, 3)}`);
    return parts.length > 0 ? parts.join(', ') : null;
  }
  return null;
}

function formatSetting(value: SettingsRecord[string]): string {
  return typeof value === 'number' ? formatNumber(value, 6) : String(value);
}

function formatMs(ms: number): string {
  if (ms < 1) return `${ms.toFixed(2)} ms`;
  if (ms < 1000) return `${ms.toFixed(ms < 10 ? 1 : 0)} ms`;
  return `${(ms / 1000).toFixed(2)} s`;
}

// ----- plots -------------------------------------------------------------------------------------

function EvidencePlot({ plot, index }: { plot: PlotData; index: number }) {
  const drawn = evidencePlot(plot, `evidence-${index}`);
  return <PlotFrame {...drawn} height={240} fileName={`evidence-${index + 1}`} />;
}

// ----- pieces ---------------------------------------------------------------------------------------

function Section({ title, children }: { title: string; children: ReactNode }) {
  return (
    <section className="mt-4">
      <h3 className="mb-1 text-sm font-semibold tracking-wide text-ink-soft">{title}</h3>
      {children}
    </section>
  );
}

function Pairs({ record, label }: { record: SettingsRecord; label: string }) {
  const entries = Object.entries(record);
  if (entries.length === 0) return <p className="text-sm text-ink-faint">none recorded</p>;
  return (
    <dl className="grid grid-cols-[auto_minmax(0,1fr)] gap-x-3 gap-y-0.5 text-sm" aria-label={label}>
      {entries.map(([name, value]) => (
        <div key={name} className="contents">
          <dt className="text-ink-soft">{name}</dt>
          <dd className="break-words font-mono text-xs leading-5">{formatSetting(value)}</dd>
        </div>
      ))}
    </dl>
  );
}

/** The measured value, its real numbers written to the digit the uncertainty reaches. */
function measuredText(result: ClaimResult): string {
  return formatMeasured(result.measured, result.uncertainty);
}

function uncertaintyText(result: ClaimResult): string {
  return result.uncertainty === null ? '—' : `± ${formatUncertainty(result.uncertainty)}`;
}

function Comparison({ run, tight, words }: { run: ClaimResult; tight: ClaimResult | null; words: SecondRunWords }) {
  const rows: { label: string; now: string; tighter?: string }[] = [
    { label: 'Measured', now: measuredText(run), tighter: tight ? measuredText(tight) : undefined },
    { label: 'Uncertainty', now: uncertaintyText(run), tighter: tight ? uncertaintyText(tight) : undefined },
    { label: 'Claimed', now: formatMeasured(run.expected), tighter: tight ? formatMeasured(tight.expected) : undefined },
    { label: 'Measured − claimed', now: difference(run.measured, run.expected) ?? '—', tighter: tight ? (difference(tight.measured, tight.expected) ?? '—') : undefined },
    { label: 'Tolerance', now: run.tolerance === null ? '—' : run.tolerance.toExponential(1), tighter: tight ? (tight.tolerance === null ? '—' : tight.tolerance.toExponential(1)) : undefined },
    { label: 'Time taken', now: formatMs(run.ms), tighter: tight ? formatMs(tight.ms) : undefined },
  ];
  return (
    <table className="w-full text-sm" data-evidence-values>
      {tight && (
        <thead>
          <tr className="text-left text-xs text-ink-faint">
            <th className="font-normal" />
            <th className="font-normal">{words.thisColumn}</th>
            <th className="font-normal">{words.column}</th>
          </tr>
        </thead>
      )}
      <tbody>
        {rows.map((row) => (
          <tr key={row.label} className="align-baseline">
            <th scope="row" className="w-32 py-0.5 pr-3 text-left font-normal text-ink-soft">
              {row.label}
            </th>
            <td className="break-all py-0.5 font-mono text-xs" data-value={row.label}>
              {row.now}
            </td>
            {tight && (
              <td className="break-all py-0.5 font-mono text-xs" data-tight-value={row.label}>
                {row.tighter}
              </td>
            )}
          </tr>
        ))}
      </tbody>
    </table>
  );
}

function Sanity({ result }: { result: ClaimResult }) {
  if (result.sanity.length === 0) return <p className="text-sm text-ink-faint">none for this kind of claim</p>;
  return (
    <ul className="flex flex-col gap-1 text-sm">
      {result.sanity.map((flag) => (
        <li key={`${flag.check}-${flag.message}`} className="flex items-baseline gap-2">
          <VerdictBadge state={flag.ok ? 'holds' : 'invalid'} label={flag.ok ? 'fine' : 'look at this'} className="shrink-0 text-xs" />
          <span>
            <span className="text-ink-soft">{flag.check}: </span>
            {flag.message}
          </span>
        </li>
      ))}
    </ul>
  );
}

function FoundValues({ result }: { result: ClaimResult }) {
  const { fixedPoints, complexFixedPoints, counterexample, coefficients, values } = result.evidence;
  const parts: ReactNode[] = [];
  if (fixedPoints && fixedPoints.length > 0) {
    parts.push(
      <Section key="fp" title="Fixed points found">
        <ul className="flex flex-col gap-1 text-sm">
          {fixedPoints.map((fp, i) => (
            <li key={i}>
              <span className="font-mono text-xs">{formatMeasured(fp.position)}</span>: {fp.relevant} relevant {fp.relevant === 1 ? 'direction' : 'directions'}; eigenvalues{' '}
              {fp.eigenvalues.map((e, j) => `${formatComplex(e)} (${fp.classification[j] ?? '?'})`).join(', ')}
            </li>
          ))}
        </ul>
      </Section>,
    );
  }
  if (complexFixedPoints && complexFixedPoints.length > 0) {
    parts.push(
      <Section key="cfp" title="Complex fixed points (no real one near the guess)">
        <ul className="text-sm">
          {complexFixedPoints.map((point, i) => (
            <li key={i} className="font-mono text-xs">
              {Object.entries(point)
                .map(([name, value]) => `${name} = ${formatComplex(value)}`)
                .join(', ')}
            </li>
          ))}
        </ul>
      </Section>,
    );
  }
  if (counterexample) {
    parts.push(
      <Section key="cx" title="Where the claim is false">
        <p className="font-mono text-xs">{formatMeasured(counterexample)}</p>
      </Section>,
    );
  }
  if (coefficients && coefficients.length > 0) {
    parts.push(
      <Section key="co" title="Expansion coefficients found">
        <table className="text-sm">
          <tbody>
            {coefficients.map((c) => (
              <tr key={`${c.of ?? ''}${c.power}`}>
                <th scope="row" className="pr-3 text-left font-normal text-ink-soft">
                  {c.of ? `${c.of}, ` : ''}eps<sup>{c.power}</sup>
                </th>
                <td className="font-mono text-xs">{formatMeasurement(c.value, c.uncertainty)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </Section>,
    );
  }
  if (values && Object.keys(values).length > 0) {
    parts.push(
      <Section key="va" title="Further values">
        <Pairs record={values} label="Further values" />
      </Section>,
    );
  }
  return <>{parts}</>;
}

// ----- the panel ---------------------------------------------------------------------------------

export function EvidencePanel(props: EvidencePanelProps) {
  const { run, tight } = props;
  const result = run.result;
  const tightResult = tight?.result ?? null;
  const tightRunning = tight?.state === 'checking' || tight?.state === 'queued';
  const words = props.secondRun ?? TIGHTER_RUN;
  return (
    <article aria-label={`Evidence: ${props.title}`} className="rounded border border-rule bg-white/80 p-3" data-evidence-panel>
      <header className="flex flex-wrap items-start justify-between gap-2">
        <div>
          <h2 className="text-lg font-semibold leading-tight">{props.title}</h2>
          {props.name && <p className="text-sm text-ink-soft">{props.name}</p>}
          {props.flowLabel && <p className="text-xs text-ink-faint">{props.flowLabel}</p>}
        </div>
        <div className="flex gap-1">
          <button type="button" className="rounded border border-rule px-2 py-0.5 text-sm hover:border-ink-faint" onClick={props.onShowInText}>
            Show in the text
          </button>
          <button type="button" className="rounded border border-rule px-2 py-0.5 text-sm hover:border-ink-faint" onClick={props.onClose}>
            Close
          </button>
        </div>
      </header>

      <p className="mt-3 rounded bg-accent-soft/60 px-2 py-1 text-sm" data-evidence-caveat>
        A numerical check is evidence, not a proof: the solver measured the claim at finitely many points, in finite precision, within a time bound.
      </p>

      <div className={`mt-3 ${run.stale ? 'opacity-60' : ''}`}>
        <VerdictBadge state={run.state} className="text-base font-semibold" />
        {run.message && (
          <p className="mt-1 text-sm" data-evidence-message>
            <MessageText message={run.message} />
          </p>
        )}
        {props.note && <p className="mt-1 text-sm italic text-ink-soft">Note: {props.note}</p>}
        {props.notice && <p className="mt-1 text-sm italic text-ink-soft">{props.notice}.</p>}
      </div>

      {result && result.method !== 'none' && (
        <>
          <Section title="Measured and claimed">
            <Comparison run={result} tight={tightResult} words={words} />
            {tight && tightResult && (
              <p className="mt-1 flex items-baseline gap-2 text-sm">
                {words.verdict} <VerdictBadge state={tightResult.status} />
              </p>
            )}
            {tight && tightResult && tightResult.message !== result.message && (
              <p className="mt-1 text-sm text-ink-soft">
                <MessageText message={tightResult.message} />
              </p>
            )}
          </Section>
          <Section title="Method">
            <p className="text-sm">{result.method}</p>
          </Section>
          <Section title="Solver settings">
            <Pairs record={result.settings} label="Solver settings" />
          </Section>
          {tightResult && (
            <Section title={words.settings}>
              <Pairs record={tightResult.settings} label={words.settings} />
            </Section>
          )}
          <Section title="Solver statistics">
            <Pairs record={result.stats} label="Solver statistics" />
          </Section>
          <Section title="Sanity flags">
            <Sanity result={result} />
          </Section>
          <FoundValues result={result} />
          {(result.evidence.plots ?? []).length > 0 && (
            <Section title="Convergence">
              <div className="flex flex-col gap-3">
                {(result.evidence.plots ?? []).map((plot, i) => (
                  <EvidencePlot key={`${plot.title}-${i}`} plot={plot} index={i} />
                ))}
              </div>
            </Section>
          )}
        </>
      )}

      <div className="mt-4 flex flex-wrap items-center gap-2">
        <button
          type="button"
          className="rounded border border-accent bg-accent px-3 py-1 text-sm text-paper hover:bg-accent-strong disabled:cursor-not-allowed disabled:opacity-60"
          disabled={!props.canRunTight || tightRunning}
          onClick={props.onRunTight}
        >
          {words.button}
        </button>
        {tightRunning && (
          <>
            <VerdictBadge state="checking" label={words.running} />
            <button type="button" className="rounded border border-rule px-2 py-0.5 text-sm hover:border-ink-faint" onClick={props.onCancel}>
              Cancel
            </button>
          </>
        )}
        {tight?.state === 'cancelled' && <span className="text-sm text-ink-soft">{words.cancelled}</span>}
      </div>
      <p className="mt-1 text-xs text-ink-faint">{words.explanation}</p>

      {props.written.length > 0 && (
        <Section title="The claim as written">
          <dl className="grid grid-cols-[auto_minmax(0,1fr)] gap-x-3 gap-y-0.5 text-sm">
            {props.written.map((field) => (
              <div key={field.label} className="contents">
                <dt className="text-ink-soft">{field.label}</dt>
                <dd className="break-words font-mono text-xs leading-5">{field.text}</dd>
              </div>
            ))}
          </dl>
        </Section>
      )}
      {props.extra}
    </article>
  );
}
