// Share links to a locked version. The token is 32 random bytes (256 bits, base64url); only its
// SHA-256 is stored, so the database alone cannot give a link away. A link expires and can be
// revoked; whoever holds a live one reads that locked version and nothing else (not the working
// copy, not other versions). An unknown token (guessed or altered) is 404; expired or revoked 410.
import { createHash, randomBytes } from 'node:crypto';
import { and, desc, eq, isNull } from 'drizzle-orm';
import { getDb, schema } from '../../db/client';
import { ApiError, conflict, notFound } from '../api/errors';
import { versionDetail, versionRow } from './store';
import type { VersionDetail } from './types';

export const TOKEN_BYTES = 32;
const TOKEN_PATTERN = /^[A-Za-z0-9_-]{43}$/;

/** Length of a share link's "day" in seconds: 86 400, or MARGINALIA_SHARE_DAY_SECONDS (tests let links expire quickly). */
function daySeconds(): number {
  const configured = Number(process.env.MARGINALIA_SHARE_DAY_SECONDS);
  return Number.isFinite(configured) && configured > 0 ? configured : 86_400;
}

export type ShareLinkState = 'active' | 'expired' | 'revoked';

export interface ShareLinkView {
  id: string;
  versionId: string;
  note: string;
  createdBy: string | null;
  createdAt: Date;
  expiresAt: Date;
  revokedAt: Date | null;
  state: ShareLinkState;
}

export function hashShareToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

export function sharePath(token: string): string {
  return `/shared/${token}`;
}

type LinkRow = typeof schema.shareLinks.$inferSelect;

function stateOf(row: Pick<LinkRow, 'revokedAt' | 'expiresAt'>, now = new Date()): ShareLinkState {
  if (row.revokedAt) return 'revoked';
  if (row.expiresAt <= now) return 'expired';
  return 'active';
}

export async function listShareLinks(versionId: string): Promise<ShareLinkView[]> {
  const rows = await getDb()
    .select({ link: schema.shareLinks, createdBy: schema.users.name })
    .from(schema.shareLinks)
    .leftJoin(schema.users, eq(schema.users.id, schema.shareLinks.createdBy))
    .where(eq(schema.shareLinks.versionId, versionId))
    .orderBy(desc(schema.shareLinks.createdAt));
  return rows.map(({ link, createdBy }) => ({
    id: link.id,
    versionId: link.versionId,
    note: link.note,
    createdBy,
    createdAt: link.createdAt,
    expiresAt: link.expiresAt,
    revokedAt: link.revokedAt,
    state: stateOf(link),
  }));
}

/** Makes a link to a locked version; the token is in the answer once and never again. */
export async function createShareLink(input: {
  derivationId: string;
  versionId: string;
  userId: string;
  days: number;
  note: string;
  origin: string;
}): Promise<{ link: ShareLinkView; url: string; token: string }> {
  const version = await versionRow(input.derivationId, input.versionId);
  if (!version.lockedAt) throw conflict(`Version ${version.number} is not locked: only a locked version can be shared.`);
  const token = randomBytes(TOKEN_BYTES).toString('base64url');
  const expiresAt = new Date(Date.now() + input.days * daySeconds() * 1000);
  const [row] = await getDb()
    .insert(schema.shareLinks)
    .values({ versionId: version.id, tokenHash: hashShareToken(token), note: input.note.trim(), createdBy: input.userId, expiresAt })
    .returning({ id: schema.shareLinks.id });
  const link = (await listShareLinks(version.id)).find((l) => l.id === row!.id)!;
  return { link, token, url: `${input.origin}${sharePath(token)}` };
}

export async function revokeShareLink(input: { derivationId: string; linkId: string; userId: string }): Promise<ShareLinkView> {
  const db = getDb();
  const [row] = await db
    .select({ link: schema.shareLinks })
    .from(schema.shareLinks)
    .innerJoin(schema.derivationVersions, eq(schema.derivationVersions.id, schema.shareLinks.versionId))
    .where(and(eq(schema.shareLinks.id, input.linkId), eq(schema.derivationVersions.derivationId, input.derivationId)));
  if (!row) throw notFound('No such share link for this derivation.');
  if (row.link.revokedAt) throw conflict('This share link was already revoked.');
  await db
    .update(schema.shareLinks)
    .set({ revokedAt: new Date(), revokedBy: input.userId })
    .where(and(eq(schema.shareLinks.id, input.linkId), isNull(schema.shareLinks.revokedAt)));
  return (await listShareLinks(row.link.versionId)).find((l) => l.id === input.linkId)!;
}

const gone: Record<Exclude<ShareLinkState, 'active'>, string> = {
  expired: 'This share link has expired. Ask the group lead who sent it for a new one.',
  revoked: 'This share link was revoked by the group lead. Ask them for a new one if you still need it.',
};

export const unknownShareLink = 'There is no share link with this address. Check that it was copied whole.';

/** The locked version a token opens, or 404 (unknown) / 410 (expired, revoked). */
export async function openShareLink(token: string): Promise<{ version: VersionDetail; expiresAt: Date }> {
  if (!TOKEN_PATTERN.test(token)) throw notFound(unknownShareLink);
  const [row] = await getDb().select().from(schema.shareLinks).where(eq(schema.shareLinks.tokenHash, hashShareToken(token)));
  if (!row) throw notFound(unknownShareLink);
  const state = stateOf(row);
  if (state !== 'active') throw new ApiError(410, gone[state]);
  const version = await versionDetail(row.versionId);
  if (!version.locked) throw notFound(unknownShareLink); // cannot happen: links are made to locked versions only
  return { version, expiresAt: row.expiresAt };
}
