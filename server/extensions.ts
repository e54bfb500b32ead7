// The seam where later parts join the one server process, on the same port:
// - upgradeRoutes: websocket endpoints by path prefix (e.g. the collaboration socket at /collab/).
//   Only upgrades under a listed prefix are taken; every other upgrade is left to Next.js.
// - services: things started after the database and mail are ready and stopped, in reverse
//   order, on shutdown (e.g. background jobs). Add an entry here; server/index.ts does the rest.
import type { IncomingMessage, Server } from 'node:http';
import type { Duplex } from 'node:stream';
import { checksBackgroundService } from './checks';
import { collabService, collabUpgradeRoute } from './collab';
import type { ServerConfig } from './config';
import { demoBodyService } from './demoBody';
import { reviewDemoService } from './review/demo';
import { reviewBackgroundService } from './review/service';
import { versionsDemoService } from './versions/demo';

export interface ServerContext {
  config: ServerConfig;
  /** The origin the server answers on, e.g. http://127.0.0.1:3000 (or the public origin). */
  origin: string;
  httpServer: Server;
}

export interface UpgradeRoute {
  /** Path prefix, e.g. '/collab/'. No page or route handler may live under it. */
  prefix: string;
  handle(req: IncomingMessage, socket: Duplex, head: Buffer, context: ServerContext): void;
}

export interface Service {
  name: string;
  start(context: ServerContext): Promise<void> | void;
  /** Finish in-flight work and release resources; called once, before the database closes. */
  stop(): Promise<void> | void;
}

export const upgradeRoutes: UpgradeRoute[] = [collabUpgradeRoute];

// The background checks read working copies through the collaboration service: it comes after.
// Review hears both (document changes for sign-offs, verdict changes for mail): it comes last.
// The demo's locked version is made once the demo body is in the working copy: keep it last.
// The demo review (remarks, a sign-off) reads the same body.
// The demo body is written once the checks listen and before the demo version and review read it.
export const services: Service[] = [collabService, checksBackgroundService, demoBodyService, reviewBackgroundService, versionsDemoService, reviewDemoService];
