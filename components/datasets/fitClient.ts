'use client';
// The page's one fit worker and the hook panels use to ask it: a dataset's columns are sent once
// (transferred, not copied) and forgotten when no panel shows it; each panel's newest request
// replaces its one still waiting; a worker that dies is started again and the waiting panel told
// (the queue: components/workerRequests.ts).
// Small datasets are fitted at once on the page (a few milliseconds), large ones in the worker.
import { useEffect, useId, useMemo, useState } from 'react';
import { fitDataOf, runFitJob, WORKER_FIT_ROWS, type FitJob, type FitJobResult } from './fitJobs';
import type { FitReply, FitRequest } from './fitProtocol';
import type { SeriesInput } from './series';
import { workerRequests } from '../workerRequests';

type FitAnswer = { ok: true; results: FitJobResult[] } | { ok: false; error: string };

/** The id under which the current worker holds each dataset it was sent. */
let sent = new WeakMap<SeriesInput, number>();
const shownBy = new Map<SeriesInput, number>();
let nextDataId = 1;

function post(target: Worker, message: FitRequest, transfer: Transferable[] = []): void {
  target.postMessage(message, transfer);
}

/** The dataset's id in the worker, sending its columns first if the worker does not hold them. */
function dataIdIn(target: Worker, series: SeriesInput): number {
  const known = sent.get(series);
  if (known !== undefined) return known;
  const dataId = nextDataId++;
  const x = Float64Array.from(series.x.values);
  const y = Float64Array.from(series.y.values);
  const sigma = series.sigma ? Float64Array.from(series.sigma.values) : null;
  post(target, { type: 'data', dataId, x, y, sigma }, sigma ? [x.buffer, y.buffer, sigma.buffer] : [x.buffer, y.buffer]);
  sent.set(series, dataId);
  return dataId;
}

const fits = workerRequests<{ series: SeriesInput; jobs: FitJob[] }, FitReply, FitAnswer>({
  start: () => new Worker(new URL('./fit.worker.ts', import.meta.url), { type: 'module', name: 'marginalia-fits' }),
  send: (worker, { series, jobs }, requestId) => post(worker, { type: 'run', requestId, dataId: dataIdIn(worker, series), jobs }),
  answer: (reply) => ('results' in reply ? { ok: true, results: reply.results } : { ok: false, error: `The fit could not be done: ${reply.error}` }),
  failed: { ok: false, error: 'The fit worker stopped unexpectedly and was started again; change a setting to fit again.' },
  onWorkerLost: () => {
    sent = new WeakMap();
  },
});

function retain(series: SeriesInput): void {
  shownBy.set(series, (shownBy.get(series) ?? 0) + 1);
}

function release(series: SeriesInput): void {
  const count = (shownBy.get(series) ?? 1) - 1;
  if (count > 0) {
    shownBy.set(series, count);
    return;
  }
  shownBy.delete(series);
  const dataId = sent.get(series);
  sent.delete(series);
  const worker = fits.current();
  if (worker && dataId !== undefined) post(worker, { type: 'forget', dataId });
}

function runInline(series: SeriesInput, jobs: FitJob[]): FitAnswer {
  const data = fitDataOf(series);
  try {
    return { ok: true, results: jobs.map((job) => runFitJob(data, job)) };
  } catch (error) {
    return { ok: false, error: `The fit could not be done: ${error instanceof Error ? error.message : String(error)}` };
  }
}

export type FitState =
  | { state: 'fitting'; rows: number; /** The answer to the previous request, shown faded meanwhile. */ last: FitJobResult[] | null }
  | { state: 'done'; results: FitJobResult[] }
  | { state: 'failed'; message: string };

/**
 * The answers to `jobs` on `series` (null: nothing to fit). Large datasets are fitted in the fit
 * worker and say 'fitting' until the answer comes; the jobs are compared by value, so a caller
 * may build them afresh on every render.
 */
export function useFitJobs(series: SeriesInput | null, jobs: FitJob[] | null): FitState | null {
  const owner = useId();
  const key = jobs ? JSON.stringify(jobs) : null;
  const inWorker = series !== null && series.x.values.length > WORKER_FIT_ROWS;
  // The jobs are compared through their key, so a caller's fresh array does not fit again.
  const inline = useMemo(() => (series && jobs && !inWorker ? runInline(series, jobs) : null), [series, key, inWorker]);
  const [answer, setAnswer] = useState<{ series: SeriesInput; key: string; answer: FitAnswer } | null>(null);

  useEffect(() => {
    if (!series || !inWorker) return;
    retain(series);
    return () => release(series);
  }, [series, inWorker]);

  useEffect(() => {
    if (!series || !inWorker || key === null) return;
    let current = true;
    void fits.ask(owner, { series, jobs: JSON.parse(key) as FitJob[] }).then((result) => {
      if (current && result) setAnswer({ series, key, answer: result });
    });
    return () => {
      current = false;
      fits.withdraw(owner);
    };
  }, [series, key, inWorker, owner]);

  if (!series || key === null) return null;
  const settled = inline ?? (answer && answer.series === series && answer.key === key ? answer.answer : null);
  if (settled) return settled.ok ? { state: 'done', results: settled.results } : { state: 'failed', message: settled.error };
  const last = answer && answer.series === series && answer.answer.ok ? answer.answer.results : null;
  return { state: 'fitting', rows: series.x.values.length, last };
}

/** One job's answer as a panel shows it: the answer (the previous one while fitting), or why there is none. */
export interface ShownJob {
  result: FitJobResult | null;
  fitting: boolean;
  rows: number;
  failure: string | null;
}

export function shownJob(state: FitState | null, index = 0): ShownJob {
  if (!state) return { result: null, fitting: false, rows: 0, failure: null };
  if (state.state === 'failed') return { result: null, fitting: false, rows: 0, failure: state.message };
  if (state.state === 'done') return { result: state.results[index] ?? null, fitting: false, rows: 0, failure: null };
  return { result: state.last?.[index] ?? null, fitting: true, rows: state.rows, failure: null };
}
