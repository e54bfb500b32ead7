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
  /** The sequence number of the last update the stored document includes (0 if none). */
  lastSeq: number;
  /** Bytes stored (snapshot plus updates): an upper bound of the document's encoded size. */
  bytes: number;
}

export interface UpdateRow {
  derivationId: string;
  update: Uint8Array;
  userId: string | null;
}

export interface AppendedRow {
  derivationId: string;
  seq: number;
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
    lastSeq: rows.length > 0 ? rows[rows.length - 1]!.seq : after,
    bytes,
  };
}

// Postgres takes at most 65,535 parameters in one statement; three per row.
const ROWS_PER_STATEMENT = 5_000;

/**
 * Appends rows in order (one statement per few thousand rows, one transaction) and returns the
 * sequence number each got. Committed when the promise resolves.
 */
export async function appendUpdates(rows: readonly UpdateRow[]): Promise<AppendedRow[]> {
  if (rows.length === 0) return [];
  const client = registeredDatabase()?.client;
  if (!client) throw new Error('The database is not open.');
  if (rows.length <= ROWS_PER_STATEMENT) return insertRows(rows, (text, params) => client.query(text, params));
  return client.transaction(async (tx) => {
    const appended: AppendedRow[] = [];
    for (let i = 0; i < rows.length; i += ROWS_PER_STATEMENT) {
      appended.push(...(await insertRows(rows.slice(i, i + ROWS_PER_STATEMENT), (text, params) => tx.query(text, params))));
    }
    return appended;
  });
}

type RunQuery = (text: string, params: unknown[]) => Promise<{ rows: unknown[] }>;

async function insertRows(rows: readonly UpdateRow[], run: RunQuery): Promise<AppendedRow[]> {
  const params: unknown[] = [];
  const values: string[] = [];
  for (const row of rows) {
    const n = params.length;
    values.push(`($${n + 1}, $${n + 2}, $${n + 3})`);
    params.push(row.derivationId, row.update, row.userId);
  }
  const result = await run(
    `insert into document_updates (derivation_id, update, user_id) values ${values.join(', ')} returning seq, derivation_id`,
    params,
  );
  return (result.rows as { seq: number | string; derivation_id: string }[]).map((r) => ({
    derivationId: r.derivation_id,
    seq: Number(r.seq),
  }));
}

/** Stores a snapshot covering every update up to upToSeq and drops those log rows. */
export async function writeSnapshot(derivationId: string, state: Uint8Array, upToSeq: number): Promise<void> {
  await getDb().transaction(async (tx) => {
    await tx
      .insert(schema.documentSnapshots)
      .values({ derivationId, state, upToSeq })
      .onConflictDoUpdate({
        target: schema.documentSnapshots.derivationId,
        set: { state, upToSeq, createdAt: sql`now()` },
        // A snapshot never goes back: only a later one replaces it.
        setWhere: lte(schema.documentSnapshots.upToSeq, upToSeq),
      });
    await tx
      .delete(schema.documentUpdates)
      .where(and(eq(schema.documentUpdates.derivationId, derivationId), lte(schema.documentUpdates.seq, upToSeq)));
  });
}
