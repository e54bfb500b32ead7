// Why the collaboration socket closed, as the page shows it. Pure constants: the server closes
// with these codes and the derivation page (in the browser) words them. Codes 4400-4499 are final
// (a standard y-websocket client stops reconnecting); 4500-4599 and the standard codes are passing.
export const closeCodes = {
  /** The message could not be read as the sync protocol. */
  malformed: 4400,
  /** The session cookie is no longer valid (expired, or the account is gone). */
  sessionExpired: 4401,
  /** The user is no longer a member of the derivation's group. */
  accessRemoved: 4403,
  /** The derivation was deleted. */
  derivationGone: 4404,
  /** Accepting the update would make the document larger than the limit. */
  documentTooLarge: 4413,
  /** A single message was larger than the limit. */
  messageTooLarge: 4414,
  /** The user's role changed: the client reconnects and gets the new rights. */
  roleChanged: 4501,
  /** The client did not keep up with the updates sent to it: it reconnects and syncs afresh. */
  tooSlow: 4502,
  /** The server is stopping or restarting. */
  serverStopping: 1001,
  /** The server could not store updates for a while. */
  serverTrouble: 1011,
  /** The standard "message too big", sent by the socket layer itself above the hard cap. */
  protocolMessageTooBig: 1009,
} as const;

export type CloseCode = (typeof closeCodes)[keyof typeof closeCodes];

/** What the page says for each reason (the server sends the same words as the close reason). */
export const closeMessages: Record<CloseCode, string> = {
  [closeCodes.malformed]: 'The connection sent something the server could not read; reload the page.',
  [closeCodes.sessionExpired]: 'Your session has expired. Sign in again to keep editing.',
  [closeCodes.accessRemoved]: 'Your access to this derivation was removed.',
  [closeCodes.derivationGone]: 'This derivation was deleted.',
  [closeCodes.documentTooLarge]: 'The document is too large: this change was not saved.',
  [closeCodes.messageTooLarge]: 'That change is too large to send at once: it was not saved.',
  [closeCodes.roleChanged]: 'Your role in the group changed; reconnecting.',
  [closeCodes.tooSlow]: 'The connection fell behind; reconnecting.',
  [closeCodes.serverStopping]: 'The server is restarting; reconnecting.',
  [closeCodes.serverTrouble]: 'The server could not save changes for a while; reconnecting.',
  [closeCodes.protocolMessageTooBig]: 'That change is too large to send at once: it was not saved.',
};

/** Closes after which reconnecting cannot help. */
export function isFinalClose(code: number): boolean {
  return (code >= 4400 && code < 4500) || code === closeCodes.protocolMessageTooBig;
}
