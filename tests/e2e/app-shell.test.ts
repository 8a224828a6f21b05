import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createUser, signInPage } from '../factories';
import type { User } from '../../server/models/user';
import { startBrowserRig, type BrowserRig } from './browser';

describe('the app shell in chromium', () => {
  let rig: BrowserRig;
  let user: User;
  beforeAll(async () => {
    rig = await startBrowserRig();
    user = await createUser(rig.t, 'technician');
  });
  afterAll(() => rig?.close());

  it('sends an anonymous visitor to sign in, and back to where they were going afterwards', async () => {
    const { context, page } = await rig.newPage('phone');
    await page.goto('/no/such/screen');
    await page.waitForURL((u) => u.pathname === '/sign-in', { timeout: 30_000 });
    await rig.screenshot(page, 'shell-sign-in-phone');
    await context.close();
  });

  for (const size of ['phone', 'desktop'] as const) {
    it(`shows the floor with the database up at ${size} size, without CSP violations`, async () => {
      const { context, page } = await rig.newPage(size);
      const violations: string[] = [];
      page.on('console', (m) => {
        // The sign-in screen's own 401 from /api/auth/me is expected; policy violations are not.
        if (m.type() === 'error' && /Content Security Policy/i.test(m.text())) violations.push(m.text());
      });
      await signInPage(page, user);
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
      await signInPage(page, user);
      await page.goto('/no/such/screen');
      await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent(), { timeout: 10_000 }).toContain('Nothing lives at this address');
      await rig.screenshot(page, `shell-not-found-${size}`);
      await context.close();
    });
  }
});
