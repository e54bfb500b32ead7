// The collaboration server's limits and timings, from the environment (defaults suit a group of a
// few dozen people on one machine). Read once when the service starts; a bad value stops the start.
import { ConfigError } from '../config';

export interface CollabLimits {
  /** Largest single message a client may send (bytes). */
  maxMessageBytes: number;
  /** Largest document a derivation may grow to (bytes of its encoded state). */
  maxDocumentBytes: number;
  /** How long a room stays in memory after its last client leaves (ms). */
  idleUnloadMs: number;
  /** The update log is compacted into a snapshot after this many updates. */
  snapshotEvery: number;
  /** How often each open connection's session and role are checked again (ms). */
  accessRecheckMs: number;
  /** How often derivations' "last edit" (updatedAt / updatedBy) is written (ms). */
  activityFlushMs: number;
  /** A client whose unsent backlog exceeds this is disconnected (it reconnects and syncs afresh). */
  maxBufferedBytes: number;
}

export const defaultLimits: CollabLimits = {
  maxMessageBytes: 4 * 1024 * 1024,
  maxDocumentBytes: 16 * 1024 * 1024,
  idleUnloadMs: 60_000,
  snapshotEvery: 400,
  accessRecheckMs: 30_000,
  activityFlushMs: 5_000,
  maxBufferedBytes: 64 * 1024 * 1024,
};

const variables: Record<keyof CollabLimits, string> = {
  maxMessageBytes: 'MARGINALIA_COLLAB_MAX_MESSAGE_BYTES',
  maxDocumentBytes: 'MARGINALIA_COLLAB_MAX_DOCUMENT_BYTES',
  idleUnloadMs: 'MARGINALIA_COLLAB_IDLE_MS',
  snapshotEvery: 'MARGINALIA_COLLAB_SNAPSHOT_EVERY',
  accessRecheckMs: 'MARGINALIA_COLLAB_RECHECK_MS',
  activityFlushMs: 'MARGINALIA_COLLAB_ACTIVITY_MS',
  maxBufferedBytes: 'MARGINALIA_COLLAB_MAX_BUFFERED_BYTES',
};

export function readCollabLimits(env: Record<string, string | undefined>): CollabLimits {
  const limits = { ...defaultLimits };
  for (const key of Object.keys(variables) as (keyof CollabLimits)[]) {
    const raw = env[variables[key]];
    if (raw === undefined || raw === '') continue;
    const value = Number(raw);
    if (!Number.isInteger(value) || value < 1) {
      throw new ConfigError(`${variables[key]} must be a whole number of at least 1, not "${raw}".`);
    }
    limits[key] = value;
  }
  return limits;
}
