import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createUser, signedInAs, TEST_PASSWORD } from '../factories';
import { createSample, managerActor } from '../ledger/ledger-fixtures';
import { STEEL_LIKE, syntheticCsv, testedSpecimen } from '../api/results-fixtures';
import { startBrowserRig, type BrowserRig } from './browser';

describe('results, chart, verdict and signed report in chromium', () => {
  let rig: BrowserRig;
  let code: string;
  let orderId: number;

  beforeAll(async () => {
    rig = await startBrowserRig();
    const made = await createSample(rig.t);
    orderId = made.orderId;
    await rig.t.owner.query(`UPDATE orders SET material_spec = 'EN 10025-2 S355JR' WHERE id = $1`, { bind: [orderId] });
    await rig.t.owner.query(`UPDATE samples SET thickness_mm = 20 WHERE id = $1`, { bind: [made.sampleId] });
    const tech = await signedInAs(rig.t, 'technician');
    code = await testedSpecimen(rig.t, tech, await managerActor(rig.t), made.sampleId);
  }, 60_000);
  afterAll(() => rig?.close());

  it('uploads a record, maps its columns, sees the chart and the verdict, and issues the order’s report with a signature', async () => {
    const { context, page } = await rig.newPage('desktop');
    const manager = await createUser(rig.t, 'manager');
    await page.goto('/sign-in');
    await page.getByLabel('E-mail').fill(manager.email);
    await page.getByLabel('Password').fill(TEST_PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL((u) => u.pathname === '/');

    await page.goto(`/results/specimens/${encodeURIComponent(code)}`);
    await page.getByRole('heading', { name: `Results of ${code}` }).waitFor();
    // Yield 304 MPa against S355JR's 345 MPa at 20 mm: does not conform (worked by hand in tests/api/results.test.ts).
    await page.getByLabel('CSV file').setInputFiles({ name: 'pull.csv', mimeType: 'text/csv', buffer: Buffer.from(syntheticCsv(STEEL_LIKE)) });
    await expect.poll(() => page.getByLabel('Force column').inputValue()).toBe('Force');
    expect(await page.getByLabel('Extension column').inputValue()).toBe('Extension');
    await page.getByLabel('Extensometer gauge length').fill('50');
    await page.getByRole('button', { name: 'Use this record' }).click();

    const chart = page.getByTestId('stress-strain-chart');
    await chart.waitFor({ timeout: 20_000 });
    await chart.locator('.recharts-surface').first().waitFor();
    expect(await chart.textContent()).toContain('Rp0.2 304 MPa');
    const verdict = page.getByTestId('specimen-verdict');
    await expect.poll(() => verdict.textContent()).toContain('Does not conform');
    expect(await page.locator('[data-property="offsetYieldStrength"]').textContent()).toContain('304 MPa');
    await rig.screenshot(page, 'results-specimen-desktop');

    await page.getByRole('link', { name: /^O-/ }).click();
    await page.getByRole('heading', { name: /Results of order/ }).waitFor();
    await page.getByLabel('Your password, to sign').fill(TEST_PASSWORD);
    await page.getByRole('button', { name: 'Sign and issue report' }).click();
    const done = page.getByRole('status');
    await done.waitFor({ timeout: 20_000 });
    expect(await done.textContent()).toMatch(/Report HMR-\d{4}-\d{5} issued and signed/);
    await page.getByTestId('reports-issued').waitFor();
    await rig.screenshot(page, 'results-order-report-desktop');

    const events = await rig.t.owner.query<{ type: string; payload: { reportNumber?: string } }>(
      `SELECT type, payload FROM custody_events WHERE item_code = $1 ORDER BY seq DESC LIMIT 1`,
      { bind: [code], type: QueryTypes.SELECT },
    );
    expect(events[0]?.type).toBe('attached');
    expect(events[0]?.payload.reportNumber).toMatch(/^HMR-/);
    await context.close();
  }, 90_000);
});
