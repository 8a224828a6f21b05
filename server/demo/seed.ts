import type { Sequelize } from 'sequelize';

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
  });
  return 'Demo lab loaded: Larchmere Materials Testing (invented data).';
}
