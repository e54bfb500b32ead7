// Messages between a trajectory plot block and the plot worker (plain data).
import type { FlowSpec, TrajectoryOptions, TrajectoryResult } from '@/flow';

export interface TraceRequest {
  requestId: number;
  spec: FlowSpec;
  /** One trace per starting point (and direction). */
  traces: TrajectoryOptions[];
}

export type TraceReply = { requestId: number; results: TrajectoryResult[] } | { requestId: number; error: string };
