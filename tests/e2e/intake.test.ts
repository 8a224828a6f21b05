import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createUser, TEST_PASSWORD } from '../factories';
import { startBrowserRig, type BrowserRig } from './browser';

async function signIn(rig: BrowserRig, page: Page): Promise<void> {
  const user = await createUser(rig.t, 'machinist');
  await page.goto('/sign-in');
  await page.getByLabel('E-mail').fill(user.email);
  await page.getByLabel('Password').fill(TEST_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL((u) => u.pathname === '/');
}

describe('intake in chromium', () => {
  let rig: BrowserRig;
  beforeAll(async () => {
    rig = await startBrowserRig();
    await rig.t.ctx.models.Customer.create({ name: 'Tamsworth Fabricators (invented)', contactEmail: null, retentionDays: 365 });
  });
  afterAll(() => rig?.close());

  it('creates an order and its heats, makes the cut list and finds the specimens in the list (desktop)', async () => {
    const { context, page } = await rig.newPage('desktop');
    const errors: string[] = [];
    page.on('console', (m) => {
      if (m.type() === 'error') errors.push(m.text());
    });
    await signIn(rig, page);

    await page.getByRole('navigation', { name: 'Main' }).first().getByRole('link', { name: 'Orders' }).click();
    await page.getByRole('link', { name: 'New order' }).click();
    await page.getByLabel('Order number').fill('TF-26-0001');
    await page.getByLabel('Customer').selectOption({ label: 'Tamsworth Fabricators (invented)' });
    await page.getByLabel('Purchase order').fill('TF-PO-118');
    await page.getByLabel('Material specification').fill('ASTM A36');
    await page.getByLabel('Specimens per heat').fill('2');
    await page.getByRole('button', { name: 'Create order' }).click();
    await page.waitForURL(/\/orders\/\d+$/);
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent(), { timeout: 10_000 }).toBe('Order TF-26-0001');

    for (const heatNumber of ['TW-4410', 'TW-4411']) {
      await page.getByRole('button', { name: 'Add a new heat' }).click();
      await page.getByLabel('Heat number').fill(heatNumber);
      await page.getByLabel('Producer').fill('Ashgrove Rolling (invented)');
      await page.getByLabel('Material', { exact: true }).fill('Carbon steel plate');
      await page.getByLabel('Grade').fill('A36');
      await page.getByRole('button', { name: 'Register and add heat' }).click();
      await expect.poll(() => page.getByRole('list', { name: 'Heats on this order' }).textContent()).toContain(heatNumber);
    }

    // The same heat twice: the server's message shows beside the heat choice.
    await page.getByRole('button', { name: 'Add a registered heat' }).click();
    await page.getByLabel('Registered heat').selectOption({ index: 1 });
    await page.getByRole('button', { name: 'Add heat', exact: true }).click();
    await expect.poll(() => page.locator('[data-field-error]').first().textContent()).toContain('is already on order TF-26-0001');
    await page.getByRole('button', { name: 'Close' }).click();

    // A field error from the schema shows beside its field before anything is sent.
    await page.getByRole('button', { name: 'Make the cut list' }).click();
    await expect.poll(() => page.locator('[data-field-error]').first().textContent()).toContain('Say where on the product');
    await page.getByLabel('Position on the product').fill('head end, mid-width');
    await page.getByLabel('Thickness (mm)').fill('9.5');
    await page.getByRole('button', { name: 'Make the cut list' }).click();
    await expect.poll(() => page.getByRole('status').first().textContent()).toContain('Registered 4 specimens from 2 samples');
    await rig.screenshot(page, 'intake-order-cut-list-desktop');

    await page.getByRole('navigation', { name: 'Main' }).first().getByRole('link', { name: 'Specimens' }).click();
    await page.getByRole('searchbox').fill('TF-26-0001');
    await page.waitForURL(/q=TF-26-0001/);
    const table = page.getByRole('table', { name: 'Specimens' });
    await expect.poll(() => table.locator('tbody tr').count()).toBe(4);
    expect(await table.locator('[data-state="registered"]').count()).toBe(4);
    expect(await page.getByTestId('table-range').textContent()).toBe('1–4 of 4');
    await rig.screenshot(page, 'intake-specimens-list-desktop');

    // The URL keeps the search: a reload shows the same rows.
    await page.reload();
    await expect.poll(() => table.locator('tbody tr').count(), { timeout: 10_000 }).toBe(4);

    // Open one by its code; a wrong check character is flagged while typing.
    const code = (await table.locator('tbody tr').first().locator('a').first().textContent())!.trim();
    const codeBox = page.getByLabel('Open a specimen by its code');
    const wrong = code.slice(0, -1) + (code.endsWith('0') ? '1' : '0');
    await codeBox.fill(wrong);
    await expect.poll(() => page.getByTestId('code-status').textContent()).toContain('check character does not match');
    await codeBox.fill(code);
    await expect.poll(() => page.getByTestId('code-status').textContent()).toContain('Check character good');
    await page.getByRole('button', { name: 'Open' }).click();
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe(code);
    await page.getByRole('link', { name: 'TF-26-0001' }).click();
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe('Order TF-26-0001');
    // Expected refusals: 401 from the session check before signing in, 409 for the heat added twice.
    expect(errors.filter((e) => !/status of (401|409)/.test(e))).toEqual([]);
    await context.close();
  }, 120_000);

  it('previews a CSV cut list with its row errors, then imports a good one (phone)', async () => {
    const { context, page } = await rig.newPage('phone');
    await signIn(rig, page);
    const orders = await page.evaluate(async () => (await fetch('/api/orders?q=TF-26-0001')).json());
    const orderId = (orders as { items: { id: number }[] }).items[0]!.id;
    await page.goto(`/orders/${orderId}`);
    const header = 'heat_number,position,orientation,specimens,geometry,thickness';
    await page.getByTestId('cut-list-file').setInputFiles({
      name: 'bad.csv',
      mimeType: 'text/csv',
      buffer: Buffer.from(`${header}\nTW-4410,tail end,transverse,1,astm-e8-flat-sheet-12.5,5 cm\n`),
    });
    const preview = page.getByTestId('cut-list-preview');
    await expect.poll(() => preview.textContent()).toContain('Thickness unit "cm" is not one Halfmark reads');
    expect(await page.getByRole('button', { name: /^Import all/ }).isDisabled()).toBe(true);
    await rig.screenshot(page, 'intake-csv-preview-errors-phone');

    await page.getByTestId('cut-list-file').setInputFiles({
      name: 'good.csv',
      mimeType: 'text/csv',
      buffer: Buffer.from(`${header}\nTW-4410,tail end,transverse,1,astm-e8-flat-sheet-12.5,0.375 in\nTW-4411,tail end,transverse,2,astm-e8-flat-sheet-12.5,9.5 mm\n`),
    });
    await expect.poll(() => preview.textContent()).toContain('All 2 rows are good: 3 specimens');
    await page.getByRole('button', { name: 'Import all 2 rows' }).click();
    await expect.poll(() => page.getByRole('status').last().textContent()).toContain('Registered 3 specimens from 2 samples');
    await expect.poll(() => page.getByRole('list', { name: 'Samples of this order' }).locator('li').count()).toBe(4);
    await rig.screenshot(page, 'intake-csv-imported-phone');
    await context.close();
  }, 120_000);
});
