// Where a derivation's working copy lives in PGlite: an append-only log of accepted updates plus
// one compacted snapshot. Appends are multi-row INSERTs (the writer groups updates that arrive
// together); compaction replaces the snapshot and drops the log rows it covers in one transaction.
import { and, eq, gt, lte, sql } from 'drizzle-orm';
import { getDb, registeredDatabase, schema } from '../../db/client';

export interface StoredDocument {
  /** The snapshot's state, or null before the first compaction. */
  snapshot: Uint8Array | null;
  /** Updates after the snapshot, in the order they were accepted. */
  updates: Uint8Array[];
  /** Bytes stored (snapshot plus updates): an upper bound of the document's encoded size. */
  bytes: number;
}

export interface UpdateRow {
  derivationId: string;
  update: Uint8Array;
  userId: string | null;
}

export async function loadDocument(derivationId: string): Promise<StoredDocument> {
  const db = getDb();
  const [snapshot] = await db
    .select({ state: schema.documentSnapshots.state, upToSeq: schema.documentSnapshots.upToSeq })
    .from(schema.documentSnapshots)
    .where(eq(schema.documentSnapshots.derivationId, derivationId));
  const after = snapshot?.upToSeq ?? 0;
  const rows = await db
    .select({ seq: schema.documentUpdates.seq, update: schema.documentUpdates.update })
    .from(schema.documentUpdates)
    .where(and(eq(schema.documentUpdates.derivationId, derivationId), gt(schema.documentUpdates.seq, after)))
    .orderBy(schema.documentUpdates.seq);
  let bytes = snapshot?.state.length ?? 0;
  for (const row of rows) bytes += row.update.length;
  return {
    snapshot: snapshot?.state ?? null,
    updates: rows.map((row) => row.update),
    bytes,
  };
}

const uuidPattern = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

function uuidLiteral(value: string): string {
  if (!uuidPattern.test(value)) throw new Error(`Not an id: ${JSON.stringify(value)}`);
  return `'${value}'`;
}

/**
 * Appends rows in order as one multi-row INSERT, committed when the promise resolves. Written as
 * one simple-protocol statement with literal values (ids checked to be UUIDs, bytes as hex): it
 * costs PGlite two protocol round trips where a parameterised query costs six, and this is on the
 * path of every edit. No RETURNING: compaction reads the covered range itself.
 */
export async function appendUpdates(rows: readonly UpdateRow[]): Promise<void> {
  if (rows.length === 0) return;
  const client = registeredDatabase()?.client;
  if (!client) throw new Error('The database is not open.');
  const values = rows.map(
    (row) =>
      `(${uuidLiteral(row.derivationId)}, '\\x${Buffer.from(row.update.buffer, row.update.byteOffset, row.update.byteLength).toString('hex')}', ` +
      `${row.userId === null ? 'null' : uuidLiteral(row.userId)})`,
  );
  await client.exec(`insert into document_updates (derivation_id, update, user_id) values ${values.join(', ')}`);
}

/**
 * Replaces the snapshot and drops the log rows it covers, in one transaction. The state is encoded
 * right after reading the last stored sequence number, inside the transaction (which holds the
 * database, so no append can land in between): every row up to that number was applied to the
 * document before it was stored, hence is in the state. Returns the snapshot's size.
 */
export async function writeSnapshot(derivationId: string, encodeState: () => Uint8Array): Promise<number> {
  return getDb().transaction(async (tx) => {
    const [covered] = await tx
      .select({ upToSeq: sql<number>`coalesce(max(${schema.documentUpdates.seq}), 0)`.mapWith(Number) })
      .from(schema.documentUpdates)
      .where(eq(schema.documentUpdates.derivationId, derivationId));
    const state = encodeState();
    const upToSeq = covered?.upToSeq ?? 0;
    await tx
      .insert(schema.documentSnapshots)
      .values({ derivationId, state, upToSeq })
      .onConflictDoUpdate({
        target: schema.documentSnapshots.derivationId,
        set: { state, upToSeq: sql`greatest(${schema.documentSnapshots.upToSeq}, ${upToSeq})`, createdAt: sql`now()` },
      });
    await tx
      .delete(schema.documentUpdates)
      .where(and(eq(schema.documentUpdates.derivationId, derivationId), lte(schema.documentUpdates.seq, upToSeq)));
    return state.length;
  });
}
