'use client';
// Attaching a dataset of the group to a block: a picker, the dataset's numbers, and the evidence
// a log-exponent claim shows — whether the data agree with the claimed exponents within their
// errors, with the data drawn beside the fitted law. The routes go through the derivation, which
// a block knows (its group it need not).
import { useEffect, useId, useMemo, useState } from 'react';
import type { ExponentAgreement, PowerLogFit } from '@/flow/fit';
import type { ClaimResult } from '@/flow/types';
import { ChoiceButton, type Choice } from '../ChoiceButton';
import { PlotFrame, type PlotSeries } from '../plot';
import { AgreementVerdict, Fitting, formatNumber } from './FitPanel';
import { shownJob, useFitJobs } from './fitClient';
import { fitDataOf, runFitJob, type FitJob, type FitJobResult } from './fitJobs';
import { axisLabel, datasetPlotSeries, fitPlotSeries, rangeOf, type SeriesInput } from './series';

export interface DatasetChoice {
  id: string;
  name: string;
  rowCount: number;
  hasErrorBars: boolean;
}

type Loaded<T> = { state: 'loading' } | { state: 'error'; message: string } | { state: 'ready'; value: T };

async function getJson<T>(path: string, signal: AbortSignal): Promise<T> {
  const response = await fetch(path, { credentials: 'same-origin', signal });
  const payload = (await response.json().catch(() => null)) as (T & { error?: string }) | null;
  if (!response.ok || !payload) throw new Error(payload?.error ?? `The server answered ${response.status}.`);
  return payload;
}

function useJson<T>(path: string | null): Loaded<T> | null {
  const [loaded, setLoaded] = useState<Loaded<T> | null>(null);
  useEffect(() => {
    if (!path) {
      setLoaded(null);
      return;
    }
    const controller = new AbortController();
    setLoaded({ state: 'loading' });
    getJson<T>(path, controller.signal)
      .then((value) => setLoaded({ state: 'ready', value }))
      .catch((error: unknown) => {
        if (!controller.signal.aborted) setLoaded({ state: 'error', message: error instanceof Error ? error.message : 'Loading failed.' });
      });
    return () => controller.abort();
  }, [path]);
  return loaded;
}

/** The datasets of the derivation's group (none asked for while not `wanted`). */
export function useDerivationDatasets(derivationId: string, wanted = true): Loaded<DatasetChoice[]> | null {
  const loaded = useJson<{ datasets: DatasetChoice[] }>(wanted ? `/api/derivations/${derivationId}/datasets` : null);
  if (!loaded || loaded.state !== 'ready') return loaded;
  return { state: 'ready', value: loaded.value.datasets };
}

/** One dataset's x, y and error bars (null id: nothing attached). */
export function useDatasetSeries(derivationId: string, datasetId: string | null): Loaded<SeriesInput> | null {
  return useJson<SeriesInput>(datasetId ? `/api/derivations/${derivationId}/datasets/${datasetId}/columns` : null);
}

interface DatasetPickerProps {
  derivationId: string;
  datasetId: string | null;
  onChange: (datasetId: string | null) => void;
  disabled?: boolean;
  label?: string;
}

/** None, each of the group's datasets, and the attached one if it is no longer there. */
function datasetOptions(datasets: readonly DatasetChoice[], datasetId: string | null): Choice<string>[] {
  const options: Choice<string>[] = [{ value: '', label: 'none' }];
  for (const d of datasets) options.push({ value: d.id, label: `${d.name} (${d.rowCount} rows${d.hasErrorBars ? ', error bars' : ''})` });
  if (datasetId !== null && !datasets.some((d) => d.id === datasetId)) options.push({ value: datasetId, label: 'a dataset that is no longer there' });
  return options;
}

/** "Dataset beside the flow": none, or one of the group's datasets. Read-only roles see the choice but cannot change it. */
export function AttachDatasetPicker({
  derivationId,
  datasetId,
  onChange,
  disabled = false,
  label = 'Dataset beside the flow',
}: DatasetPickerProps) {
  const id = useId();
  const datasets = useDerivationDatasets(derivationId);
  // Until the list is read, only "none" (the select is disabled meanwhile).
  const options = datasets?.state === 'ready' ? datasetOptions(datasets.value, datasetId) : datasetOptions([], null);
  return (
    <span className="inline-flex flex-wrap items-center gap-2 text-sm">
      <label htmlFor={id} className="text-ink-soft">
        {label}
      </label>
      <select
        id={id}
        value={datasetId ?? ''}
        disabled={disabled || datasets?.state !== 'ready'}
        onChange={(e) => onChange(e.target.value || null)}
        className="rounded border border-rule bg-white/70 px-2 py-0.5"
      >
        {options.map((option) => (
          <option key={option.value} value={option.value}>
            {option.label}
          </option>
        ))}
      </select>
      {datasets?.state === 'error' && <span role="alert" className="text-verdict-fails">{datasets.message}</span>}
    </span>
  );
}

/**
 * The same choice as a button naming it (a select only while choosing), for blocks in the text: the
 * group's datasets are fetched once a dataset is attached (to name it) or the user comes to choose.
 */
export function DatasetChoiceButton({
  derivationId,
  datasetId,
  onChange,
  disabled = false,
  label = 'Dataset beside the flow',
}: DatasetPickerProps) {
  const [wanted, setWanted] = useState(false);
  const loaded = useDerivationDatasets(derivationId, wanted || datasetId !== null);
  const options = loaded?.state === 'ready' ? datasetOptions(loaded.value, datasetId) : datasetOptions([], null);
  if (loaded?.state !== 'ready' && datasetId !== null) {
    options.push({ value: datasetId, label: loaded?.state === 'error' ? 'a dataset (the list could not be read)' : 'a dataset (reading the list…)' });
  }
  return (
    <span className="inline-flex flex-wrap items-center gap-2 text-sm" onPointerEnter={() => setWanted(true)} onFocus={() => setWanted(true)}>
      <span className="text-ink-soft" aria-hidden="true">
        {label}
      </span>
      <ChoiceButton label={label} value={datasetId ?? ''} options={options} onChange={(value) => onChange(value || null)} onOpen={() => setWanted(true)} disabled={disabled} />
      {loaded?.state === 'error' && <span role="alert" className="text-verdict-fails">{loaded.message}</span>}
    </span>
  );
}

/** The attached dataset as plot-frame series (points with error bars), for a plot that already draws the flow. */
export function useDatasetOverlay(derivationId: string, datasetId: string | null): { series: PlotSeries[]; note: string | null } {
  const loaded = useDatasetSeries(derivationId, datasetId);
  return useMemo(() => {
    if (!loaded) return { series: [], note: null };
    if (loaded.state === 'loading') return { series: [], note: 'Loading the dataset…' };
    if (loaded.state === 'error') return { series: [], note: `The dataset could not be loaded: ${loaded.message}` };
    return { series: [datasetPlotSeries(loaded.value, `dataset-${datasetId}`)], note: null };
  }, [loaded, datasetId]);
}

export interface ClaimedLaw {
  /** Claimed x in O ~ t^-x |ln t|^p, if the claim states it. */
  power?: number | null;
  /** Claimed p, if the claim states it. */
  logPower?: number | null;
}

export interface DatasetVerdicts {
  agreements: ExponentAgreement[];
  /** The law with the claimed exponents held (amplitude fitted), to draw beside the data. */
  claimedFit: PowerLogFit | null;
  error: string | null;
}

/**
 * What the dataset's abscissa is in the claim's terms: the scaling variable t itself (a reduced
 * temperature), or its inverse (a walk length T ~ 1/t). |ln t| is the same either way; the power is
 * a = -x against t and a = +x against 1/t.
 */
export type Abscissa = 't' | 'inverse';

/** A first guess: an abscissa that reaches above 1 is taken for 1/t (walk lengths, sizes), otherwise for t. */
export function guessAbscissa(series: SeriesInput): Abscissa {
  return rangeOf(series.x.values)[1] > 1 ? 'inverse' : 't';
}

const powerOf = (law: ClaimedLaw, abscissa: Abscissa): number | null => (law.power == null ? null : abscissa === 'inverse' ? law.power : -law.power);

/** The fits behind datasetVerdicts: each claimed exponent tested with the other held (or free), then the claimed law with its amplitude fitted. */
export function verdictJobs(law: ClaimedLaw, abscissa: Abscissa): FitJob[] {
  const a = powerOf(law, abscissa);
  const p = law.logPower ?? null;
  const jobs: FitJob[] = [];
  if (p !== null) jobs.push({ kind: 'agreement', parameter: 'p', claimed: p, options: { other: a } });
  if (a !== null) jobs.push({ kind: 'agreement', parameter: 'a', claimed: a, options: { other: p } });
  if (a !== null || p !== null) jobs.push({ kind: 'fit', spec: { a, p } });
  return jobs;
}

/** The verdicts from the answers to verdictJobs; a refusal by the data stands for all of them. */
export function verdictsFrom(results: readonly FitJobResult[]): DatasetVerdicts {
  const refused = results.find((r) => r.kind === 'refused');
  if (refused) return { agreements: [], claimedFit: null, error: refused.message };
  const agreements = results.flatMap((r) => (r.kind === 'agreement' ? [r.agreement] : []));
  const claimedFit = results.find((r) => r.kind === 'fit');
  return { agreements, claimedFit: claimedFit ? claimedFit.fit : null, error: null };
}

/**
 * Whether the data agree with a claim O ~ t^-x |ln t|^p: each claimed exponent tested with the other
 * held at its claimed value (or free when the claim leaves it open).
 */
export function datasetVerdicts(series: SeriesInput, law: ClaimedLaw, abscissa: Abscissa = 't'): DatasetVerdicts {
  const data = fitDataOf(series);
  return verdictsFrom(verdictJobs(law, abscissa).map((job) => runFitJob(data, job)));
}

/** The law with both exponents held and only its amplitude fitted to the data (none when it states neither). */
function amplitudeJobs(law: ClaimedLaw | undefined, abscissa: Abscissa): FitJob[] {
  if (!law || (law.power == null && law.logPower == null)) return [];
  return [{ kind: 'fit', spec: { a: powerOf(law, abscissa), p: law.logPower ?? null } }];
}

/**
 * The evidence of a log-exponent claim from an attached dataset: verdicts for the claimed exponents,
 * and the data drawn beside the claimed law and, when given, the flow's prediction (the exponents
 * the check measured), each with its amplitude fitted to the data.
 */
export function DatasetEvidence({
  derivationId,
  datasetId,
  law,
  prediction,
}: {
  derivationId: string;
  datasetId: string;
  law: ClaimedLaw;
  prediction?: ClaimedLaw;
}) {
  const loaded = useDatasetSeries(derivationId, datasetId);
  const [chosenAbscissa, setAbscissa] = useState<Abscissa | null>(null);
  const abscissa = chosenAbscissa ?? (loaded?.state === 'ready' ? guessAbscissa(loaded.value) : 't');
  const ready = loaded?.state === 'ready' ? loaded.value : null;
  const forVerdicts = verdictJobs(law, abscissa);
  const state = useFitJobs(ready, [...forVerdicts, ...amplitudeJobs(prediction, abscissa)]);
  const results = state?.state === 'done' ? state.results : state?.state === 'fitting' ? state.last : null;
  const verdicts = state?.state === 'failed' ? { agreements: [], claimedFit: null, error: state.message } : results ? verdictsFrom(results.slice(0, forVerdicts.length)) : null;
  const predictedResult = results?.[forVerdicts.length];
  const predicted = predictedResult?.kind === 'fit' ? predictedResult.fit : null;
  const claimedFit = verdicts?.claimedFit ?? null;
  const fitting = shownJob(state);
  // Passes over every row: once per dataset and answer, not once per render.
  const log = useMemo(() => {
    if (!ready) return false;
    const [lo, hi] = rangeOf(ready.x.values);
    return ready.x.values.every((v) => v > 0) && ready.y.values.every((v) => v > 0) && hi / lo > 20;
  }, [ready]);
  const drawn = useMemo(() => {
    if (!ready) return [];
    const out: PlotSeries[] = [datasetPlotSeries(ready)];
    if (claimedFit) out.push({ ...fitPlotSeries(claimedFit, ready.x.values, log, 'claimed-law'), name: 'claimed law, amplitude fitted' });
    if (predicted) out.push({ ...fitPlotSeries(predicted, ready.x.values, log, 'flow-prediction'), name: 'flow’s prediction, amplitude fitted', look: 'line' });
    return out;
  }, [ready, claimedFit, predicted, log]);
  const axes = useMemo(() => {
    const scale = log ? ('log' as const) : ('linear' as const);
    return { x: { label: ready ? axisLabel(ready.x) : '', scale }, y: { label: ready ? axisLabel(ready.y) : '', scale } };
  }, [ready, log]);
  if (!loaded || loaded.state === 'loading') return <p className="text-ink-faint" role="status">Loading the dataset…</p>;
  if (loaded.state === 'error') return <p role="alert" className="text-verdict-fails">The dataset could not be loaded: {loaded.message}</p>;
  const series = loaded.value;
  return (
    <section aria-label="Evidence from the dataset" className="flex flex-col gap-2" data-testid="dataset-evidence">
      <h4 className="font-semibold">Data: {series.name}</h4>
      <label className="inline-flex flex-wrap items-center gap-2 text-sm">
        <span className="text-ink-soft">Its x, “{series.x.quantity}”, is</span>
        <select value={abscissa} onChange={(e) => setAbscissa(e.target.value as Abscissa)} className="rounded border border-rule bg-white/70 px-2 py-0.5">
          <option value="t">the scaling variable t itself</option>
          <option value="inverse">its inverse, 1/t (e.g. a walk length T)</option>
        </select>
      </label>
      <Fitting shown={fitting} />
      {verdicts?.error && <p role="alert" className="text-verdict-fails">{verdicts.error}</p>}
      <div className={`flex flex-col gap-2 ${fitting.fitting ? 'opacity-50' : ''}`} aria-busy={fitting.fitting}>
        {verdicts?.agreements.map((agreement) => <AgreementVerdict key={agreement.parameter} agreement={agreement} />)}
        {verdicts?.claimedFit && (
          <p className="text-sm text-ink-soft">
            Claimed law with its amplitude fitted: χ²/dof = {formatNumber(verdicts.claimedFit.reducedChi2, 3)}
            {verdicts.claimedFit.pValue !== null && <>, p-value {formatNumber(verdicts.claimedFit.pValue, 3)}</>}.
          </p>
        )}
      </div>
      <PlotFrame
        title={`${axisLabel(series.y)} against ${axisLabel(series.x)}`}
        x={axes.x}
        y={axes.y}
        series={drawn}
        height={260}
      />
    </section>
  );
}

/**
 * The claimed and the measured exponents of a log-exponent check's result, O ~ t^-x |ln t|^p.
 * `writes` says which the claim states (its "value" p and "power" x fields), since a result that
 * claims one exponent carries it as a bare number.
 */
export function lawsFromResult(result: ClaimResult | null, writes: { value: boolean; power: boolean }): { claimed: ClaimedLaw; measured: ClaimedLaw } | null {
  if (!result || (!writes.value && !writes.power)) return null;
  const pick = (m: ClaimResult['measured'], name: 'p' | 'x'): number | null => {
    if (typeof m === 'number') return (name === 'p' ? writes.value : !writes.value && writes.power) ? m : null;
    if (m && !Array.isArray(m) && typeof m[name] === 'number') return m[name]!;
    return null;
  };
  const claimed: ClaimedLaw = { logPower: pick(result.expected, 'p'), power: pick(result.expected, 'x') };
  if (claimed.logPower === null && claimed.power === null) return null;
  const measuredX = result.evidence.values?.['x, measured'];
  const measured: ClaimedLaw = { logPower: pick(result.measured, 'p'), power: typeof measuredX === 'number' ? measuredX : pick(result.measured, 'x') };
  return { claimed, measured };
}

/**
 * The part of a log-exponent claim's evidence that comes from data: which dataset is attached (a
 * choice for those who may edit), and whether its numbers agree with the claimed exponents, drawn
 * beside the claimed law and the flow's prediction.
 */
export function ClaimDatasetSection({
  derivationId,
  datasetId,
  onChange,
  canEdit,
  result,
  writes,
}: {
  derivationId: string;
  datasetId: string | null;
  onChange: (datasetId: string | null) => void;
  canEdit: boolean;
  result: ClaimResult | null;
  writes: { value: boolean; power: boolean };
}) {
  const { value, power } = writes;
  const laws = useMemo(() => lawsFromResult(result, { value, power }), [result, value, power]);
  // Shown at once; the document's attribute (shared with co-authors) follows through onChange.
  const [chosen, setChosen] = useState(datasetId);
  useEffect(() => setChosen(datasetId), [datasetId]);
  const choose = (id: string | null) => {
    setChosen(id);
    onChange(id);
  };
  return (
    <section aria-label="Data beside the claim" className="mt-3 flex flex-col gap-2 border-t border-rule pt-2" data-testid="claim-dataset">
      <AttachDatasetPicker derivationId={derivationId} datasetId={chosen} onChange={choose} disabled={!canEdit} label="Compare with a dataset" />
      {chosen &&
        (laws ? (
          <DatasetEvidence derivationId={derivationId} datasetId={chosen} law={laws.claimed} prediction={laws.measured} />
        ) : (
          <p className="text-sm text-ink-faint">The data are compared once the check has a result with a claimed exponent.</p>
        ))}
    </section>
  );
}
