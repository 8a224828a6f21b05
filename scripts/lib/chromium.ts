import { chromium, type Browser } from 'playwright-core';

/**
 * Launches Debian's chromium headless for browser tests and benchmarks, with the flags this
 * machine needs: no sandbox as root, no GPU, and none of the background network traffic the
 * closed network would refuse. Playwright gives it a new empty profile each launch.
 */
export function launchChromium(): Promise<Browser> {
  return chromium.launch({
    executablePath: '/usr/bin/chromium',
    headless: true,
    args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update',
      '--disable-sync', '--no-first-run', '--disable-quic'],
  });
}
