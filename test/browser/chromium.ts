// Launching Debian's Chromium for the browser tests: never a downloaded browser.
import { existsSync } from 'node:fs';
import { chromium, type Browser } from 'playwright-core';

export const CHROMIUM_PATH = process.env.QUANTISCOPE_CHROMIUM ?? '/usr/bin/chromium';

/** Flags that work headless as root on these machines (no GPU, no network services). */
export const CHROMIUM_FLAGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--autoplay-policy=no-user-gesture-required',
];

export async function launchChromium(): Promise<Browser> {
  if (!existsSync(CHROMIUM_PATH)) {
    throw new Error(`${CHROMIUM_PATH} is missing: install Debian's chromium (apt-get install -y chromium)`);
  }
  // launch() gives every run a fresh temporary profile, removed on close.
  return chromium.launch({ executablePath: CHROMIUM_PATH, headless: true, args: CHROMIUM_FLAGS });
}
