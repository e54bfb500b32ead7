// The check report of a locked version: what was checked (each claim as the solver read it and
// its flow), each claim's whole result (value, uncertainty, method, solver settings, statistics,
// evidence), the solver's time bound and the versions of the software that computed it. Stored
// and served as the exact JSON text that the lock's SHA-256 covers.
import { readFileSync } from 'node:fs';
import path from 'node:path';
import type { DocumentCheck } from '../checks/access';
import { countsOf, type CheckCounts } from '../checks/results';
import type { ClaimResult, FlowSpec, Status } from '../../flow/types';

export const REPORT_FORMAT = 'marginalia check report v1';

export interface ReportClaim {
  position: number;
  stepId: string;
  id: string;
  kind: string;
  flowStepId: string | null;
  /** The claim as the solver read it (null when the block could not be read: invalid input). */
  input: Record<string, unknown> | null;
  status: Status;
  result: ClaimResult;
}

export interface CheckReport {
  format: typeof REPORT_FORMAT;
  derivation: { id: string; title: string; group: string };
  version: { id: string; number: number; name: string };
  lockedAt: string;
  lockedBy: { id: string; name: string };
  snapshotSha256: string;
  contentSha256: string;
  software: Record<string, string>;
  solver: { timeLimitMsPerClaim: number; note: string };
  summary: CheckCounts & { claims: number };
  flows: { stepId: string; name: string; spec: FlowSpec | null }[];
  claims: ReportClaim[];
}

function installedVersion(name: string): string {
  try {
    const file = path.join(process.cwd(), 'node_modules', name, 'package.json');
    return (JSON.parse(readFileSync(file, 'utf8')) as { version?: string }).version ?? 'unknown';
  } catch {
    return 'unknown';
  }
}

/** Versions of what computed the verdicts: our solver (flow/, part of Marginalia) and its libraries. */
export function softwareVersions(): Record<string, string> {
  let own = 'unknown';
  try {
    own = (JSON.parse(readFileSync(path.join(process.cwd(), 'package.json'), 'utf8')) as { version?: string }).version ?? own;
  } catch {
    // keep "unknown"
  }
  return { marginalia: own, flow: own, mathjs: installedVersion('mathjs'), odex: installedVersion('odex'), node: process.version };
}

export interface ReportInput {
  derivation: { id: string; title: string; group: string };
  version: { id: string; number: number; name: string };
  lockedAt: Date;
  lockedBy: { id: string; name: string };
  snapshotSha256: string;
  contentSha256: string;
  check: DocumentCheck;
}

export function buildReport(input: ReportInput): CheckReport {
  const claimOfStep = new Map(input.check.reading.claims.map((c) => [c.stepId, c]));
  const claims: ReportClaim[] = input.check.claims.map((c) => ({
    position: c.position,
    stepId: c.stepId,
    id: c.claimId,
    kind: c.kind,
    flowStepId: c.flowStepId,
    input: claimOfStep.get(c.stepId)?.claim ?? null,
    status: c.result.status,
    result: c.result,
  }));
  const counts = countsOf(claims.map((c) => c.status));
  return {
    format: REPORT_FORMAT,
    derivation: input.derivation,
    version: input.version,
    lockedAt: input.lockedAt.toISOString(),
    lockedBy: input.lockedBy,
    snapshotSha256: input.snapshotSha256,
    contentSha256: input.contentSha256,
    software: softwareVersions(),
    solver: {
      timeLimitMsPerClaim: input.check.timeLimitMs,
      note: 'Every claim was checked afresh on the server by flow/ at lock time; each result lists its method, settings and statistics.',
    },
    summary: { ...counts, claims: claims.length },
    flows: input.check.reading.flows.map((f) => ({ stepId: f.stepId, name: f.name, spec: f.spec })),
    claims,
  };
}

/** The report as stored, served and hashed: indented JSON with a final newline. */
export function reportText(report: CheckReport): string {
  return `${JSON.stringify(report, null, 2)}\n`;
}
