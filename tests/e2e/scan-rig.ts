/** Where the scanner's browser tests start: their own database, a scanner browser, a manager as ledger actor, one sample. */
import type { LedgerActor } from '../../server/ledger/types';
import { startScanBrowser, type ScanBrowser } from '../../scripts/bench-scan';
import { createSample, managerActor } from '../ledger/ledger-fixtures';
import { createTestContext, type TestContext } from '../support';

/** A test database with the built app and chromium on it, an actor to register items with, and a sample to cut them from. */
export interface ScannerRig {
  t: TestContext;
  rig: ScanBrowser;
  actor: LedgerActor;
  sampleId: number;
}

/** Starts a ScannerRig; close it with closeScannerRig. */
export async function startScannerRig(): Promise<ScannerRig> {
  const t = await createTestContext();
  const rig = await startScanBrowser(t.ctx);
  const actor = await managerActor(t);
  const { sampleId } = await createSample(t);
  return { t, rig, actor, sampleId };
}

/** Closes the browser, then the database. */
export async function closeScannerRig(scanner: Partial<ScannerRig>): Promise<void> {
  await scanner.rig?.close();
  await scanner.t?.close();
}
