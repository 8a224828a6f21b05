/**
 * A specimen's whole life built through the ledger for the trace and audit tests: an order, a
 * heat and a sample; the specimen registered, cut, measured and tested to fracture; its halves
 * binned and half A retained in a bag on a shelf. Invented data only.
 */
import { randomUUID } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { recordEvent } from '../../server/commands/record-event';
import type { LedgerActor } from '../../server/ledger/types';
import { createTestContext, type TestContext } from '../support';
import { signedInAs, type SignedInAgent } from '../factories';
import { createContainer, createSample, createSpecimen, createStation, FLAT_READINGS, managerActor } from '../ledger/ledger-fixtures';

/** What buildLife made. */
export interface Life {
  actor: LedgerActor;
  orderId: number;
  orderNumber: string;
  poReference: string;
  heatNumber: string;
  sampleCode: string;
  specimen: string;
  halfA: string;
  halfB: string;
  bag: string;
  shelf: string;
  stations: { saw: string; gauge: string; frame: string; bins: string; store: string };
}

/**
 * Records registered → cut → measured → tested (fractured) → half A and B binned → half A
 * retained in a bag on a shelf, each event through recordEvent, a few seconds apart in device time.
 */
export async function buildLife(t: TestContext, opts: { tag?: string } = {}): Promise<Life> {
  const tag = opts.tag ?? randomUUID().slice(0, 4).toUpperCase();
  const actor = await managerActor(t);
  const { sampleId, orderId } = await createSample(t);
  const stations = {
    saw: (await createStation(t, `SAW-${tag}`, 'saw')).code,
    gauge: (await createStation(t, `GAUGE-${tag}`, 'gauge')).code,
    frame: (await createStation(t, `FRAME-${tag}`, 'frame')).code,
    bins: (await createStation(t, `BINS-${tag}`, 'bins')).code,
    store: (await createStation(t, `STORE-${tag}`, 'store')).code,
  };
  const binA = await createContainer(t, actor, 'bin', { binHalf: 'A' });
  const binB = await createContainer(t, actor, 'bin', { binHalf: 'B' });
  const shelf = await createContainer(t, actor, 'shelf');
  const bag = await createContainer(t, actor, 'bag', { inside: shelf });
  const specimen = await createSpecimen(t, actor, sampleId);
  // Device times a few seconds apart from now on: after the registration, never far ahead of the server.
  const start = Date.now();
  let step = 0;
  const at = () => new Date(start + 5_000 * ++step).toISOString();
  const record = async (type: string, itemCode: string, extra: Record<string, unknown> = {}) =>
    recordEvent(t.ctx, { idempotencyKey: randomUUID(), type, itemCode, occurredAt: at(), ...extra }, { actor });
  await record('cut', specimen, { stationCode: stations.saw });
  await record('measured', specimen, { stationCode: stations.gauge, payload: FLAT_READINGS });
  const tested = await record('tested', specimen, { stationCode: stations.frame, payload: { fractured: true, maxForceN: 11250 } });
  const [halfA, halfB] = tested.halves as [string, string];
  await record('binned', halfA, { stationCode: stations.bins, containerCode: binA });
  await record('binned', halfB, { stationCode: stations.bins, containerCode: binB });
  await record('retained', halfA, { stationCode: stations.store, containerCode: bag });
  const [order] = await t.sequelize.query<{ number: string; po_reference: string; heat_number: string; sample_code: string }>(
    `SELECT o.number, o.po_reference, h.heat_number, sa.code AS sample_code
       FROM samples sa JOIN orders o ON o.id = sa.order_id JOIN heats h ON h.id = sa.heat_id WHERE sa.id = $1`,
    { bind: [sampleId], type: QueryTypes.SELECT },
  );
  if (!order) throw new Error('the sample has no order');
  return {
    actor,
    orderId,
    orderNumber: order.number,
    poReference: order.po_reference,
    heatNumber: order.heat_number,
    sampleCode: order.sample_code,
    specimen,
    halfA,
    halfB,
    bag,
    shelf,
    stations,
  };
}

/** Where the trace tests start: their own database, a signed-in auditor, and one specimen's whole life. */
export async function startTraceRig(): Promise<{ t: TestContext; auditor: SignedInAgent; life: Life }> {
  const t = await createTestContext();
  const auditor = await signedInAs(t, 'auditor');
  const life = await buildLife(t);
  return { t, auditor, life };
}
