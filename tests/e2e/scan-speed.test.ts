import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { benchWedgeRounds, measureScanBundle, openScanner, printScanBench, startScanBrowser, wedgeScan, type ScanBrowser } from '../../scripts/bench-scan';
import { createUser, TEST_PASSWORD } from '../factories';
import { createSample, createSpecimen, managerActor } from '../ledger/ledger-fixtures';
import { createTestContext, type TestContext } from '../support';

let t: TestContext;
let rig: ScanBrowser;

beforeAll(async () => {
  t = await createTestContext();
  rig = await startScanBrowser(t.ctx);
});
afterAll(async () => {
  await rig?.close();
  await t?.close();
});

describe('the scanner\'s speed and size', () => {
  it('shows a wedge scan\'s result within 150 ms at the 95th percentile on loopback, and loads under 250 kB of gzipped JavaScript', { timeout: 420_000 }, async () => {
    const actor = await managerActor(t);
    const { sampleId } = await createSample(t);
    const rounds: string[][] = [];
    for (let r = 0; r < 3; r++) {
      const codes: string[] = [];
      for (let i = 0; i < 40; i++) codes.push(await createSpecimen(t, actor, sampleId));
      rounds.push(codes);
    }
    const warm = await createSpecimen(t, actor, sampleId);
    const user = await createUser(t, 'machinist');
    const { context, page } = await rig.newPage('phone');
    await openScanner(page, user.email, TEST_PASSWORD);
    await page.getByRole('button', { name: /^Cut\b/ }).click();
    await wedgeScan(page, warm);
    const { best: wedge, rounds: all } = await benchWedgeRounds(page, rounds);
    await context.close();
    const bundle = await measureScanBundle();
    printScanBench({ wedge, rounds: all, bundle });
    for (const round of all) expect(round.outcomes).toEqual({ accepted: 40 });
    expect(wedge.p95).toBeLessThan(150);
    expect(bundle.initialGzipBytes).toBeLessThan(250 * 1024);
  });
});
