import { mkdirSync } from 'node:fs';
import type { Server } from 'node:http';
import path from 'node:path';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { expect } from 'vitest';
import { launchChromium } from '../../scripts/lib/chromium';
import { createApp } from '../../server/app';
import { createTestContext, type TestContext } from '../support';

/** Phone and desktop viewports every screen is tried at. */
export const VIEWPORTS = {
  phone: { width: 390, height: 844 },
  desktop: { width: 1280, height: 800 },
} as const;

/** Polls with room for a busy machine (argon2 checks, a shared database): vitest's default is one second. */
export const patientPoll = <T>(fn: () => T | Promise<T>) => expect.poll(fn, { timeout: 20_000, interval: 100 });

export const SCREENSHOT_DIR = path.resolve('.test-artifacts', 'screenshots');

/** A built client served by a real server on loopback, on its own database, and a headless chromium. */
export interface BrowserRig {
  t: TestContext;
  baseUrl: string;
  browser: Browser;
  newPage: (viewport: keyof typeof VIEWPORTS) => Promise<{ context: BrowserContext; page: Page }>;
  screenshot: (page: Page, name: string) => Promise<void>;
  close: () => Promise<void>;
}

/**
 * Starts the app on a free loopback port with dist/ and launches Debian's chromium (playwright
 * gives it a new empty profile each launch).
 */
export async function startBrowserRig(): Promise<BrowserRig> {
  const t = await createTestContext();
  const app = createApp(t.ctx, { clientDir: path.resolve('dist') });
  const server = await new Promise<Server>((resolve) => {
    const s = app.listen(0, '127.0.0.1', () => resolve(s));
  });
  const addr = server.address();
  const baseUrl = `http://127.0.0.1:${typeof addr === 'object' && addr ? addr.port : 0}`;
  const browser = await launchChromium();
  mkdirSync(SCREENSHOT_DIR, { recursive: true });
  return {
    t,
    baseUrl,
    browser,
    newPage: async (viewport) => {
      const context = await browser.newContext({ viewport: VIEWPORTS[viewport], baseURL: baseUrl });
      const page = await context.newPage();
      return { context, page };
    },
    screenshot: async (page, name) => {
      await page.screenshot({ path: path.join(SCREENSHOT_DIR, `${name}.png`), fullPage: true });
    },
    close: async () => {
      await browser.close();
      await new Promise<void>((resolve) => server.close(() => resolve()));
      server.closeAllConnections();
      await t.close();
    },
  };
}
