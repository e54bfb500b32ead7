// The collaboration socket's place in the one server process: the upgrade route for /collab/ and
// the service that owns the rooms. Other parts reach the working copies through ./access.
import type { Service, UpgradeRoute } from '../extensions';
import { registerCollab } from './access';
import { CollabHub, collabPrefix } from './hub';
import { readCollabLimits } from './limits';

let hub: CollabHub | null = null;

export const collabUpgradeRoute: UpgradeRoute = {
  prefix: collabPrefix,
  handle(req, socket, head) {
    if (!hub) {
      socket.end('HTTP/1.1 503 Service Unavailable\r\nRetry-After: 1\r\nConnection: close\r\n\r\n');
      return;
    }
    void hub.upgrade(req, socket, head);
  },
};

export const collabService: Service = {
  name: 'collaboration',
  start() {
    const limits = readCollabLimits(process.env);
    hub = new CollabHub(limits);
    hub.start();
    registerCollab(hub);
  },
  async stop() {
    const stopping = hub;
    hub = null;
    registerCollab(undefined);
    await stopping?.stop();
  },
};

export { collab, type CollabAccess, type DocumentChange, type ProseMirrorJson } from './access';
export { closeCodes, closeMessages, isFinalClose } from './closeReasons';
