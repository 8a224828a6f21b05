import type { MigrationContext } from '../server/migrator';

/** Customers, orders, heats and samples: what a lab registers before a saw cuts. */
export async function up({ context: { sequelize } }: { context: MigrationContext }): Promise<void> {
  await sequelize.query(`
    CREATE TABLE customers (
      id              serial PRIMARY KEY,
      name            text NOT NULL,
      contact_email   text,
      retention_days  integer CHECK (retention_days >= 0),
      created_at      timestamptz NOT NULL DEFAULT now(),
      updated_at      timestamptz NOT NULL DEFAULT now()
    );
    CREATE UNIQUE INDEX customers_name_lower_key ON customers (lower(name));

    CREATE TABLE orders (
      id                  serial PRIMARY KEY,
      number              text NOT NULL UNIQUE,
      customer_id         integer NOT NULL REFERENCES customers(id),
      po_reference        text NOT NULL,
      material_spec       text NOT NULL,
      tests_requested     text[] NOT NULL DEFAULT '{tensile}',
      specimens_per_heat  integer NOT NULL DEFAULT 2 CHECK (specimens_per_heat BETWEEN 1 AND 50),
      geometry_key        text NOT NULL,
      test_standard       text NOT NULL,
      area_policy         text NOT NULL DEFAULT 'min-dimensions'
                            CHECK (area_policy IN ('min-dimensions','least-section','mean-section')),
      retention_days      integer CHECK (retention_days >= 0),
      retention_basis     text NOT NULL DEFAULT 'report' CHECK (retention_basis IN ('report','test')),
      conditioning        jsonb,
      due_date            date,
      status              text NOT NULL DEFAULT 'open' CHECK (status IN ('open','in_test','reported','closed')),
      report_issued_at    timestamptz,
      created_at          timestamptz NOT NULL DEFAULT now(),
      updated_at          timestamptz NOT NULL DEFAULT now()
    );
    -- Order lists filter by customer and sort by due date.
    CREATE INDEX orders_customer_idx ON orders (customer_id);
    CREATE INDEX orders_due_idx ON orders (due_date);

    CREATE TABLE heats (
      id               serial PRIMARY KEY,
      heat_number      text NOT NULL,
      material         text NOT NULL,
      grade            text NOT NULL,
      producer         text NOT NULL,
      certificate_ref  text,
      created_at       timestamptz NOT NULL DEFAULT now(),
      updated_at       timestamptz NOT NULL DEFAULT now()
    );
    -- A heat number is unique for its producer; two producers may reuse a number.
    CREATE UNIQUE INDEX heats_number_producer_key ON heats (lower(heat_number), lower(producer));

    -- Which heats an order covers; the primary key refuses the same heat twice in one order.
    CREATE TABLE order_heats (
      order_id   integer NOT NULL REFERENCES orders(id),
      heat_id    integer NOT NULL REFERENCES heats(id),
      created_at timestamptz NOT NULL DEFAULT now(),
      PRIMARY KEY (order_id, heat_id)
    );

    CREATE TABLE samples (
      id            serial PRIMARY KEY,
      code          text NOT NULL UNIQUE,
      order_id      integer NOT NULL,
      heat_id       integer NOT NULL,
      position      text NOT NULL,
      orientation   text NOT NULL,
      thickness_mm  numeric(10,3),
      created_at    timestamptz NOT NULL DEFAULT now(),
      updated_at    timestamptz NOT NULL DEFAULT now(),
      -- A sample is a piece of one heat received for one order: the pair must be on the order.
      FOREIGN KEY (order_id, heat_id) REFERENCES order_heats (order_id, heat_id)
    );
    CREATE INDEX samples_heat_idx ON samples (heat_id);
    CREATE SEQUENCE sample_serial_seq;
  `);
}

export async function down({ context: { sequelize } }: { context: MigrationContext }): Promise<void> {
  await sequelize.query(`
    DROP SEQUENCE sample_serial_seq; DROP TABLE samples; DROP TABLE order_heats; DROP TABLE heats;
    DROP TABLE orders; DROP TABLE customers;
  `);
}
