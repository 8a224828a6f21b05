import type { MigrationContext } from '../server/migrator';

/**
 * Tensile results and what they are judged and reported with: specifications a lab adds to the
 * built-in table, the specification chosen for an order whose material text names none, raw
 * force–extension records as uploaded, every computation of a specimen's results (each kept;
 * the newest is current), and issued test reports with their unique numbers and signed PDFs.
 */
export async function up({ context: { sequelize } }: { context: MigrationContext }): Promise<void> {
  await sequelize.query(`
    CREATE TABLE specifications (
      key          text PRIMARY KEY,
      body         jsonb NOT NULL,
      created_by   integer NOT NULL REFERENCES users(id),
      created_at   timestamptz NOT NULL DEFAULT now()
    );

    -- An order whose material_spec text matches no specification key names one here.
    CREATE TABLE order_specifications (
      order_id     integer PRIMARY KEY REFERENCES orders(id),
      spec_key     text NOT NULL,
      chosen_by    integer NOT NULL REFERENCES users(id),
      chosen_at    timestamptz NOT NULL DEFAULT now()
    );

    -- The file as uploaded (text) with its SHA-256, so a reported value can be recomputed from it.
    CREATE TABLE raw_records (
      id                 bigserial PRIMARY KEY,
      specimen_item_id   bigint NOT NULL REFERENCES items(id),
      sha256             char(64) NOT NULL CHECK (sha256 ~ '^[0-9a-f]{64}$'),
      size_bytes         integer NOT NULL CHECK (size_bytes >= 0),
      file_name          text,
      csv                text NOT NULL,
      mapping            jsonb NOT NULL,
      point_count        integer NOT NULL CHECK (point_count > 0),
      uploaded_by        integer NOT NULL REFERENCES users(id),
      created_at         timestamptz NOT NULL DEFAULT now()
    );
    -- A specimen's records are listed newest first.
    CREATE INDEX raw_records_specimen_idx ON raw_records (specimen_item_id, id DESC);
    -- A record cited by results must never change or go.
    CREATE TRIGGER raw_records_append_only_row BEFORE UPDATE OR DELETE ON raw_records
      FOR EACH ROW EXECUTE FUNCTION halfmark_refuse_change();
    CREATE TRIGGER raw_records_append_only_truncate BEFORE TRUNCATE ON raw_records
      FOR EACH STATEMENT EXECUTE FUNCTION halfmark_refuse_change();

    -- Every computation is kept (a correction keeps the original, ISO/IEC 17025 7.5.2); the newest is current.
    CREATE TABLE specimen_results (
      id                 bigserial PRIMARY KEY,
      specimen_item_id   bigint NOT NULL REFERENCES items(id),
      raw_record_id      bigint REFERENCES raw_records(id),
      measured_event_hash char(64) NOT NULL,
      tested_event_hash  char(64) NOT NULL,
      inputs             jsonb NOT NULL,
      results            jsonb NOT NULL,
      entered_by         integer NOT NULL REFERENCES users(id),
      created_at         timestamptz NOT NULL DEFAULT now()
    );
    -- "The current results of this specimen" is the newest row.
    CREATE INDEX specimen_results_specimen_idx ON specimen_results (specimen_item_id, id DESC);
    CREATE TRIGGER specimen_results_append_only_row BEFORE UPDATE OR DELETE ON specimen_results
      FOR EACH ROW EXECUTE FUNCTION halfmark_refuse_change();
    CREATE TRIGGER specimen_results_append_only_truncate BEFORE TRUNCATE ON specimen_results
      FOR EACH STATEMENT EXECUTE FUNCTION halfmark_refuse_change();

    CREATE SEQUENCE test_report_serial_seq;
    CREATE TABLE test_reports (
      id             bigserial PRIMARY KEY,
      -- The number printed on every page; unique across the lab, never reused.
      number         text NOT NULL UNIQUE,
      order_id       integer NOT NULL REFERENCES orders(id),
      issued_at      timestamptz NOT NULL,
      issued_by      integer NOT NULL REFERENCES users(id),
      signature      jsonb NOT NULL,
      reason         text,
      supersedes     text REFERENCES test_reports(number),
      content        jsonb NOT NULL,
      pdf            bytea NOT NULL,
      pdf_sha256     char(64) NOT NULL CHECK (pdf_sha256 ~ '^[0-9a-f]{64}$'),
      created_at     timestamptz NOT NULL DEFAULT now()
    );
    -- An order's reports are listed newest first.
    CREATE INDEX test_reports_order_idx ON test_reports (order_id, id DESC);
    -- An issued report is a record: it is superseded by a new one, never changed.
    CREATE TRIGGER test_reports_append_only_row BEFORE UPDATE OR DELETE ON test_reports
      FOR EACH ROW EXECUTE FUNCTION halfmark_refuse_change();
    CREATE TRIGGER test_reports_append_only_truncate BEFORE TRUNCATE ON test_reports
      FOR EACH STATEMENT EXECUTE FUNCTION halfmark_refuse_change();
  `);
}

export async function down({ context: { sequelize } }: { context: MigrationContext }): Promise<void> {
  await sequelize.query(`
    DROP TABLE test_reports; DROP SEQUENCE test_report_serial_seq; DROP TABLE specimen_results;
    DROP TABLE raw_records; DROP TABLE order_specifications; DROP TABLE specifications;
  `);
}
