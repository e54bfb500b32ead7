// The standard y-websocket wire protocol (y-protocols sync and awareness messages), read and
// written here so the rooms can decide per message what to accept, store and pass on.
import * as decoding from 'lib0/decoding';
import * as encoding from 'lib0/encoding';
import * as syncProtocol from 'y-protocols/sync';
import * as Y from 'yjs';

export const messageSync = 0;
export const messageAwareness = 1;
export const messageAuth = 2;
export const messageQueryAwareness = 3;

export type IncomingMessage =
  | { kind: 'syncStep1'; stateVector: Uint8Array }
  /** A document update: the answer to our sync step 1 (step2) or a live edit. */
  | { kind: 'update'; update: Uint8Array; step2: boolean }
  | { kind: 'awareness'; update: Uint8Array }
  | { kind: 'queryAwareness' }
  /** A message type this server does not act on (e.g. auth); ignored. */
  | { kind: 'other' };

export class MalformedMessage extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'MalformedMessage';
  }
}

export function readMessage(data: Uint8Array): IncomingMessage {
  try {
    const decoder = decoding.createDecoder(data);
    const type = decoding.readVarUint(decoder);
    switch (type) {
      case messageSync: {
        const step = decoding.readVarUint(decoder);
        const payload = decoding.readVarUint8Array(decoder);
        if (step === syncProtocol.messageYjsSyncStep1) return { kind: 'syncStep1', stateVector: payload };
        if (step === syncProtocol.messageYjsSyncStep2) return { kind: 'update', update: payload, step2: true };
        if (step === syncProtocol.messageYjsUpdate) return { kind: 'update', update: payload, step2: false };
        throw new MalformedMessage(`unknown sync message ${step}`);
      }
      case messageAwareness:
        return { kind: 'awareness', update: decoding.readVarUint8Array(decoder) };
      case messageQueryAwareness:
        return { kind: 'queryAwareness' };
      default:
        return { kind: 'other' };
    }
  } catch (error) {
    if (error instanceof MalformedMessage) throw error;
    throw new MalformedMessage(error instanceof Error ? error.message : String(error));
  }
}

export function syncStep1Message(doc: Y.Doc): Uint8Array {
  const encoder = encoding.createEncoder();
  encoding.writeVarUint(encoder, messageSync);
  syncProtocol.writeSyncStep1(encoder, doc);
  return encoding.toUint8Array(encoder);
}

/** Sync step 2 carrying an update computed beforehand (Y.encodeStateAsUpdate(doc, stateVector)). */
export function syncStep2Message(update: Uint8Array): Uint8Array {
  const encoder = encoding.createEncoder();
  encoding.writeVarUint(encoder, messageSync);
  encoding.writeVarUint(encoder, syncProtocol.messageYjsSyncStep2);
  encoding.writeVarUint8Array(encoder, update);
  return encoding.toUint8Array(encoder);
}

export function updateMessage(update: Uint8Array): Uint8Array {
  const encoder = encoding.createEncoder();
  encoding.writeVarUint(encoder, messageSync);
  syncProtocol.writeUpdate(encoder, update);
  return encoding.toUint8Array(encoder);
}

export function awarenessMessage(awarenessUpdate: Uint8Array): Uint8Array {
  const encoder = encoding.createEncoder();
  encoding.writeVarUint(encoder, messageAwareness);
  encoding.writeVarUint8Array(encoder, awarenessUpdate);
  return encoding.toUint8Array(encoder);
}

/** An update that carries nothing (what an up-to-date client answers to sync step 1). */
export function isEmptyUpdate(update: Uint8Array): boolean {
  if (update.length <= 2) return true;
  const decoded = Y.decodeUpdate(update);
  return decoded.structs.length === 0 && decoded.ds.clients.size === 0;
}

export interface AwarenessEntry {
  clientId: number;
  clock: number;
  state: Record<string, unknown> | null;
}

export function decodeAwarenessUpdate(update: Uint8Array): AwarenessEntry[] {
  try {
    const decoder = decoding.createDecoder(update);
    const count = decoding.readVarUint(decoder);
    const entries: AwarenessEntry[] = [];
    for (let i = 0; i < count; i++) {
      const clientId = decoding.readVarUint(decoder);
      const clock = decoding.readVarUint(decoder);
      const parsed: unknown = JSON.parse(decoding.readVarString(decoder));
      const state = parsed !== null && typeof parsed === 'object' && !Array.isArray(parsed) ? (parsed as Record<string, unknown>) : null;
      entries.push({ clientId, clock, state });
    }
    return entries;
  } catch (error) {
    throw new MalformedMessage(`unreadable presence update (${error instanceof Error ? error.message : String(error)})`);
  }
}

export function encodeAwarenessEntries(entries: AwarenessEntry[]): Uint8Array {
  const encoder = encoding.createEncoder();
  encoding.writeVarUint(encoder, entries.length);
  for (const entry of entries) {
    encoding.writeVarUint(encoder, entry.clientId);
    encoding.writeVarUint(encoder, entry.clock);
    encoding.writeVarString(encoder, JSON.stringify(entry.state));
  }
  return encoding.toUint8Array(encoder);
}
