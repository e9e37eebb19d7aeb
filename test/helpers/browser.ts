import { existsSync } from 'node:fs';
import { chromium, type Browser } from 'playwright-core';

/** Debian's Chromium (`apt-get install -y chromium`; .ci/run installs it), or SPEEDBAND_CHROMIUM. No browser is downloaded. */
export const CHROMIUM = process.env.SPEEDBAND_CHROMIUM ?? '/usr/bin/chromium';

/**
 * Headless Chromium with a fresh temporary profile (Playwright's launch makes one per run) and nothing in the
 * background that could reach the network (no sync, updates or component downloads). Fails with the way to
 * install it when it is missing.
 */
export async function launchChromium(): Promise<Browser> {
  if (!existsSync(CHROMIUM)) {
    throw new Error(
      `the report's browser tests need Chromium, not found at ${CHROMIUM}: install Debian's package (apt-get install -y chromium — CI's .ci/run does) or set SPEEDBAND_CHROMIUM to its path`,
    );
  }
  return chromium.launch({
    executablePath: CHROMIUM,
    headless: true,
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
}
