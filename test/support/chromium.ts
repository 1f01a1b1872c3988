/**
 * Debian's chromium, headless, for the browser tests: one launch with the flags that keep it
 * quiet and offline (no sandbox in containers, no GPU, no background network or updates).
 */
import { chromium, type Browser } from 'playwright-core';

const CHROMIUM_ARGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

/** Start Debian's chromium (check availability first with `requireTool('chromium')`). */
export function launchChromium(): Promise<Browser> {
  return chromium.launch({ executablePath: '/usr/bin/chromium', headless: true, args: CHROMIUM_ARGS });
}
