// Debian's Chromium driven by playwright-core. Playwright gives every launch a fresh, temporary
// profile folder (the equivalent of a fresh --user-data-dir), removed when the browser closes.
import { existsSync } from 'node:fs';
import { chromium, type Browser, type BrowserContext, type BrowserContextOptions, type Page } from 'playwright-core';

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

/** A fresh browser context signed in with `cookie` (the Cookie header value from signIn) for the server at `url`. */
export async function signedInContext(browser: Browser, url: string, cookie: string, options: BrowserContextOptions = {}): Promise<BrowserContext> {
  const context = await browser.newContext(options);
  const [name, value] = cookie.split(/=(.*)/s) as [string, string];
  await context.addCookies([{ name, value, url }]);
  return context;
}

/** Opens a derivation's page and waits until it is connected and its editor is there. */
export async function openDerivation(page: Page, url: string, derivationId: string): Promise<void> {
  await page.goto(`${url}/derivations/${derivationId}`);
  await page.locator('[data-connection="connected"]').waitFor();
  await page.locator('.ProseMirror').waitFor();
}
