import type { Sequelize } from 'sequelize';
import type { AppContext } from '../app';
import { registerSpecimens } from '../commands/create-cut-list';
import type { Role } from '../../shared/permissions';

/**
 * The invented demo lab, "Larchmere Materials Testing": every name, number and person in it is
 * made up for demonstration. Returns the lines `npm start` prints about it.
 */
export async function seedDemoLab(sequelize: Sequelize): Promise<string> {
  await sequelize.transaction(async (transaction) => {
    const q = (sql: string, bind: unknown[] = []) => sequelize.query(sql, { bind, transaction });
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
    // Samples of the orders already in test; their specimens are registered through the ledger by seedDemoSpecimens.
    await q(`INSERT INTO samples (code, order_id, heat_id, position, orientation, thickness_mm)
      SELECT 'P26-' || lpad(nextval('sample_serial_seq')::text, 5, '0'), o, h, pos, ori, t FROM (VALUES
        (1, 1, 'head end, quarter-width', 'transverse', 12.700),
        (1, 2, 'head end, quarter-width', 'transverse', 12.700),
        (3, 4, 'mid-length, centre', 'longitudinal', 1.600)) AS v(o, h, pos, ori, t)`);
  });
  return 'Demo lab loaded: Larchmere Materials Testing (invented data).';
}

/**
 * One demo person per role, for trying Halfmark out. The passwords are printed by `npm start`
 * and listed in the README: they are for the demo only and must never guard real data.
 */
export const DEMO_USERS = [
  { role: 'machinist', name: 'Tamsin Rook', email: 'machinist@larchmere.example', password: 'demo-machinist-pass' },
  { role: 'technician', name: 'Idris Penhale', email: 'technician@larchmere.example', password: 'demo-technician-pass' },
  { role: 'clerk', name: 'Wren Ashdown', email: 'clerk@larchmere.example', password: 'demo-clerk-pass' },
  { role: 'auditor', name: 'Odile Marchetti', email: 'auditor@larchmere.example', password: 'demo-auditor-pass' },
  { role: 'manager', name: 'Bram Okonkwo-Hale', email: 'manager@larchmere.example', password: 'demo-manager-pass' },
] as const;

/** Adds the demo people (with badge codes) when the database has nobody yet; returns what to print, or null. */
export async function seedDemoUsers(sequelize: Sequelize): Promise<string | null> {
  const { hashPassword } = await import('../auth/passwords');
  const { badgeCode } = await import('../../shared/domain/codes');
  const [rows] = await sequelize.query('SELECT count(*)::int AS n FROM users');
  if ((rows as { n: number }[])[0]!.n > 0) return null;
  await sequelize.transaction(async (transaction) => {
    for (const u of DEMO_USERS) {
      await sequelize.query('INSERT INTO users (email, name, role, badge_code, password_hash) VALUES ($1, $2, $3, $4, $5)', {
        bind: [u.email, u.name, u.role, badgeCode(), await hashPassword(u.password)],
        transaction,
      });
    }
  });
  return demoSignInLines();
}

/** The demo sign-ins as `npm start` prints them. */
export function demoSignInLines(): string {
  const width = Math.max(...DEMO_USERS.map((u) => u.email.length));
  return ['Demo sign-ins (demo only; change or remove them before real use):', ...DEMO_USERS.map((u) => `  ${u.email.padEnd(width)}  ${u.password}  (${u.role})`)].join('\n');
}

/**
 * Registers the demo samples' specimens (as many as each order asks per heat), each with its
 * `registered` custody event, in the name of a demo person. Skips samples that already have
 * specimens, so it is safe to run again. Returns what to print.
 *
 * @param ctx - The app context (the ledger needs its configuration).
 * @param userId - The person recorded as registering them, e.g. the demo machinist.
 */
export async function seedDemoSpecimens(ctx: AppContext, userId: number): Promise<string> {
  const [users] = await ctx.sequelize.query('SELECT id, role FROM users WHERE id = $1', { bind: [userId] });
  const user = (users as { id: number; role: Role }[])[0];
  if (!user) throw new Error(`no user ${userId} to register the demo specimens`);
  const made = await ctx.sequelize.transaction(async (transaction) => {
    const [samples] = await ctx.sequelize.query(
      `SELECT s.id, s.code, s.heat_id, s.thickness_mm, h.heat_number, o.number AS order_number, o.geometry_key, o.test_standard, o.specimens_per_heat
         FROM samples s JOIN heats h ON h.id = s.heat_id JOIN orders o ON o.id = s.order_id
        WHERE NOT EXISTS (SELECT 1 FROM specimens sp WHERE sp.sample_id = s.id) ORDER BY s.id`,
      { transaction },
    );
    let count = 0;
    for (const s of samples as { id: number; code: string; heat_id: number; thickness_mm: string | null; heat_number: string; order_number: string; geometry_key: string; test_standard: string; specimens_per_heat: number }[]) {
      const specimens = await registerSpecimens(
        ctx,
        {
          sample: { id: s.id, code: s.code, heatId: s.heat_id, heatNumber: s.heat_number, orderNumber: s.order_number, thicknessMm: s.thickness_mm },
          geometryKey: s.geometry_key,
          testStandard: s.test_standard,
          count: s.specimens_per_heat,
          actor: { kind: 'user', id: user.id, role: user.role },
        },
        transaction,
      );
      count += specimens.length;
    }
    return count;
  });
  return `Demo specimens registered: ${made}.`;
}
