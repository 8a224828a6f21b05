/**
 * Test helpers for the ledger: an order with a sample to cut specimens from, specimens and
 * containers registered through the ledger, stations and instrument tokens. Invented data only.
 */
import { randomBytes, randomUUID } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { containerCode, specimenCode } from '../../shared/domain/codes';
import type { AreaPolicy } from '../../shared/domain/measurement';
import { registerItem } from '../../server/commands/record-event';
import type { LedgerActor } from '../../server/ledger/types';
import { hashToken } from '../../server/middleware/auth';
import type { ContainerType } from '../../server/ledger/container-rules';
import { createTestContext, type TestContext } from '../support';
import { createUser, signedInAs, type SignedInAgent } from '../factories';

async function one<T extends object>(t: TestContext, sql: string, bind: unknown[] = []): Promise<T> {
  const [row] = await t.sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT });
  if (!row) throw new Error(`no row from ${sql}`);
  return row;
}

/** A station row. */
export async function createStation(t: TestContext, code: string, kind = 'other'): Promise<{ id: number; code: string }> {
  return one(t, 'INSERT INTO stations (code, name, kind) VALUES ($1, $2, $3) RETURNING id, code', [code, `Station ${code}`, kind]);
}

/** An instrument token bound to a station and some event types; returns the bearer token. */
export async function createToken(t: TestContext, stationId: number, eventTypes: string[]): Promise<string> {
  const token = `hm_test_${randomBytes(16).toString('hex')}`;
  await t.sequelize.query(
    'INSERT INTO instrument_tokens (station_id, name, token_hash, token_prefix, event_types) VALUES ($1, $2, $3, $4, $5)',
    { bind: [stationId, 'Test cell', hashToken(token), token.slice(0, 12), `{${eventTypes.join(',')}}`] },
  );
  return token;
}

/** A customer, an order (with its area policy), a heat and one sample of it. */
export async function createSample(t: TestContext, opts: { areaPolicy?: AreaPolicy; geometryKey?: string } = {}): Promise<{ sampleId: number; orderId: number }> {
  const tag = randomBytes(4).toString('hex');
  const customer = await one<{ id: number }>(t, 'INSERT INTO customers (name) VALUES ($1) RETURNING id', [`Invented Forge ${tag}`]);
  const geometryKey = opts.geometryKey ?? 'astm-e8-flat-sheet-12.5';
  const order = await one<{ id: number }>(
    t,
    `INSERT INTO orders (number, customer_id, po_reference, material_spec, geometry_key, test_standard, area_policy)
     VALUES ($1, $2, $3, 'Invented spec 1', $4, 'ASTM E8/E8M', $5) RETURNING id`,
    [`O-${tag}`, customer.id, `PO-${tag}`, geometryKey, opts.areaPolicy ?? 'min-dimensions'],
  );
  const heat = await one<{ id: number }>(
    t,
    `INSERT INTO heats (heat_number, material, grade, producer) VALUES ($1, 'steel', 'G1', 'Invented Mill') RETURNING id`,
    [`H-${tag}`],
  );
  await t.sequelize.query('INSERT INTO order_heats (order_id, heat_id) VALUES ($1, $2)', { bind: [order.id, heat.id] });
  const sample = await one<{ id: number }>(
    t,
    `INSERT INTO samples (code, order_id, heat_id, position, orientation) VALUES ($1, $2, $3, 'edge', 'L') RETURNING id`,
    [`M-${tag}`, order.id, heat.id],
  );
  return { sampleId: sample.id, orderId: order.id };
}

/** A person who may do everything (a lab manager), as a ledger actor. */
export async function managerActor(t: TestContext): Promise<LedgerActor> {
  const user = await createUser(t, 'manager');
  return { kind: 'user', id: user.id, role: 'manager' };
}

/** Where most ledger tests start: their own database, a signed-in technician, a manager as ledger actor, one sample. */
export interface LedgerRig {
  t: TestContext;
  tech: SignedInAgent;
  actor: LedgerActor;
  sampleId: number;
}

/** Sets up a LedgerRig; close it with `rig.t.close()`. */
export async function startLedgerRig(): Promise<LedgerRig> {
  const t = await createTestContext();
  const tech = await signedInAs(t, 'technician');
  const actor = await managerActor(t);
  const { sampleId } = await createSample(t);
  return { t, tech, actor, sampleId };
}

/** Registers a specimen of a sample through the ledger (items row, registered event, specimens row). */
export async function createSpecimen(
  t: TestContext,
  actor: LedgerActor,
  sampleId: number,
  geometryKey = 'astm-e8-flat-sheet-12.5',
): Promise<string> {
  const serial = await one<{ serial: string }>(t, `SELECT nextval('specimen_serial_seq') AS serial`);
  const code = specimenCode(26, Number(serial.serial));
  const shape = geometryKey.includes('round') ? 'round' : 'flat';
  await t.sequelize.transaction(async (transaction) => {
    const { itemId } = await registerItem(t.ctx, { kind: 'specimen', code, payload: { sample: sampleId } }, { actor, transaction });
    await t.sequelize.query(
      `INSERT INTO specimens (item_id, sample_id, serial, geometry_key, shape, test_standard, nominal)
       VALUES ($1, $2, $3, $4, $5, 'ASTM E8/E8M', '{}'::jsonb)`,
      { bind: [itemId, sampleId, Number(serial.serial), geometryKey, shape], transaction },
    );
  });
  return code;
}

/** Registers a container through the ledger. */
export async function createContainer(
  t: TestContext,
  actor: LedgerActor,
  containerType: ContainerType,
  opts: { binHalf?: 'A' | 'B'; inside?: string } = {},
): Promise<string> {
  const serial = await one<{ serial: string }>(t, `SELECT nextval('container_serial_seq') AS serial`);
  const code = containerCode(Number(serial.serial));
  await t.sequelize.transaction(async (transaction) => {
    const { itemId } = await registerItem(
      t.ctx,
      { kind: 'container', code, containerCode: opts.inside ?? null, payload: { containerType } },
      { actor, transaction },
    );
    await t.sequelize.query('INSERT INTO containers (item_id, serial, container_type, name, bin_half) VALUES ($1, $2, $3, $4, $5)', {
      bind: [itemId, Number(serial.serial), containerType, `Test ${containerType} ${serial.serial}`, opts.binHalf ?? null],
      transaction,
    });
  });
  return code;
}

/** A fresh event body for POST /api/events. */
export function scan(type: string, itemCode: string, extra: Record<string, unknown> = {}): Record<string, unknown> {
  return { idempotencyKey: randomUUID(), type, itemCode, occurredAt: new Date().toISOString(), ...extra };
}

/** Three flat readings well within the 12.5 mm sheet-type geometry. */
export const FLAT_READINGS = { shape: 'flat', width: ['12.50', '12.52', '12.49'], thickness: ['2.01', '2.00', '2.02'] };

/** Counts rows of a table (as the owner, who sees everything). */
export async function countRows(t: TestContext, table: string, where = 'true', bind: unknown[] = []): Promise<number> {
  const [row] = await t.owner.query<{ n: number }>(`SELECT count(*)::integer AS n FROM ${table} WHERE ${where}`, {
    bind,
    type: QueryTypes.SELECT,
  });
  return row?.n ?? 0;
}
