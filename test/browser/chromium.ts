// Launching Debian's Chromium for the browser tests: never a downloaded browser.
import { existsSync } from 'node:fs';
import { chromium, type Browser } from 'playwright-core';

import { CHROMIUM_FLAGS, CHROMIUM_PATH } from '../bench/chromium-page';

export { CHROMIUM_FLAGS, CHROMIUM_PATH };

export async function launchChromium(): Promise<Browser> {
  if (!existsSync(CHROMIUM_PATH)) {
    throw new Error(`${CHROMIUM_PATH} is missing: install Debian's chromium (apt-get install -y chromium)`);
  }
  // launch() gives every run a fresh temporary profile, removed on close.
  return chromium.launch({ executablePath: CHROMIUM_PATH, headless: true, args: CHROMIUM_FLAGS });
}
