// Versions, the lock, share links and exports: what the route handlers call.
import type { DocNode } from '../../flow/document';
import { schema } from '../../db/client';
import { conflict } from '../api/errors';
import { latexArticle } from './latex';
import type { CheckReport } from './report';
import type { LockOutcome } from './types';

type VersionRow = typeof schema.derivationVersions.$inferSelect;

function fileStem(row: Pick<VersionRow, 'number'>, title = 'derivation'): string {
  const stem = title
    .normalize('NFKD')
    .replace(/[^\w\s-]/g, '')
    .trim()
    .replace(/\s+/g, '-')
    .toLowerCase()
    .slice(0, 50);
  return `${stem || 'derivation'}-v${row.number}`;
}

function download(body: BodyInit, type: string, fileName: string): Response {
  return new Response(body, {
    status: 200,
    headers: { 'content-type': type, 'content-disposition': `attachment; filename="${fileName}"`, 'cache-control': 'no-store' },
  });
}

function requireLocked(row: VersionRow): asserts row is VersionRow & { report: string; lockSha256: string; lockedAt: Date } {
  if (!row.lockedAt || row.report === null || row.lockSha256 === null) {
    throw conflict(`Version ${row.number} is not locked: only a locked version has a check report and exports.`);
  }
}

/** The lock's answer: the locked version, or 409 with the claims that do not hold. */
export function lockAnswer(outcome: LockOutcome): unknown {
  if (outcome.locked) return outcome.version;
  return Response.json({ error: outcome.error, claims: outcome.claims }, { status: 409, headers: { 'cache-control': 'no-store' } });
}

export function snapshotResponse(row: VersionRow): Response {
  return download(new Uint8Array(row.state), 'application/octet-stream', `${fileStem(row)}.yjs`);
}

export function reportResponse(row: VersionRow): Response {
  requireLocked(row);
  return download(row.report, 'application/json; charset=utf-8', `${fileStem(row)}-report.json`);
}

export function articleResponse(row: VersionRow): Response {
  requireLocked(row);
  const report = JSON.parse(row.report) as CheckReport;
  const tex = latexArticle({ body: row.body as DocNode, report, sha256: row.lockSha256 });
  return download(tex, 'application/x-tex; charset=utf-8', `${fileStem(row, report.derivation.title)}.tex`);
}

export { compareVersions, type VersionComparison, type ComparedStep, type ComparedClaim } from './compare';
export { lockVersion } from './lock';
export { createShareLink, listShareLinks, openShareLink, revokeShareLink, type ShareLinkView } from './shareLinks';
export { deleteVersion, listVersions, renameVersion, saveVersion, versionDetail, versionRow } from './store';
export type { LockOutcome, RefusedClaim, VersionChecks, VersionClaim, VersionDetail, VersionSummary } from './types';
