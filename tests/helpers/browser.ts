// Debian's Chromium driven by playwright-core. Playwright gives every launch a fresh, temporary
// profile folder (the equivalent of a fresh --user-data-dir), removed when the browser closes.
import { existsSync } from 'node:fs';
import { chromium, type Browser } from 'playwright-core';

export const chromiumPath = '/usr/bin/chromium';

export const chromiumFlags = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

export async function launchBrowser(): Promise<Browser> {
  if (!existsSync(chromiumPath)) {
    throw new Error(`${chromiumPath} is missing: install it with \`apt-get install -y chromium\`.`);
  }
  return chromium.launch({ executablePath: chromiumPath, headless: true, args: chromiumFlags });
}
