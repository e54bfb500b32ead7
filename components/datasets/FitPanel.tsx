'use client';
// A dataset drawn with its error bars and fitted to A x^a |ln x|^p: each exponent held at a value
// or left free, the fitted values with their uncertainties and the goodness of fit, and whether
// the data agree with a claimed exponent within their errors. All numerics come from flow/fit.ts,
// run in the fit worker for a large dataset (fitClient.ts) while the panel says "Fitting…".
import { useMemo, useState } from 'react';
import type { ExponentAgreement, PowerLogFit } from '@/flow/fit';
import { PlotFrame, type PlotSeries } from '../plot';
import { StatusWord, type CheckStatus } from '../StatusWord';
import { shownJob, useFitJobs, type ShownJob } from './fitClient';
import type { FitJob } from './fitJobs';
import { axisLabel, datasetPlotSeries, drawnStride, fitPlotSeries, rangeOf, type SeriesInput } from './series';

export type { SeriesInput };

export function formatNumber(v: number, digits = 4): string {
  if (!Number.isFinite(v)) return String(v);
  const a = Math.abs(v);
  return a !== 0 && (a >= 1e5 || a < 1e-3) ? v.toExponential(digits - 1) : String(Number(v.toPrecision(digits)));
}

function ValueWithError({ value, uncertainty, held }: { value: number; uncertainty: number; held: boolean }) {
  if (held) return <span className="font-mono">{formatNumber(value, 6)} (held)</span>;
  return (
    <span className="font-mono">
      {formatNumber(value, 6)} ± {formatNumber(uncertainty, 2)}
    </span>
  );
}

interface ExponentChoice {
  free: boolean;
  value: string;
}

function ExponentControl({ name, words, choice, onChange }: { name: 'a' | 'p'; words: string; choice: ExponentChoice; onChange: (c: ExponentChoice) => void }) {
  return (
    <fieldset className="flex flex-wrap items-center gap-3">
      <legend className="text-sm font-semibold tracking-wide text-ink-soft">
        {name} ({words})
      </legend>
      <label className="inline-flex items-center gap-1">
        <input type="radio" name={`fit-${name}`} checked={choice.free} onChange={() => onChange({ ...choice, free: true })} /> free
      </label>
      <label className="inline-flex items-center gap-1">
        <input type="radio" name={`fit-${name}`} checked={!choice.free} onChange={() => onChange({ ...choice, free: false })} /> held at
      </label>
      <input
        aria-label={`held value of ${name}`}
        className="w-24 rounded border border-rule bg-white/70 px-2 py-0.5 font-mono"
        value={choice.value}
        onChange={(e) => onChange({ free: false, value: e.target.value })}
      />
    </fieldset>
  );
}

const verdictLook: Record<ExponentAgreement['verdict'], { status: CheckStatus; words: (claim: string) => string }> = {
  agrees: { status: 'holds', words: (claim) => `The data agree with ${claim}` },
  disagrees: { status: 'fails', words: (claim) => `The data disagree with ${claim}` },
  undetermined: { status: 'inconclusive', words: (claim) => `No verdict on ${claim}` },
};

export function AgreementVerdict({ agreement }: { agreement: ExponentAgreement }) {
  const look = verdictLook[agreement.verdict];
  return (
    <div className="flex flex-col gap-1" data-testid="agreement" data-verdict={agreement.verdict}>
      <StatusWord status={look.status} label={look.words(`${agreement.parameter} = ${formatNumber(agreement.claimed, 6)}`)} />
      <p className="text-ink-soft">{agreement.reason}</p>
    </div>
  );
}

/** "Fitting…" while the fit worker has a panel's request (the previous answer stays, faded). */
export function Fitting({ shown }: { shown: ShownJob }) {
  if (!shown.fitting) return null;
  return (
    <p role="status" data-testid="fitting" className="mb-2 text-ink-soft">
      Fitting… ({shown.rows.toLocaleString('en-GB')} points)
    </p>
  );
}

function answerOf(shown: ShownJob, kind: 'fit'): { fit: PowerLogFit } | { error: string } | null;
function answerOf(shown: ShownJob, kind: 'agreement'): { agreement: ExponentAgreement } | { error: string } | null;
function answerOf(shown: ShownJob, kind: 'fit' | 'agreement'): { fit: PowerLogFit } | { agreement: ExponentAgreement } | { error: string } | null {
  if (shown.failure) return { error: shown.failure };
  const result = shown.result;
  if (!result) return null;
  if (result.kind === 'refused') return { error: result.message };
  if (result.kind === 'fit' && kind === 'fit') return { fit: result.fit };
  if (result.kind === 'agreement' && kind === 'agreement') return { agreement: result.agreement };
  return null;
}

// Constant so that the plot frame (memoised) is not drawn again on every change of a control.
const NO_PREDICTIONS: PlotSeries[] = [];

/** The dataset drawn with its error bars (beside any predicted curves) and fitted; `predictions` are series of the plot frame. */
export function FitPanel({ series, predictions = NO_PREDICTIONS }: { series: SeriesInput; predictions?: PlotSeries[] }) {
  const n = series.x.values.length;
  // A pass over every row (up to a million): once per dataset, not once per render.
  const positive = useMemo(() => series.x.values.every((v) => v > 0) && series.y.values.every((v) => v > 0), [series]);
  const span = (values: number[]) => {
    const [lo, hi] = rangeOf(values);
    return hi / lo;
  };
  const [logX, setLogX] = useState(() => positive && span(series.x.values) > 20);
  const [logY, setLogY] = useState(() => positive && span(series.y.values) > 20);
  const [a, setA] = useState<ExponentChoice>({ free: true, value: '1' });
  const [p, setP] = useState<ExponentChoice>({ free: false, value: '0' });
  const [claim, setClaim] = useState<{ parameter: 'a' | 'p'; value: string }>({ parameter: 'p', value: '0.25' });

  const held = (c: ExponentChoice): number | null | 'bad' => {
    if (c.free) return null;
    const v = Number(c.value);
    return c.value.trim() !== '' && Number.isFinite(v) ? v : 'bad';
  };

  const heldA = held(a);
  const heldP = held(p);
  const heldBad = heldA === 'bad' || heldP === 'bad';
  const fitJob: FitJob[] | null = heldA === 'bad' || heldP === 'bad' ? null : [{ kind: 'fit', spec: { a: heldA, p: heldP } }];
  const fitShown = shownJob(useFitJobs(series, fitJob));
  const fit = heldBad ? { error: 'A held exponent must be a number.' } : answerOf(fitShown, 'fit');

  const claimed = Number(claim.value);
  const claimBad = claim.value.trim() === '' || !Number.isFinite(claimed);
  const other = held(claim.parameter === 'a' ? p : a);
  const agreementJob: FitJob[] | null =
    claimBad || other === 'bad' ? null : [{ kind: 'agreement', parameter: claim.parameter, claimed, options: { other } }];
  const agreementShown = shownJob(useFitJobs(series, agreementJob));
  const agreement = claimBad
    ? { error: 'The claimed exponent must be a number.' }
    : other === 'bad'
      ? { error: 'A held exponent must be a number.' }
      : answerOf(agreementShown, 'agreement');

  const fitted = fit && 'fit' in fit ? fit.fit : null;
  // The data's points are made once per dataset: a new fit changes only the fitted curve.
  const dataPoints = useMemo(() => datasetPlotSeries(series), [series]);
  const plotted = useMemo<PlotSeries[]>(() => {
    const out: PlotSeries[] = [dataPoints, ...predictions];
    if (fitted) out.push(fitPlotSeries(fitted, series.x.values, logX));
    return out;
  }, [dataPoints, fitted, predictions, series, logX]);
  const stride = drawnStride(n);
  const xAxis = useMemo(() => ({ label: axisLabel(series.x), scale: logX ? ('log' as const) : ('linear' as const) }), [series, logX]);
  const yAxis = useMemo(() => ({ label: axisLabel(series.y), scale: logY ? ('log' as const) : ('linear' as const) }), [series, logY]);
  const notes = useMemo(() => (stride > 1 ? [`Drawn: every ${stride}th of ${n.toLocaleString('en-GB')} points; the fit uses them all.`] : []), [stride, n]);
  const axisChoices = useMemo(
    () => (
      <span className="flex gap-3 text-sm">
        <label className="inline-flex items-center gap-1">
          <input type="checkbox" checked={logX} disabled={!positive} onChange={(e) => setLogX(e.target.checked)} /> log x
        </label>
        <label className="inline-flex items-center gap-1">
          <input type="checkbox" checked={logY} disabled={!positive} onChange={(e) => setLogY(e.target.checked)} /> log y
        </label>
      </span>
    ),
    [logX, logY, positive],
  );

  return (
    <div className="flex flex-col gap-4">
      <PlotFrame
        title={`${axisLabel(series.y)} against ${axisLabel(series.x)}`}
        x={xAxis}
        y={yAxis}
        series={plotted}
        notes={notes}
        actions={axisChoices}
      />

      <section aria-label="Fit" className="rounded border border-rule bg-white/40 p-4">
        <h3 className="mb-2 text-xl">
          Fit to <span className="font-mono text-lg">A x^a |ln x|^p</span>
        </h3>
        <div className="mb-3 flex flex-wrap gap-8">
          <ExponentControl name="a" words="power of x" choice={a} onChange={setA} />
          <ExponentControl name="p" words="power of |ln x|" choice={p} onChange={setP} />
        </div>
        <Fitting shown={fitShown} />
        {fit && 'error' in fit && (
          <p role="alert" className="text-verdict-fails">
            {fit.error}
          </p>
        )}
        {fit && 'fit' in fit && (
          <dl
            className={`grid grid-cols-[12rem_1fr] gap-x-4 gap-y-1 ${fitShown.fitting ? 'opacity-50' : ''}`}
            data-testid="fit-result"
            aria-busy={fitShown.fitting}
          >
            <dt className="text-ink-soft">A</dt>
            <dd>
              <ValueWithError {...fit.fit.A} />
            </dd>
            <dt className="text-ink-soft">a</dt>
            <dd data-testid="fit-a">
              <ValueWithError {...fit.fit.a} />
            </dd>
            <dt className="text-ink-soft">p</dt>
            <dd data-testid="fit-p">
              <ValueWithError {...fit.fit.p} />
            </dd>
            <dt className="text-ink-soft">χ² / degrees of freedom</dt>
            <dd className="font-mono">
              {formatNumber(fit.fit.chi2)} / {fit.fit.dof}
              {fit.fit.dof > 0 && ` = ${formatNumber(fit.fit.reducedChi2, 3)}`}
            </dd>
            <dt className="text-ink-soft">p-value</dt>
            <dd>{fit.fit.pValue === null ? <span className="text-ink-faint">none: the data carry no error bars</span> : <span className="font-mono">{formatNumber(fit.fit.pValue, 3)}</span>}</dd>
            <dt className="text-ink-soft">Method</dt>
            <dd className="text-ink-soft">
              {fit.fit.scale === 'linear' ? 'least squares in y weighted by the error bars' : 'least squares in ln y'}, {fit.fit.points} points;
              uncertainties {fit.fit.weighted ? 'from the error bars' : 'from the scatter'} (covariance matrix)
              {!fit.fit.converged && <strong className="text-verdict-unsure"> — the iteration did not settle</strong>}
            </dd>
          </dl>
        )}
      </section>

      <section aria-label="Claimed exponent" className="rounded border border-rule bg-white/40 p-4">
        <h3 className="mb-2 text-xl">Do the data agree with a claimed exponent?</h3>
        <div className="mb-3 flex flex-wrap items-center gap-3">
          <label className="inline-flex items-center gap-2">
            exponent
            <select
              className="rounded border border-rule bg-white/70 px-2 py-0.5"
              value={claim.parameter}
              onChange={(e) => setClaim({ ...claim, parameter: e.target.value as 'a' | 'p' })}
            >
              <option value="a">a (power of x)</option>
              <option value="p">p (power of |ln x|)</option>
            </select>
          </label>
          <label className="inline-flex items-center gap-2">
            claimed value
            <input className="w-24 rounded border border-rule bg-white/70 px-2 py-0.5 font-mono" value={claim.value} onChange={(e) => setClaim({ ...claim, value: e.target.value })} />
          </label>
          <span className="text-sm text-ink-faint">the other exponent as set for the fit above</span>
        </div>
        <Fitting shown={agreementShown} />
        {agreement && 'error' in agreement && (
          <p role="alert" className="text-verdict-fails">
            {agreement.error}
          </p>
        )}
        {agreement && 'agreement' in agreement && (
          <div className={agreementShown.fitting ? 'opacity-50' : ''} aria-busy={agreementShown.fitting}>
            <AgreementVerdict agreement={agreement.agreement} />
          </div>
        )}
        <p className="mt-2 text-sm text-ink-faint">A fit is evidence, not a proof: it tests the data against the law within their stated errors.</p>
      </section>
    </div>
  );
}
