import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { LedgerActor } from '../../server/ledger/types';
import { createUser, TEST_PASSWORD } from '../factories';
import { DAY_MS, retainedOrder, stateOf, type RetainedOrder } from '../api/disposals-fixtures';
import { startBrowserRig, type BrowserRig } from './browser';

describe('a disposal batch in chromium, as the clerk', () => {
  let rig: BrowserRig;
  let due: RetainedOrder;
  let fresh: RetainedOrder;
  let clerkEmail: string;

  beforeAll(async () => {
    rig = await startBrowserRig();
    const user = await createUser(rig.t, 'clerk');
    clerkEmail = user.email;
    const actor: LedgerActor = { kind: 'user', id: user.id, role: 'clerk' };
    due = await retainedOrder(rig.t, actor, { reportIssuedAt: new Date(Date.now() - 400 * DAY_MS), specimens: 1 });
    fresh = await retainedOrder(rig.t, actor, { reportIssuedAt: new Date(Date.now() - DAY_MS), specimens: 1 });
  });
  afterAll(() => rig?.close());

  async function signIn(page: Page): Promise<void> {
    await page.goto('/sign-in');
    await page.getByLabel('E-mail').fill(clerkEmail);
    await page.getByLabel('Password').fill(TEST_PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL((u) => u.pathname === '/');
  }

  async function scan(page: Page, code: string): Promise<void> {
    const field = page.getByLabel('Scan an item');
    await field.fill(code);
    await field.press('Enter');
  }

  it('shows the due list, refuses what may not go with the reason, then signs and disposes of the rest', async () => {
    const { context, page } = await rig.newPage('phone');
    try {
      await signIn(page);
      await page.goto('/retention?status=may_go');
      const table = page.getByRole('table', { name: 'Due list' });
      await expect.poll(() => table.locator('tbody tr').count(), { timeout: 15_000 }).toBe(2);
      await rig.screenshot(page, 'retention-due-phone');

      await page.goto('/disposals');
      await scan(page, fresh.halves[0] as string);
      const freshLine = page.locator(`li[data-code="${fresh.halves[0]}"]`);
      await expect.poll(() => freshLine.getAttribute('data-status'), { timeout: 15_000 }).toBe('not_due');
      expect(await freshLine.textContent()).toMatch(/may not be disposed of before \d{4}-\d{2}-\d{2}/);

      await scan(page, due.halves[0] as string);
      await scan(page, due.halves[0] as string);
      await expect.poll(() => page.getByRole('alert').first().textContent()).toMatch(/already in this batch/);
      await scan(page, due.halves[1] as string);
      await page.getByLabel('Your password').fill(TEST_PASSWORD);
      // The batch may not be signed while a line is refused.
      const sign = page.getByRole('button', { name: /Sign and dispose/ });
      await expect.poll(() => sign.isDisabled(), { timeout: 15_000 }).toBe(true);
      await page.getByRole('button', { name: `Take ${fresh.halves[0]} out of the batch` }).click();
      for (const code of due.halves) {
        await expect.poll(() => page.locator(`li[data-code="${code}"]`).getAttribute('data-status'), { timeout: 15_000 }).toBe('may_go');
      }
      await rig.screenshot(page, 'disposal-batch-phone');
      await expect.poll(() => sign.isEnabled(), { timeout: 15_000 }).toBe(true);
      await sign.click();

      const done = page.getByRole('status').filter({ hasText: 'Batch D-' });
      await done.waitFor({ timeout: 30_000 });
      expect(await done.textContent()).toMatch(/2 items disposed of, signed by/);
      const link = page.getByRole('link', { name: /Open the disposal certificate/ });
      const href = (await link.getAttribute('href')) ?? '';
      expect(href).toMatch(/^\/api\/disposals\/D-\d{4}-\d{5}\/document\.pdf$/);
      const pdf = await page.request.get(href);
      expect(pdf.headers()['content-type']).toMatch(/application\/pdf/);
      expect((await pdf.body()).subarray(0, 5).toString('latin1')).toBe('%PDF-');
      await rig.screenshot(page, 'disposal-done-phone');

      for (const code of due.halves) expect(await stateOf(rig.t, code)).toBe('disposed');
      expect(await stateOf(rig.t, fresh.halves[0] as string)).toBe('retained');
    } finally {
      await context.close();
    }
  }, 90_000);

  it('shows the store as a tree of where things are, on a desktop', async () => {
    const { context, page } = await rig.newPage('desktop');
    try {
      await signIn(page);
      await page.goto('/store');
      const bag = page.locator(`li[data-container="${fresh.bag}"]`);
      await bag.waitFor({ timeout: 20_000 }).catch(async (e: unknown) => {
        await rig.screenshot(page, 'store-desktop-failed');
        throw e;
      });
      expect(await bag.locator(`li[data-item="${fresh.halves[1]}"]`).count()).toBe(1);
      await rig.screenshot(page, 'store-desktop');
    } finally {
      await context.close();
    }
  }, 60_000);
});
