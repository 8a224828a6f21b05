import type { MigrationContext } from '../server/migrator';

/**
 * Retention and disposal: months and years beside the days of the customer's and the order's
 * retention rules, the lab's settings (time zone, default rule, digest), legal holds, signed
 * disposal and return batches with their documents, and the job-run rows that let only one
 * server send a scheduled digest.
 */
export async function up({ context: { sequelize } }: { context: MigrationContext }): Promise<void> {
  await sequelize.query(`
    ALTER TABLE customers
      ADD COLUMN retention_months integer CHECK (retention_months >= 0),
      ADD COLUMN retention_years  integer CHECK (retention_years >= 0),
      ADD COLUMN retention_basis  text CHECK (retention_basis IN ('report','test'));
    ALTER TABLE orders
      ADD COLUMN retention_months integer CHECK (retention_months >= 0),
      ADD COLUMN retention_years  integer CHECK (retention_years >= 0);

    -- One row (id is always true): the lab's time zone decides which calendar day a date falls on.
    CREATE TABLE lab_settings (
      id                boolean PRIMARY KEY DEFAULT true CHECK (id),
      time_zone         text NOT NULL DEFAULT 'UTC',
      retention_days    integer CHECK (retention_days >= 0),
      retention_months  integer CHECK (retention_months >= 0),
      retention_years   integer CHECK (retention_years >= 0),
      retention_basis   text NOT NULL DEFAULT 'report' CHECK (retention_basis IN ('report','test')),
      end_of_month      text NOT NULL DEFAULT 'clamp' CHECK (end_of_month IN ('clamp','overflow')),
      digest_days       integer NOT NULL DEFAULT 14 CHECK (digest_days BETWEEN 1 AND 365),
      digest_hour       integer NOT NULL DEFAULT 7 CHECK (digest_hour BETWEEN 0 AND 23),
      updated_by        integer REFERENCES users(id),
      updated_at        timestamptz NOT NULL DEFAULT now(),
      -- The lab's default is the rule of last resort, so it must name a period.
      CHECK (num_nonnulls(retention_days, retention_months, retention_years) > 0)
    );
    INSERT INTO lab_settings (retention_days) VALUES (90);

    CREATE TABLE legal_holds (
      id                 serial PRIMARY KEY,
      scope              text NOT NULL CHECK (scope IN ('order','heat','item')),
      order_id           integer REFERENCES orders(id),
      heat_id            integer REFERENCES heats(id),
      item_id            bigint REFERENCES items(id),
      ref                text NOT NULL,
      reason             text NOT NULL CHECK (length(trim(reason)) > 0),
      placed_by          integer NOT NULL REFERENCES users(id),
      placed_at          timestamptz NOT NULL DEFAULT now(),
      released_by        integer REFERENCES users(id),
      released_at        timestamptz,
      release_reason     text,
      release_signature  jsonb,
      -- A hold names exactly the one thing its scope says.
      CHECK (num_nonnulls(order_id, heat_id, item_id) = 1),
      CHECK ((scope = 'order') = (order_id IS NOT NULL)),
      CHECK ((scope = 'heat') = (heat_id IS NOT NULL)),
      CHECK ((scope = 'item') = (item_id IS NOT NULL)),
      -- A release is signed: who, when and the signature go together.
      CHECK ((released_at IS NULL) = (released_by IS NULL) AND (released_at IS NULL) = (release_signature IS NULL))
    );
    -- Every disposal check reads the holds in force; released ones are history.
    CREATE INDEX legal_holds_active_idx ON legal_holds (scope) WHERE released_at IS NULL;

    CREATE SEQUENCE disposal_batch_seq;
    -- A signed batch and the document made for it, kept as signed: append-only.
    CREATE TABLE disposal_batches (
      id               serial PRIMARY KEY,
      number           text NOT NULL UNIQUE,
      kind             text NOT NULL CHECK (kind IN ('disposal','return')),
      order_id         integer REFERENCES orders(id),
      customer_id      integer REFERENCES customers(id),
      signer_id        integer NOT NULL REFERENCES users(id),
      meaning          text NOT NULL,
      statement        text NOT NULL,
      signed_at        timestamptz NOT NULL,
      recorded_at      timestamptz NOT NULL,
      item_count       integer NOT NULL CHECK (item_count > 0),
      recipient        text,
      note             text,
      document_sha256  char(64) NOT NULL,
      document         bytea NOT NULL
    );
    CREATE INDEX disposal_batches_recorded_idx ON disposal_batches (recorded_at);
    CREATE TRIGGER disposal_batches_append_only_row BEFORE UPDATE OR DELETE ON disposal_batches
      FOR EACH ROW EXECUTE FUNCTION halfmark_refuse_change();
    CREATE TRIGGER disposal_batches_append_only_truncate BEFORE TRUNCATE ON disposal_batches
      FOR EACH STATEMENT EXECUTE FUNCTION halfmark_refuse_change();

    CREATE TABLE disposal_batch_items (
      batch_id       integer NOT NULL REFERENCES disposal_batches(id),
      position       integer NOT NULL,
      -- An item leaves the lab once: a second batch naming it fails here even if every other check missed it.
      item_id        bigint NOT NULL UNIQUE REFERENCES items(id),
      code           text NOT NULL,
      kind           text NOT NULL,
      specimen_code  text,
      order_number   text NOT NULL,
      heat_number    text NOT NULL,
      event_hash     char(64) NOT NULL,
      PRIMARY KEY (batch_id, position)
    );
    CREATE TRIGGER disposal_batch_items_append_only_row BEFORE UPDATE OR DELETE ON disposal_batch_items
      FOR EACH ROW EXECUTE FUNCTION halfmark_refuse_change();
    CREATE TRIGGER disposal_batch_items_append_only_truncate BEFORE TRUNCATE ON disposal_batch_items
      FOR EACH STATEMENT EXECUTE FUNCTION halfmark_refuse_change();

    -- Scheduled work shared by several servers: the unique (job, run_key) row is the claim, so
    -- a day's digest is sent by whichever server inserts it first, and by no other.
    CREATE TABLE job_runs (
      id           serial PRIMARY KEY,
      job          text NOT NULL,
      run_key      text NOT NULL,
      status       text NOT NULL CHECK (status IN ('running','done','failed')),
      attempts     integer NOT NULL DEFAULT 1,
      started_at   timestamptz NOT NULL DEFAULT now(),
      finished_at  timestamptz,
      detail       jsonb NOT NULL DEFAULT '{}',
      UNIQUE (job, run_key)
    );
  `);
}

export async function down({ context: { sequelize } }: { context: MigrationContext }): Promise<void> {
  await sequelize.query(`
    DROP TABLE job_runs; DROP TABLE disposal_batch_items; DROP TABLE disposal_batches; DROP SEQUENCE disposal_batch_seq;
    DROP TABLE legal_holds; DROP TABLE lab_settings;
    ALTER TABLE orders DROP COLUMN retention_months, DROP COLUMN retention_years;
    ALTER TABLE customers DROP COLUMN retention_months, DROP COLUMN retention_years, DROP COLUMN retention_basis;
  `);
}
