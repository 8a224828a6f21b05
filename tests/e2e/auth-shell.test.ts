import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROLES, ROLE_PERMISSIONS } from '../../shared/permissions';
import { NAV_ITEMS } from '../../src/components/layout/nav-items';
import { createUser, TEST_PASSWORD } from '../factories';
import { startBrowserRig, type BrowserRig } from './browser';

describe('signing in through the browser', () => {
  let rig: BrowserRig;
  beforeAll(async () => {
    rig = await startBrowserRig();
  });
  afterAll(() => rig?.close());

  it('sends an anonymous visitor to sign-in and back to the page asked for', async () => {
    const user = await createUser(rig.t, 'manager');
    const { context, page } = await rig.newPage('desktop');
    await page.goto('/no/such/screen?x=1');
    await page.waitForURL(/\/sign-in\?next=/);
    await page.getByLabel('E-mail').fill(user.email);
    await page.getByLabel('Password').fill(TEST_PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL((u) => u.pathname === '/no/such/screen' && u.search === '?x=1');
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toContain('Nothing lives at this address');
    await context.close();
  });

  it('shows the server message for a wrong password and stays on sign-in', async () => {
    const user = await createUser(rig.t, 'clerk');
    const { context, page } = await rig.newPage('phone');
    await page.goto('/sign-in');
    await page.getByLabel('E-mail').fill(user.email);
    await page.getByLabel('Password').fill('not the password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await expect.poll(() => page.getByRole('alert').textContent()).toContain('The e-mail address or the password is wrong.');
    await rig.screenshot(page, 'auth-sign-in-refused-phone');
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    await context.close();
  });

  for (const role of ROLES) {
    it(`as ${role}, shows only the navigation that role may use, and signs out`, async () => {
      const user = await createUser(rig.t, role);
      const { context, page } = await rig.newPage('desktop');
      await page.goto('/');
      await page.waitForURL(/\/sign-in/);
      await page.getByLabel('E-mail').fill(user.email);
      await page.getByLabel('Password').fill(TEST_PASSWORD);
      await page.getByRole('button', { name: 'Sign in' }).click();
      await page.waitForURL((u) => u.pathname === '/');
      const rail = page.getByRole('navigation', { name: 'Main' }).first();
      await expect.poll(() => rail.getByRole('link').count()).toBeGreaterThan(0);
      const expected = NAV_ITEMS.filter((i) => !i.requires || ROLE_PERMISSIONS[role].includes(i.requires)).map((i) => i.label);
      expect(await rail.getByRole('link').allTextContents()).toEqual(expected);
      await rig.screenshot(page, `auth-nav-${role}-desktop`);
      await page.getByRole('button', { name: 'Sign out' }).click();
      await page.waitForURL(/\/sign-in/);
      await page.goto('/');
      await page.waitForURL(/\/sign-in/);
      await context.close();
    });
  }
});
