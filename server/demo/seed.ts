import type { Sequelize } from 'sequelize';
import type { AppContext } from '../app';
import { defineModels } from '../models/registry';
import { badgeCode } from '../../shared/domain/codes';
import { ROLE_LABELS, type Role } from '../../shared/permissions';
import { hashPassword } from '../auth/passwords';
import { createCutList } from '../commands/create-cut-list';
import { recordEvent, type LedgerActor } from '../commands/record-event';
import { registerContainer } from '../commands/register-container';

/** The demo lab's people: one per role. Invented names; the passwords are for the demo only. */
export const DEMO_USERS: { role: Role; name: string; email: string; password: string; pin: string }[] = [
  { role: 'manager', name: 'Rowan Ashdown', email: 'rowan@larchmere.example', password: 'demo-manager-2026', pin: '2468' },
  { role: 'machinist', name: 'Tess Marlow', email: 'tess@larchmere.example', password: 'demo-machinist-2026', pin: '1357' },
  { role: 'technician', name: 'Idris Penhale', email: 'idris@larchmere.example', password: 'demo-technician-2026', pin: '8642' },
  { role: 'clerk', name: 'Jun Calloway', email: 'jun@larchmere.example', password: 'demo-clerk-2026', pin: '9753' },
  { role: 'auditor', name: 'Saskia Brandt', email: 'saskia@larchmere.example', password: 'demo-auditor-2026', pin: '3141' },
];

const FLAT_40 = { shape: 'flat', width: ['40.06', '39.94', '40.02'], thickness: ['12.71', '12.68', '12.70'] };
const FLAT_12_5 = { shape: 'flat', width: ['12.52', '12.47', '12.50'], thickness: ['1.99', '2.02', '2.00'] };

/**
 * The invented demo lab, "Larchmere Materials Testing": every name, number and person in it is
 * made up. This part writes the reference data: stations, customers, orders and heats.
 */
export async function seedDemoLab(sequelize: Sequelize): Promise<string> {
  await sequelize.transaction(async (transaction) => {
    const q = (sql: string) => sequelize.query(sql, { transaction });
    await q(`INSERT INTO stations (code, name, kind) VALUES
      ('SAW-1','Band saw bay','saw'), ('MILL-1','Specimen mill','mill'),
      ('COND-1','Conditioning chamber 23/50','conditioning'), ('GAUGE-1','Dimension gauge','gauge'),
      ('FRAME-1','Tensile frame, cell 1','frame'), ('BINS-1','Cell 1 half bins','bins'),
      ('STORE-1','Retained-sample store','store')`);
    await q(`INSERT INTO customers (name, contact_email, retention_days) VALUES
      ('Orrin Bay Fabricators','quality@orrinbay.example', 365),
      ('Cinderfell Extrusions','lab@cinderfell.example', 180),
      ('Lowmarsh Polymers','qa@lowmarsh.example', 90)`);
    await q(`INSERT INTO orders (number, customer_id, po_reference, material_spec, specimens_per_heat, geometry_key,
              test_standard, retention_days, due_date, status) VALUES
      ('LM-26-0101', 1, 'OB-PO-7781', 'ASTM A36', 2, 'astm-e8-flat-plate-40', 'ASTM E8/E8M', 365, '2026-12-12', 'in_test'),
      ('LM-26-0102', 1, 'OB-PO-7790', 'ASTM A572 Grade 50', 3, 'astm-e8-flat-sheet-12.5', 'ASTM E8/E8M', NULL, '2026-12-19', 'open'),
      ('LM-26-0103', 2, 'CX-4410-B', 'ASTM B209 6061-T6', 2, 'astm-e8-flat-sheet-12.5', 'ASTM E8/E8M', NULL, '2026-12-15', 'in_test')`);
    await q(`INSERT INTO heats (heat_number, material, grade, producer, certificate_ref) VALUES
      ('H24-31877','Carbon steel plate','A36','Thornbury Rolling (invented)','TR-3.1-55012'),
      ('H24-31902','Carbon steel plate','A36','Thornbury Rolling (invented)','TR-3.1-55040'),
      ('K7-20455','HSLA steel plate','A572 Gr 50','Kessock Steel (invented)','KS-88213'),
      ('AL-6061-7731','Aluminium sheet','6061-T6','Brackwater Aluminium (invented)','BA-2026-7731')`);
    await q(`INSERT INTO order_heats (order_id, heat_id) VALUES (1,1), (1,2), (2,3), (3,4)`);
  });
  return 'Demo lab loaded: Larchmere Materials Testing (invented data).';
}

/** The lines npm start prints about the demo sign-ins. */
export function demoSignInLines(): string {
  const width = Math.max(...DEMO_USERS.map((u) => u.email.length));
  return [
    'Demo sign-ins (demo only; change or remove them before real use):',
    ...DEMO_USERS.map((u) => `  ${u.email.padEnd(width)}  ${u.password.padEnd(22)} ${ROLE_LABELS[u.role]}`),
  ].join('\n');
}

/** Adds the demo people, with badges and PINs, when the lab has nobody yet; returns their sign-ins. */
export async function seedDemoUsers(sequelize: Sequelize): Promise<string | null> {
  const { User } = defineModels(sequelize);
  if ((await User.count()) > 0) return null;
  for (const u of DEMO_USERS) {
    await User.create({
      email: u.email,
      name: u.name,
      role: u.role,
      badgeCode: badgeCode(),
      passwordHash: await hashPassword(u.password),
      pinHash: await hashPassword(u.pin),
      lockedUntil: null,
    });
  }
  return demoSignInLines();
}

const DEMO_CUT = { position: 'head end, 50 mm from the edge', orientation: 'longitudinal' };

/** The demo's story starts this long before it is loaded: specimens registered, then hand-offs. */
const DEMO_STORY_HOURS = 7;
const storyStart = () => Date.now() - DEMO_STORY_HOURS * 3600_000;

/** Makes the cut lists of the demo orders in test (LM-26-0101 and LM-26-0103) that have none yet. */
export async function seedDemoSpecimens(ctx: AppContext, userId: number): Promise<string> {
  const [rows] = await ctx.sequelize.query(
    `SELECT o.id FROM orders o WHERE o.number IN ('LM-26-0101','LM-26-0103')
        AND NOT EXISTS (SELECT 1 FROM samples s WHERE s.order_id = o.id) ORDER BY o.number`,
  );
  const user = await ctx.models.User.findByPk(userId);
  if (!user) throw new Error(`No user ${userId} to register the demo specimens.`);
  let made = 0;
  for (const { id } of rows as { id: number }[]) {
    const result = await createCutList(ctx, id, DEMO_CUT, { kind: 'user', id: user.id, role: user.role }, { occurredAt: new Date(storyStart()).toISOString() });
    made += result.specimens.length;
  }
  return `Demo specimens registered: ${made}.`;
}

/**
 * Walks the demo specimens through the lab, through the ledger's own command: cut at the saw,
 * measured, tested to fracture, halves binned and retained in a bag in a box on a shelf, one held
 * for a saw burn. Containers are registered first. Skipped when the lab already has containers.
 */
export async function seedDemoActivity(ctx: AppContext): Promise<string | null> {
  const [existing] = await ctx.sequelize.query(`SELECT count(*)::int AS n FROM containers`);
  if ((existing as { n: number }[])[0]!.n > 0) return null;
  const actors = {} as Record<Role, LedgerActor>;
  for (const u of DEMO_USERS) {
    const user = await ctx.models.User.findOne({ where: { email: u.email } });
    if (!user) return null;
    actors[u.role] = { kind: 'user', id: user.id, role: user.role };
  }
  const clerk = { actor: actors.clerk };
  const binA = await registerContainer(ctx, { containerType: 'bin', name: 'Cell 1 bin A (marked halves, whole specimens)', binHalf: 'A', stationCode: 'BINS-1' }, clerk);
  const binB = await registerContainer(ctx, { containerType: 'bin', name: 'Cell 1 bin B', binHalf: 'B', stationCode: 'BINS-1' }, clerk);
  const shelf = await registerContainer(ctx, { containerType: 'shelf', name: 'Store rack R1, shelf 2', stationCode: 'STORE-1' }, clerk);
  const box = await registerContainer(ctx, { containerType: 'box', name: 'Box: Orrin Bay, December', containerCode: shelf }, clerk);
  const bag = await registerContainer(ctx, { containerType: 'bag', name: 'Bag: LM-26-0101 heat H24-31877', containerCode: box }, clerk);

  const specimensOf = async (orderNumber: string) => {
    const [rows] = await ctx.sequelize.query(
      `SELECT i.code FROM items i JOIN specimens sp ON sp.item_id = i.id JOIN samples s ON s.id = sp.sample_id
         JOIN orders o ON o.id = s.order_id WHERE o.number = $1 ORDER BY sp.serial`,
      { bind: [orderNumber] },
    );
    return (rows as { code: string }[]).map((r) => r.code);
  };

  // Times run forward from an hour after the specimens were registered, a minute and a half per hand-off.
  let clock = storyStart() + 3600_000;
  let n = 0;
  const step = async (role: Role, type: string, itemCode: string, more: { station?: string; container?: string; payload?: Record<string, unknown> } = {}) => {
    clock += 90_000;
    n += 1;
    return recordEvent(
      ctx,
      {
        idempotencyKey: `demo-${n}`,
        type,
        itemCode,
        stationCode: more.station,
        containerCode: more.container ?? null,
        occurredAt: new Date(clock).toISOString(),
        payload: more.payload ?? {},
      },
      { actor: actors[role] },
    );
  };

  const [s1, s2, s3, s4] = await specimensOf('LM-26-0101');
  for (const code of [s1, s2, s3, s4]) await step('machinist', 'cut', code!, { station: 'SAW-1' });
  for (const code of [s1, s2, s3]) await step('technician', 'measured', code!, { station: 'GAUGE-1', payload: FLAT_40 });
  await step('machinist', 'held', s4!, { station: 'SAW-1', payload: { reason: 'Saw burn along one edge; awaiting the lab manager’s decision.' } });
  for (const [code, force] of [[s1, '243100'], [s2, '238700']] as const) {
    const tested = await step('technician', 'tested', code!, { station: 'FRAME-1', payload: { fractured: true, maxForceN: force } });
    const [halfA, halfB] = tested.halves;
    await step('technician', 'binned', halfA!, { station: 'BINS-1', container: binA });
    await step('technician', 'binned', halfB!, { station: 'BINS-1', container: binB });
    if (code === s1) {
      await step('clerk', 'retained', halfA!, { station: 'STORE-1', container: bag });
      await step('clerk', 'retained', halfB!, { station: 'STORE-1', container: bag });
    }
  }
  const [a1] = await specimensOf('LM-26-0103');
  await step('machinist', 'cut', a1!, { station: 'SAW-1' });
  await step('technician', 'measured', a1!, { station: 'GAUGE-1', payload: FLAT_12_5 });
  return `Demo activity recorded: ${n} custody events.`;
}

/** Loads the whole demo lab into an empty database: reference data, people, specimens, activity. */
export async function loadDemoLab(ctx: AppContext): Promise<string> {
  const lines = [await seedDemoLab(ctx.sequelize)];
  const signIns = await seedDemoUsers(ctx.sequelize);
  const machinist = await ctx.models.User.findOne({ where: { role: 'machinist' } });
  if (machinist) lines.push(await seedDemoSpecimens(ctx, machinist.id));
  lines.push((await seedDemoActivity(ctx)) ?? '');
  if (signIns) lines.push(signIns);
  return lines.filter(Boolean).join('\n');
}
