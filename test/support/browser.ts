import { existsSync } from 'node:fs';
import type { Browser } from 'playwright-core';

/**
 * Debian's chromium, driven by playwright-core in the browser tests. CI installs it (.ci/run), so
 * there the tests must run; elsewhere they may skip, saying why.
 */
export const CHROMIUM = process.env.HEXSALVAGE_CHROMIUM ?? '/usr/bin/chromium';

/** Whether the browser is there; in CI a missing one fails the tests instead of skipping them. */
export const BROWSER_AVAILABLE = existsSync(CHROMIUM);

/** Whether browser tests skip here (no browser, outside CI); warns once per test file with the reason. */
export function skipBrowserTests(file: string): boolean {
  const skip = !BROWSER_AVAILABLE && !process.env.CI;
  if (skip) console.warn(`${file}: skipped, no browser at ${CHROMIUM} (apt-get install chromium, or set HEXSALVAGE_CHROMIUM)`);
  return skip;
}

/**
 * Starts headless chromium without the background connections this machine's closed network
 * refuses.
 *
 * @returns the browser
 */
export async function launchChromium(): Promise<Browser> {
  const { chromium } = await import('playwright-core');
  return chromium.launch({
    executablePath: CHROMIUM,
    args: [
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  });
}
