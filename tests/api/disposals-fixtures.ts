/**
 * Test helpers for retention and disposal: an order whose specimens were tested and fractured,
 * with both halves binned and then retained in a bag, the report issued at a chosen time.
 * Invented data only.
 */
import { QueryTypes } from 'sequelize';
import { halfCode } from '../../shared/domain/codes';
import { recordEvent } from '../../server/commands/record-event';
import type { LedgerActor } from '../../server/ledger/types';
import type { SignedInAgent } from '../factories';
import { TEST_PASSWORD } from '../factories';
import { createContainer, createSample, createSpecimen, FLAT_READINGS, scan } from '../ledger/ledger-fixtures';
import type { TestContext } from '../support';

/** An order with retained halves. */
export interface RetainedOrder {
  orderId: number;
  order: string;
  heat: string;
  customerId: number;
  specimens: string[];
  halves: string[];
  bag: string;
}

/**
 * Makes an order with `specimens` specimens, each tested to fracture, both halves binned and
 * retained in one bag; sets the order's retention days and when its report was issued.
 */
export async function retainedOrder(
  t: TestContext,
  actor: LedgerActor,
  opts: { reportIssuedAt: Date | null; retentionDays?: number | null; specimens?: number; bag?: string },
): Promise<RetainedOrder> {
  const { sampleId, orderId } = await createSample(t);
  await t.owner.query('UPDATE orders SET retention_days = $2, report_issued_at = $3 WHERE id = $1', {
    bind: [orderId, opts.retentionDays === undefined ? 30 : opts.retentionDays, opts.reportIssuedAt],
  });
  const [facts] = await t.owner.query<{ order: string; heat: string; customer_id: number }>(
    `SELECT o.number AS "order", h.heat_number AS heat, o.customer_id FROM samples s JOIN orders o ON o.id = s.order_id
       JOIN heats h ON h.id = s.heat_id WHERE s.id = $1`,
    { bind: [sampleId], type: QueryTypes.SELECT },
  );
  const bin = await createContainer(t, actor, 'bin');
  const bag = opts.bag ?? (await createContainer(t, actor, 'bag'));
  const specimens: string[] = [];
  const halves: string[] = [];
  for (let n = 0; n < (opts.specimens ?? 2); n++) {
    const code = await createSpecimen(t, actor, sampleId);
    specimens.push(code);
    await recordEvent(t.ctx, scan('cut', code), { actor });
    await recordEvent(t.ctx, scan('measured', code, { payload: FLAT_READINGS }), { actor });
    await recordEvent(t.ctx, scan('tested', code, { payload: { fractured: true } }), { actor });
    for (const side of ['A', 'B'] as const) {
      const half = halfCode(code, side);
      halves.push(half);
      await recordEvent(t.ctx, scan('binned', half, { containerCode: bin }), { actor });
      await recordEvent(t.ctx, scan('retained', half, { containerCode: bag }), { actor });
    }
  }
  return { orderId, order: facts?.order ?? '', heat: facts?.heat ?? '', customerId: facts?.customer_id ?? 0, specimens, halves, bag };
}

/** Signs with the agent's password for a meaning; returns the single-use token. */
export async function sign(agent: SignedInAgent, meaning: string): Promise<string> {
  const res = await agent.post('/api/auth/signature', { password: TEST_PASSWORD, meaning });
  if (res.status !== 201 && res.status !== 200) throw new Error(`signature refused: ${res.status} ${JSON.stringify(res.body)}`);
  return (res.body as { signatureToken: string }).signatureToken;
}

/** The state of an item in the items table. */
export async function stateOf(t: TestContext, code: string): Promise<string> {
  const [row] = await t.owner.query<{ state: string }>('SELECT state FROM items WHERE code = $1', { bind: [code], type: QueryTypes.SELECT });
  return row?.state ?? 'missing';
}

/** A day's worth of milliseconds. */
export const DAY_MS = 86_400_000;
