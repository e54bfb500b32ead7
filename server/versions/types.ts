// What the versions part stores and answers (plain data; dates as Date, ISO strings on the wire).
import type { CheckCounts, ClaimPlace } from '../checks/results';
import type { ClaimResult, Status } from '../../flow/types';

/** One claim of a version with the verdict the server found for exactly this content. */
export interface VersionClaim extends ClaimPlace {
  status: Status;
  result: ClaimResult;
}

/** The verdicts stored with a version (the `checks` column). */
export interface VersionChecks {
  checkedAt: string;
  summary: CheckCounts;
  claims: VersionClaim[];
}

export interface LockInfo {
  lockedAt: Date;
  lockedBy: { id: string; name: string } | null;
  sha256: string;
}

export interface VersionSummary {
  id: string;
  derivationId: string;
  number: number;
  name: string;
  createdAt: Date;
  createdBy: { id: string; name: string } | null;
  summary: CheckCounts & { claims: number };
  locked: LockInfo | null;
}

export interface VersionDetail extends VersionSummary {
  derivation: { id: string; title: string; groupId: string; groupName: string };
  contentSha256: string;
  snapshotBytes: number;
  checks: VersionChecks;
  /** How the lock's SHA-256 is computed (locked versions). */
  hash: { format: string; recipe: string } | null;
}

export interface RefusedClaim {
  stepId: string;
  claimId: string;
  kind: string;
  status: Status;
  message: string;
}

export type LockOutcome =
  | { locked: true; version: VersionDetail }
  | { locked: false; error: string; claims: RefusedClaim[] };
