import type { MigrationContext } from '../server/migrator';

/**
 * Items (specimens, halves, containers) with their current-state projection, and the custody
 * ledger: append-only events chained per item, daily seals, and the log of refused scans.
 */
export async function up({ context: { sequelize } }: { context: MigrationContext }): Promise<void> {
  await sequelize.query(`
    -- Raised by the append-only triggers below; grantAppRole() finds the ledger's tables by
    -- these triggers' names, so keep "append_only" in every such trigger's name.
    CREATE FUNCTION halfmark_refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      RAISE EXCEPTION '% on % refused: the custody ledger is append-only; record a void event instead',
        TG_OP, TG_TABLE_NAME USING ERRCODE = 'P0001';
    END $$;

    CREATE TABLE items (
      id              bigserial PRIMARY KEY,
      code            text NOT NULL UNIQUE,
      kind            text NOT NULL CHECK (kind IN ('specimen','half','container')),
      parent_item_id  bigint REFERENCES items(id),
      half            char(1) CHECK (half IN ('A','B')),
      -- Projection of the ledger: rebuilt from custody_events at any time and compared.
      state           text NOT NULL,
      container_id    bigint REFERENCES items(id),
      station_id      integer REFERENCES stations(id),
      projection      jsonb NOT NULL DEFAULT '{}',
      last_seq        integer NOT NULL DEFAULT 0,
      head_hash       char(64),
      last_event_at   timestamptz,
      created_at      timestamptz NOT NULL DEFAULT now()
    );
    -- "What is in this container" and "what sits at this station" are asked on every scan.
    CREATE INDEX items_container_idx ON items (container_id) WHERE container_id IS NOT NULL;
    CREATE INDEX items_station_idx ON items (station_id) WHERE station_id IS NOT NULL;
    CREATE INDEX items_parent_idx ON items (parent_item_id) WHERE parent_item_id IS NOT NULL;
    CREATE INDEX items_kind_state_idx ON items (kind, state);

    CREATE TABLE specimens (
      item_id        bigint PRIMARY KEY REFERENCES items(id),
      sample_id      integer NOT NULL REFERENCES samples(id),
      serial         integer NOT NULL UNIQUE,
      geometry_key   text NOT NULL,
      shape          text NOT NULL CHECK (shape IN ('flat','round')),
      test_standard  text NOT NULL,
      nominal        jsonb NOT NULL,
      replaces_item_id bigint REFERENCES items(id),
      created_at     timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX specimens_sample_idx ON specimens (sample_id);
    CREATE SEQUENCE specimen_serial_seq;

    CREATE TABLE containers (
      item_id         bigint PRIMARY KEY REFERENCES items(id),
      serial          integer NOT NULL UNIQUE,
      container_type  text NOT NULL CHECK (container_type IN ('bin','bag','box','shelf','cart')),
      name            text NOT NULL,
      bin_half        char(1) CHECK (bin_half IN ('A','B')),
      created_at      timestamptz NOT NULL DEFAULT now()
    );
    CREATE SEQUENCE container_serial_seq;

    CREATE TABLE custody_events (
      id                 bigserial PRIMARY KEY,
      item_id            bigint NOT NULL REFERENCES items(id),
      item_code          text NOT NULL,
      seq                integer NOT NULL CHECK (seq >= 1),
      type               text NOT NULL,
      actor_user_id      integer REFERENCES users(id),
      actor_token_id     integer REFERENCES instrument_tokens(id),
      station_id         integer REFERENCES stations(id),
      station_code       text,
      container_id       bigint REFERENCES items(id),
      container_code     text,
      occurred_at        timestamptz NOT NULL,
      recorded_at        timestamptz NOT NULL,
      payload            jsonb NOT NULL DEFAULT '{}',
      idempotency_key    text NOT NULL UNIQUE,
      corrects_event_id  bigint REFERENCES custody_events(id),
      corrects_hash      char(64),
      signature          jsonb,
      prev_hash          char(64) NOT NULL,
      hash               char(64) NOT NULL UNIQUE,
      -- One chain per item that never forks: two writers can never both append seq n.
      UNIQUE (item_id, seq),
      -- Exactly one actor: a person or an instrument token.
      CHECK ((actor_user_id IS NULL) <> (actor_token_id IS NULL))
    );
    -- Seals and lab-wide lists read events by the server's time.
    CREATE INDEX custody_events_recorded_idx ON custody_events (recorded_at);
    CREATE INDEX custody_events_type_idx ON custody_events (type);
    CREATE TRIGGER custody_events_append_only_row BEFORE UPDATE OR DELETE ON custody_events
      FOR EACH ROW EXECUTE FUNCTION halfmark_refuse_change();
    CREATE TRIGGER custody_events_append_only_truncate BEFORE TRUNCATE ON custody_events
      FOR EACH STATEMENT EXECUTE FUNCTION halfmark_refuse_change();

    CREATE TABLE ledger_seals (
      day          date PRIMARY KEY,
      heads_count  integer NOT NULL,
      body         jsonb NOT NULL,
      prev_hash    char(64) NOT NULL,
      hash         char(64) NOT NULL UNIQUE,
      created_at   timestamptz NOT NULL DEFAULT now()
    );
    CREATE TRIGGER ledger_seals_append_only_row BEFORE UPDATE OR DELETE ON ledger_seals
      FOR EACH ROW EXECUTE FUNCTION halfmark_refuse_change();
    CREATE TRIGGER ledger_seals_append_only_truncate BEFORE TRUNCATE ON ledger_seals
      FOR EACH STATEMENT EXECUTE FUNCTION halfmark_refuse_change();

    -- Scans the state machine or the rules refused: kept for the record, never in the ledger.
    CREATE TABLE scan_refusals (
      id               bigserial PRIMARY KEY,
      at               timestamptz NOT NULL DEFAULT now(),
      actor_user_id    integer REFERENCES users(id),
      actor_token_id   integer REFERENCES instrument_tokens(id),
      item_code        text,
      type             text,
      idempotency_key  text,
      code             text NOT NULL,
      message          text NOT NULL,
      details          jsonb
    );
    CREATE INDEX scan_refusals_at_idx ON scan_refusals (at);
    CREATE TRIGGER scan_refusals_append_only_row BEFORE UPDATE OR DELETE ON scan_refusals
      FOR EACH ROW EXECUTE FUNCTION halfmark_refuse_change();
    CREATE TRIGGER scan_refusals_append_only_truncate BEFORE TRUNCATE ON scan_refusals
      FOR EACH STATEMENT EXECUTE FUNCTION halfmark_refuse_change();
  `);
}

export async function down({ context: { sequelize } }: { context: MigrationContext }): Promise<void> {
  await sequelize.query(`
    DROP TABLE scan_refusals; DROP TABLE ledger_seals; DROP TABLE custody_events;
    DROP SEQUENCE container_serial_seq; DROP TABLE containers;
    DROP SEQUENCE specimen_serial_seq; DROP TABLE specimens; DROP TABLE items;
    DROP FUNCTION halfmark_refuse_change();
  `);
}
