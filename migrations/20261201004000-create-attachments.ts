import type { MigrationContext } from '../server/migrator';

/**
 * Attachments: files (fracture photos, raw data, test video, conditioning logs) kept in object
 * storage under their SHA-256. One row per distinct content; the `attached` ledger events that
 * cite a hash say which item it belongs to, so the same file attached twice is stored once.
 */
export async function up({ context: { sequelize } }: { context: MigrationContext }): Promise<void> {
  await sequelize.query(`
    CREATE TABLE attachments (
      sha256        char(64) PRIMARY KEY CHECK (sha256 ~ '^[0-9a-f]{64}$'),
      size_bytes    bigint NOT NULL CHECK (size_bytes >= 0),
      media_type    text NOT NULL,
      category      text NOT NULL CHECK (category IN ('photo','raw_data','video','conditioning_log')),
      file_name     text NOT NULL,
      -- Where the object lives: the key in the bucket (content-addressed, derived from the hash).
      object_key    text NOT NULL,
      uploaded_by_user_id   integer REFERENCES users(id),
      uploaded_by_token_id  integer REFERENCES instrument_tokens(id),
      created_at    timestamptz NOT NULL DEFAULT now(),
      CHECK ((uploaded_by_user_id IS NULL) <> (uploaded_by_token_id IS NULL))
    );
    -- Lists of recent uploads read by time.
    CREATE INDEX attachments_created_idx ON attachments (created_at);
    -- The ledger cites these hashes: a row may never change or go, or a cited file would be lost.
    CREATE TRIGGER attachments_append_only_row BEFORE UPDATE OR DELETE ON attachments
      FOR EACH ROW EXECUTE FUNCTION halfmark_refuse_change();
    CREATE TRIGGER attachments_append_only_truncate BEFORE TRUNCATE ON attachments
      FOR EACH STATEMENT EXECUTE FUNCTION halfmark_refuse_change();
  `);
}

export async function down({ context: { sequelize } }: { context: MigrationContext }): Promise<void> {
  await sequelize.query(`
    DROP TABLE attachments;
  `);
}
