// Marginalia's one process: opens the database (locking its folder, applying migrations), sets up
// mail (SMTP_URL, or the local sink), optionally adds the demo data, then serves Next.js, the
// websocket routes and the services of server/extensions.ts on one port, and shuts all of it down
// cleanly on SIGINT / SIGTERM.
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import next from 'next';
import { loadDemoData, demoAccounts } from '../db/demo';
import { DataFolderInUseError } from '../db/lock';
import { openDatabase, type OpenedDatabase } from '../db/open';
import { ConfigError, readConfig, resolveSecret, type ServerConfig } from './config';
import { services, upgradeRoutes, type ServerContext, type Service } from './extensions';
import { registerMailRoute } from './mail';
import { startMailSink, type MailSink } from './mailSink';
import { hashPassword } from './passwords';
import { startupNotes } from './startupNotes';

type RequestHandler = (req: IncomingMessage, res: ServerResponse) => Promise<void>;

function originOf(host: string, port: number): string {
  return `http://${host.includes(':') ? `[${host}]` : host}:${port}`;
}

async function main(): Promise<void> {
  const config: ServerConfig = readConfig(process.argv.slice(2), process.env);
  if (!process.env.NODE_ENV) Object.assign(process.env, { NODE_ENV: config.dev ? 'development' : 'production' });

  let shuttingDown: ((reason: string, code?: number) => Promise<void>) | undefined;
  const database: OpenedDatabase = await openDatabase({
    dataDir: config.dataDir,
    onLockLost: (error) => {
      console.error(`The lock on the data folder was lost (${error.message}); shutting down to keep the data safe.`);
      void shuttingDown?.('lock lost', 1);
    },
  });

  process.env.NEXTAUTH_SECRET = await resolveSecret(config, process.env);
  // Without a configured public origin, next-auth follows the Host header; the server then only
  // listens on loopback (readConfig refuses anything else).
  if (!config.publicOrigin) process.env.AUTH_TRUST_HOST = 'true';

  let sink: MailSink | null = null;
  if (config.smtpUrl) {
    registerMailRoute({ route: { kind: 'smtp', url: config.smtpUrl }, from: config.mailFrom });
  } else {
    sink = await startMailSink(config.sinkPort);
    registerMailRoute({ route: { kind: 'sink', host: sink.host, port: sink.port }, from: config.mailFrom });
  }

  const demoLoaded = config.demo ? await loadDemoData(database.db, hashPassword) : false;

  let handle: RequestHandler | null = null;
  const httpServer = createServer((req, res) => {
    if (!handle) {
      res.writeHead(503, { 'content-type': 'text/plain', 'retry-after': '1' }).end('Marginalia is starting.');
      return;
    }
    void handle(req, res);
  });
  await new Promise<void>((resolve, reject) => {
    httpServer.once('error', (error: NodeJS.ErrnoException) =>
      reject(
        error.code === 'EADDRINUSE'
          ? new ConfigError(`Port ${config.port} on ${config.host} is already in use. Set PORT to another port (0 = any free port).`)
          : error,
      ),
    );
    httpServer.listen(config.port, config.host, () => {
      httpServer.removeAllListeners('error');
      httpServer.on('error', (error) => console.error('HTTP server error:', error.message));
      resolve();
    });
  });
  const port = (httpServer.address() as AddressInfo).port;
  const origin = config.publicOrigin ?? originOf(config.host, port);
  const context: ServerContext = { config, origin, httpServer };

  const app = next({ dev: config.dev, hostname: config.host, port, dir: process.cwd() });
  await app.prepare();
  handle = app.getRequestHandler();

  httpServer.on('upgrade', (req, socket, head) => {
    const path = (req.url ?? '/').split('?')[0] ?? '/';
    const route = upgradeRoutes.find((r) => path.startsWith(r.prefix));
    if (route) {
      route.handle(req, socket, head, context);
    } else if (!config.dev) {
      socket.destroy(); // in development Next.js takes its own hot-reload upgrades
    }
  });

  const started: Service[] = [];
  for (const service of services) {
    await service.start(context);
    started.push(service);
  }

  let stopping = false;
  shuttingDown = async (reason, code = 0) => {
    if (stopping) return;
    stopping = true;
    console.log(`Marginalia stopping (${reason}).`);
    setTimeout(() => process.exit(code || 1), 10_000).unref();
    const closed = new Promise<void>((resolve) => httpServer.close(() => resolve()));
    httpServer.closeIdleConnections();
    for (const service of started.reverse()) {
      try {
        await service.stop();
      } catch (error) {
        console.error(`Stopping ${service.name} failed:`, error);
      }
    }
    setTimeout(() => httpServer.closeAllConnections(), 2_000).unref();
    await closed;
    await sink?.stop();
    await app.close?.();
    await database.close();
    process.exit(code);
  };
  process.once('SIGINT', () => void shuttingDown?.('SIGINT'));
  process.once('SIGTERM', () => void shuttingDown?.('SIGTERM'));

  // The "listening" line comes last: whoever waits for it (the test harness) has the whole banner.
  if (config.publicOrigin) console.log(`Public origin: ${config.publicOrigin}`);
  console.log(database.dataDir ? `Data folder: ${database.dataDir}` : 'Data: in memory (gone when the process ends)');
  if (sink) console.log(`Mail goes to the local sink (smtp://${sink.host}:${sink.port}); read it at ${origin}/mailbox`);
  if (config.demo) {
    console.log(demoLoaded ? 'Demo data loaded. Demo accounts:' : 'Demo data already present. Demo accounts:');
    for (const account of demoAccounts) {
      console.log(`  ${account.role.padEnd(8)} ${account.name.padEnd(18)} ${account.email.padEnd(28)} password: ${account.password}`);
    }
    console.log(`Sign in at ${origin}/signin`);
    for (const note of startupNotes) console.log(note);
  }
  console.log(`Marginalia listening on ${originOf(config.host, port)}`);
}

main().catch((error: unknown) => {
  if (error instanceof ConfigError || error instanceof DataFolderInUseError) {
    console.error(`Marginalia cannot start: ${error.message}`);
  } else {
    console.error('Marginalia cannot start:', error);
  }
  process.exit(1);
});
