// Messages between the page and the fit worker (plain data; the columns travel once per dataset,
// as transferred Float64Arrays, and later requests name them by id).
import type { FitJob, FitJobResult } from './fitJobs';

export type FitRequest =
  | { type: 'data'; dataId: number; x: Float64Array; y: Float64Array; sigma: Float64Array | null }
  | { type: 'forget'; dataId: number }
  | { type: 'run'; requestId: number; dataId: number; jobs: FitJob[] };

export type FitReply = { requestId: number; results: FitJobResult[] } | { requestId: number; error: string };
