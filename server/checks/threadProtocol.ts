// Messages between the server and its check thread (plain data: structured clone).
import type { ClaimFile, Report } from '../../flow/types';

export interface ThreadJob {
  file: ClaimFile;
  only: string[];
}

export interface ThreadRequest {
  requestId: number;
  jobs: ThreadJob[];
  timeLimitMs: number;
}

export type ThreadReply =
  | { requestId: number; index: number; report: Report }
  | { requestId: number; index: number; error: string };
