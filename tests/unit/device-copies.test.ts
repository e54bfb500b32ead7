// Sign-out keeps a device's copy of a derivation until the server has everything in it. These
// are the comparisons it makes between a copy and the server's document (Yjs documents).
import { describe, expect, test } from 'vitest';
import * as Y from 'yjs';
import { holdsUnsentEdits } from '../../app/_lib/deviceCopies';

function pair(text: string): { server: Y.Doc; local: Y.Doc } {
  const server = new Y.Doc();
  server.getText('body').insert(0, text);
  const local = new Y.Doc();
  Y.applyUpdate(local, Y.encodeStateAsUpdate(server));
  return { server, local };
}

describe('a copy on this device compared with the server', () => {
  test('a copy the server has in full holds nothing unsent', () => {
    const { server, local } = pair('beta(g) = -eps g + b g^2');
    expect(holdsUnsentEdits(local, server)).toBe(false);
  });

  test('words typed on this device and not yet on the server are unsent', () => {
    const { server, local } = pair('beta(g) = -eps g');
    local.getText('body').insert(16, ' + b g^2');
    expect(holdsUnsentEdits(local, server)).toBe(true);
    Y.applyUpdate(server, Y.encodeStateAsUpdate(local));
    expect(holdsUnsentEdits(local, server)).toBe(false);
  });

  test('a deletion alone, which adds no new content, is unsent too', () => {
    const { server, local } = pair('a wrong factor 2 here');
    local.getText('body').delete(8, 9);
    expect(Y.encodeStateVector(local)).toEqual(Y.encodeStateVector(server));
    expect(holdsUnsentEdits(local, server)).toBe(true);
    Y.applyUpdate(server, Y.encodeStateAsUpdate(local));
    expect(holdsUnsentEdits(local, server)).toBe(false);
  });

  test('a server ahead of the copy (other authors wrote since) leaves nothing unsent', () => {
    const { server, local } = pair('first line');
    server.getText('body').insert(10, ', and a second by a co-author');
    server.getText('body').delete(0, 6);
    expect(holdsUnsentEdits(local, server)).toBe(false);
  });
});
