import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { LedgerActor } from '../../server/ledger/types';
import { openScanner, wedgeScan, type ScanBrowser } from '../../scripts/bench-scan';
import { createUser, TEST_PASSWORD } from '../factories';
import { patientPoll as poll } from './browser';
import { createSpecimen } from '../ledger/ledger-fixtures';
import type { TestContext } from '../support';
import { closeScannerRig, startScannerRig } from './scan-rig';

let t: TestContext;
let rig: ScanBrowser;
let actor: LedgerActor;
let sampleId: number;

beforeAll(async () => {
  ({ t, rig, actor, sampleId } = await startScannerRig());
});
afterAll(() => closeScannerRig({ t, rig }));

/** Each code's cut events and their idempotency keys, straight from the ledger. */
async function cutsOf(codes: string[]): Promise<{ item_code: string; idempotency_key: string }[]> {
  return t.sequelize.query(`SELECT item_code, idempotency_key FROM custody_events WHERE type = 'cut' AND item_code = ANY($1)`, {
    bind: [codes],
    type: QueryTypes.SELECT,
  });
}

describe('scanning offline', { timeout: 180_000 }, () => {
  it('keeps scans on the device through a closed tab, syncs them when the network returns, and records each exactly once', async () => {
    const user = await createUser(t, 'machinist');
    const codes: string[] = [];
    for (let i = 0; i < 5; i++) codes.push(await createSpecimen(t, actor, sampleId));
    const refusedCode = await createSpecimen(t, actor, sampleId);

    const { context, page } = await rig.newPage('phone');
    await openScanner(page, user.email, TEST_PASSWORD);
    await page.getByRole('button', { name: /^Cut\b/ }).click();
    await context.setOffline(true);
    await poll(() => page.getByTestId('connection').getAttribute('data-online')).toBe('false');

    for (const code of codes.slice(0, 3)) {
      const r = await wedgeScan(page, code);
      expect(r.outcome).toBe('kept');
      expect(await page.getByTestId('scan-result').locator('svg[data-shape]').first().getAttribute('data-shape')).toBe('hourglass');
    }
    await poll(() => page.getByTestId('pending-count').textContent()).toBe('3');
    await rig.screenshot(page, 'scan-offline-kept-phone');

    // Closing the tab keeps them. The network is back but the ledger is not reachable (its
    // requests fail), so the new tab's own sync attempt keeps them too, and new scans join them.
    await page.close();
    await context.route('**/api/events**', (route) => route.abort('connectionrefused'));
    await context.setOffline(false);
    const second = await context.newPage();
    await second.goto('/scan');
    await second.getByTestId('scan-screen').waitFor({ timeout: 60_000 });
    await poll(() => second.getByTestId('pending-count').textContent()).toBe('3');
    await second.getByRole('button', { name: /^Cut\b/ }).click();
    for (const code of codes.slice(3)) expect(await wedgeScan(second, code)).toMatchObject({ outcome: 'kept' });
    // Cut twice while the ledger is away: it will refuse the second, and the sync report says so.
    expect(await wedgeScan(second, refusedCode)).toMatchObject({ outcome: 'kept' });
    await second.waitForTimeout(1100);
    expect(await wedgeScan(second, refusedCode)).toMatchObject({ outcome: 'kept' });
    await poll(() => second.getByTestId('pending-count').textContent()).toBe('7');
    expect(await cutsOf([...codes, refusedCode])).toEqual([]);

    // The next sync's answer is lost on the way back (the server did record it): the scans stay
    // pending and go again, and the idempotency keys keep the ledger from counting them twice.
    await context.unroute('**/api/events**');
    let dropped = 0;
    await context.route('**/api/events/batch', async (route) => {
      if (dropped === 0) {
        dropped++;
        await route.fetch();
        await route.abort('connectionreset');
      } else {
        await route.continue();
      }
    });
    await second.getByRole('button', { name: 'Sync now' }).click();
    await poll(() => second.getByTestId('sync-report').textContent().catch(() => '')).toContain('7 still waiting');
    expect(dropped).toBe(1);
    await poll(() => second.getByTestId('pending-count').textContent()).toBe('7');
    await second.getByRole('button', { name: 'Sync now' }).click();
    await poll(() => second.getByTestId('pending-count').textContent()).toBe('0');
    const report = await second.getByTestId('sync-report').textContent();
    expect(report).toContain('0 recorded, 6 already there, 1 refused');
    expect(await second.getByTestId('sync-refused').textContent()).toContain(refusedCode);
    await rig.screenshot(second, 'scan-offline-synced-phone');

    const cuts = await cutsOf([...codes, refusedCode]);
    expect(cuts.map((c) => c.item_code).sort()).toEqual([...codes, refusedCode].sort());
    expect(new Set(cuts.map((c) => c.idempotency_key)).size).toBe(6);
    await context.close();
  });

  it('syncs on its own when the browser comes back online, at desktop size', async () => {
    const user = await createUser(t, 'machinist');
    const codes = [await createSpecimen(t, actor, sampleId), await createSpecimen(t, actor, sampleId)];
    const { context, page } = await rig.newPage('desktop');
    await openScanner(page, user.email, TEST_PASSWORD);
    await page.getByRole('button', { name: /^Cut\b/ }).click();
    await context.setOffline(true);
    for (const code of codes) expect(await wedgeScan(page, code)).toMatchObject({ outcome: 'kept' });
    await rig.screenshot(page, 'scan-offline-kept-desktop');
    await context.setOffline(false);
    await poll(() => page.getByTestId('pending-count').textContent()).toBe('0');
    expect(await page.getByTestId('sync-report').textContent()).toContain('2 recorded, 0 already there, 0 refused');
    expect((await cutsOf(codes)).length).toBe(2);
    await context.close();
  });
});
