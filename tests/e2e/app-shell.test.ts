import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startBrowserRig, type BrowserRig } from './browser';

describe('the app shell in chromium', () => {
  let rig: BrowserRig;
  beforeAll(async () => {
    rig = await startBrowserRig();
  });
  afterAll(() => rig?.close());

  for (const size of ['phone', 'desktop'] as const) {
    it(`shows the floor with the database up at ${size} size, without CSP violations`, async () => {
      const { context, page } = await rig.newPage(size);
      const violations: string[] = [];
      page.on('console', (m) => {
        if (m.type() === 'error') violations.push(m.text());
      });
      await page.goto('/');
      await expect.poll(() => page.getByTestId('health').textContent(), { timeout: 10_000 }).toContain('Database up');
      expect(await page.getByRole('img', { name: 'Halfmark' }).first().isVisible()).toBe(true);
      const fonts = await page.evaluate(async () => {
        // Both faces are shipped with the app: loading them must find real font files.
        const inter = await document.fonts.load('16px Inter');
        const mono = await document.fonts.load('16px "JetBrains Mono"');
        return inter.length > 0 && mono.length > 0;
      });
      expect(fonts).toBe(true);
      await rig.screenshot(page, `shell-floor-${size}`);
      expect(violations).toEqual([]);
      await context.close();
    });

    it(`shows a not-found page for an unknown address at ${size} size`, async () => {
      const { context, page } = await rig.newPage(size);
      await page.goto('/no/such/screen');
      await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent(), { timeout: 10_000 }).toContain('Nothing lives at this address');
      await rig.screenshot(page, `shell-not-found-${size}`);
      await context.close();
    });
  }
});
