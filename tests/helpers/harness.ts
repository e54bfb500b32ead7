// A test page of its own (a folder under tests/browser holding index.html), served by Vite's
// development server on a free port, with '@' resolving to the repository as in the app. Kept
// out of the helpers' index so that tests without a page do not load Vite.
import path from 'node:path';
import { createServer, type ViteDevServer } from 'vite';
import { repoRoot } from './server';

export async function serveHarness(folder: string): Promise<{ vite: ViteDevServer; url: string }> {
  const vite = await createServer({
    root: path.join(repoRoot, 'tests/browser', folder),
    configFile: false,
    logLevel: 'warn',
    server: { port: 0, host: '127.0.0.1' },
    resolve: { alias: { '@': repoRoot } },
  });
  await vite.listen();
  return { vite, url: vite.resolvedUrls!.local[0]! };
}
