// The fits a panel asks for, as plain data, so the same request runs on the page (small datasets)
// or in the fit worker (large ones) through the one function below.
import { agreesWithExponent, fitPowerLog, FitInputError, type AgreementOptions, type ExponentAgreement, type FitData, type FitSpec, type PowerLogFit } from '@/flow/fit';
import type { SeriesInput } from './series';

export type FitJob =
  | { kind: 'fit'; spec: FitSpec }
  | { kind: 'agreement'; parameter: 'a' | 'p'; claimed: number; options: AgreementOptions };

/** A job's answer: its fit or agreement, or the data's refusal in words (a FitInputError). */
export type FitJobResult =
  | { kind: 'fit'; fit: PowerLogFit }
  | { kind: 'agreement'; agreement: ExponentAgreement }
  | { kind: 'refused'; message: string };

export function fitDataOf(series: SeriesInput): FitData {
  return { x: series.x.values, y: series.y.values, sigma: series.sigma?.values ?? null };
}

/** Runs one job; a FitInputError becomes a refusal, anything else is thrown on. */
export function runFitJob(data: FitData, job: FitJob): FitJobResult {
  try {
    if (job.kind === 'fit') return { kind: 'fit', fit: fitPowerLog(data, job.spec) };
    return { kind: 'agreement', agreement: agreesWithExponent(data, job.parameter, job.claimed, job.options) };
  } catch (error) {
    if (error instanceof FitInputError) return { kind: 'refused', message: error.message };
    throw error;
  }
}

/** Above this many rows the page hands its fits to the fit worker; below, a fit takes a few milliseconds on the page. */
export const WORKER_FIT_ROWS = 5_000;
