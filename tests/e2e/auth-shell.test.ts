import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROLE_PERMISSIONS } from '../../shared/permissions';
import { DEMO_USERS, seedDemoUsers } from '../../server/demo/seed';
import { NAV_ITEMS } from '../../src/components/layout/nav-items';
import { createUser, TEST_PASSWORD } from '../factories';
import { startBrowserRig, type BrowserRig } from './browser';

describe('signing in through the browser', () => {
  let rig: BrowserRig;
  beforeAll(async () => {
    rig = await startBrowserRig();
    await seedDemoUsers(rig.t.sequelize);
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
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent(), { timeout: 15_000 }).toContain('Nothing lives at this address');
    await context.close();
  });

  it('shows the server message for a wrong password and stays on sign-in', async () => {
    const user = await createUser(rig.t, 'clerk');
    const { context, page } = await rig.newPage('phone');
    await page.goto('/sign-in');
    await page.getByLabel('E-mail').fill(user.email);
    await page.getByLabel('Password').fill('not the password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await expect.poll(() => page.getByRole('alert').textContent(), { timeout: 15_000 }).toContain('The e-mail address or the password is wrong.');
    await rig.screenshot(page, 'auth-sign-in-refused-phone');
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    await context.close();
  });

  for (const demo of DEMO_USERS) {
    const role = demo.role;
    it(`as the demo ${role}, shows only the navigation that role may use, and signs out`, async () => {
      const { context, page } = await rig.newPage('desktop');
      await page.goto('/');
      await page.waitForURL(/\/sign-in/);
      await page.getByLabel('E-mail').fill(demo.email);
      await page.getByLabel('Password').fill(demo.password);
      await page.getByRole('button', { name: 'Sign in' }).click();
      await page.waitForURL((u) => u.pathname === '/');
      const rail = page.getByRole('navigation', { name: 'Main' }).first();
      await expect.poll(() => rail.getByRole('link').count(), { timeout: 15_000 }).toBeGreaterThan(0);
      const expected = NAV_ITEMS.filter((i) => !i.requires || ROLE_PERMISSIONS[role].includes(i.requires)).map((i) => i.label);
      expect(await rail.getByRole('link').allTextContents()).toEqual(expected);
      await rig.screenshot(page, `auth-nav-${role}-desktop`);
      // The manager's screens render with data from the server.
      if (role === 'manager') {
        await page.getByRole('link', { name: 'People' }).click();
        await expect.poll(() => page.getByRole('main').getByText(demo.email, { exact: true }).count(), { timeout: 30_000 }).toBe(1);
        await rig.screenshot(page, 'auth-people-desktop');
        await page.getByRole('link', { name: 'Stations' }).click();
        await page.getByLabel('Code').fill('FRAME-7');
        await page.getByLabel('Name').fill('Frame seven');
        await page.getByRole('button', { name: 'Add station' }).click();
        await page.getByRole('button', { name: /FRAME-7/ }).click();
        await page.getByLabel('Instrument name').fill('Cell 7 robot');
        await page.getByLabel('tested').check();
        await page.getByRole('button', { name: 'Create token' }).click();
        await expect.poll(() => page.getByTestId('new-token').textContent(), { timeout: 15_000 }).toMatch(/^hmi_/);
        await rig.screenshot(page, 'auth-stations-desktop');
      }
      await page.getByRole('button', { name: 'Sign out' }).click();
      await page.waitForURL(/\/sign-in/);
      await page.goto('/');
      await page.waitForURL(/\/sign-in/);
      await context.close();
    }, 120_000);
  }
});

describe('invitation and account screens in the browser', () => {
  let rig: BrowserRig;
  beforeAll(async () => {
    rig = await startBrowserRig();
  });
  afterAll(() => rig?.close());

  it('lets an invited person follow the e-mailed link, set a password, and change it on the account screen', async () => {
    const manager = await createUser(rig.t, 'manager');
    const { context, page } = await rig.newPage('phone');
    await page.goto('/users');
    await page.getByLabel('E-mail').fill(manager.email);
    await page.getByLabel('Password').fill(TEST_PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL((u) => u.pathname === '/users');
    // The address changes before the People screen replaces the sign-in form (its code loads
    // first), so wait for the invitation form itself: the sign-in form has an E-mail box too.
    const invite = page.getByRole('form', { name: 'Invite someone' });
    await invite.waitFor({ timeout: 30_000 });
    await invite.getByRole('textbox', { name: 'E-mail' }).fill('new.hire@lab.example');
    await invite.getByRole('textbox', { name: 'Name' }).fill('Noor Hatherley');
    await invite.getByRole('button', { name: 'Send invitation' }).click();
    await expect.poll(() => page.getByRole('status').textContent(), { timeout: 60_000 }).toContain('Invitation sent');
    await rig.screenshot(page, 'auth-invite-phone');
    await context.close();

    const { simpleParser } = await import('mailparser');
    const raw = (await rig.t.ctx.mailer.outbox!()).find((m) => m.to.includes('new.hire@lab.example'))!;
    const link = /http:\/\/\S+\/set-password\?token=[\w-]+/.exec((await simpleParser(raw.raw)).text ?? '')![0];
    const fresh = await rig.newPage('phone');
    await fresh.page.goto(link);
    await expect.poll(() => fresh.page.getByRole('heading', { level: 1 }).textContent(), { timeout: 15_000 }).toBe('Welcome to Halfmark');
    await fresh.page.getByLabel(/New password/).fill('a long new password here');
    await fresh.page.getByRole('button', { name: 'Set password and sign in' }).click();
    await fresh.page.waitForURL((u) => u.pathname === '/');
    await fresh.page.goto('/account');
    await fresh.page.getByLabel('Current password').fill('a long new password here');
    await fresh.page.getByLabel(/New password/).fill('short');
    await fresh.page.getByRole('button', { name: 'Change password' }).click();
    await expect.poll(() => fresh.page.getByText('at least 12 characters').count(), { timeout: 15_000 }).toBe(1);
    await rig.screenshot(fresh.page, 'auth-account-phone');
    await fresh.context.close();
  }, 120_000);
});
