import type { MigrationContext } from '../server/migrator';

/**
 * Stored anomaly findings, so the lab-wide list is read from a table instead of re-judging every
 * chain on every request: each item's findings as the detector last judged them, what each item
 * looked like when judged (to tell which items must be judged again), and one row for the sweep
 * that keeps them current. Not part of the ledger: every row here can be thrown away and
 * recomputed from custody_events, so these tables carry no append-only triggers.
 */
export async function up({ context: { sequelize } }: { context: MigrationContext }): Promise<void> {
  await sequelize.query(`
    -- One row (id is always true): how far the last sweep got and when.
    CREATE TABLE anomaly_sweep_state (
      id               boolean PRIMARY KEY DEFAULT true CHECK (id),
      -- Highest custody_events id the last sweep saw; events above it name items to judge again.
      event_watermark  bigint NOT NULL DEFAULT 0,
      -- Station code → kind as last judged with: dwell limits follow a station's kind.
      stations         jsonb NOT NULL DEFAULT '{}',
      swept_at         timestamptz,
      full_swept_at    timestamptz,
      items_checked    integer NOT NULL DEFAULT 0,
      -- Items the last sweep judged, and how long it took: for the logs and the timing test.
      items_judged     integer NOT NULL DEFAULT 0,
      sweep_ms         integer NOT NULL DEFAULT 0
    );
    INSERT INTO anomaly_sweep_state DEFAULT VALUES;

    -- Per item: the projection columns, order setting and piece it was judged with, and until when
    -- the judgement holds while time passes (a stay reaching its dwell limit).
    CREATE TABLE anomaly_item_state (
      item_id     bigint PRIMARY KEY REFERENCES items(id) ON DELETE CASCADE,
      last_seq    integer NOT NULL,
      head_hash   char(64),
      state       text NOT NULL,
      -- md5 of the order's conditioning rule and the sample's thickness (specimens only).
      setting     text,
      -- The piece the item is (a half: the half its split_from names), and the piece a half with
      -- placements claims for other items' "claimed twice" check.
      piece       text NOT NULL,
      claims      text,
      recheck_at  timestamptz,
      -- A finding's hours still count up to now (a long dwell going on): re-worded when read.
      running     boolean NOT NULL DEFAULT false,
      judged_at   timestamptz NOT NULL
    );
    -- Every request asks which judgements time has run out on.
    CREATE INDEX anomaly_item_state_recheck_idx ON anomaly_item_state (recheck_at) WHERE recheck_at IS NOT NULL;
    -- A half's new events re-judge every item of the same piece, and their claimants come with them.
    CREATE INDEX anomaly_item_state_piece_idx ON anomaly_item_state (piece);
    CREATE INDEX anomaly_item_state_claims_idx ON anomaly_item_state (claims) WHERE claims IS NOT NULL;

    CREATE TABLE anomaly_findings (
      item_id        bigint NOT NULL REFERENCES items(id) ON DELETE CASCADE,
      -- Position in the detector's answer for the item: the tie-break of the list's order.
      ordinal        integer NOT NULL CHECK (ordinal >= 0),
      -- Byte order, as the list has always compared codes.
      item_code      text COLLATE "C" NOT NULL,
      kind           text NOT NULL,
      state          text NOT NULL,
      severity       text NOT NULL CHECK (severity IN ('info','warning','critical')),
      severity_rank  smallint NOT NULL CHECK (severity_rank BETWEEN 0 AND 2),
      code           text NOT NULL,
      event_seq      integer,
      message        text NOT NULL,
      -- json, not jsonb: the details come back exactly as the detector wrote them.
      details        json NOT NULL,
      found_at       timestamptz NOT NULL,
      PRIMARY KEY (item_id, ordinal)
    );
    -- The list's order: most serious first, then item code, then event (none last).
    CREATE INDEX anomaly_findings_order_idx ON anomaly_findings (severity_rank DESC, item_code, event_seq, ordinal);
    -- Filtered by one kind of anomaly.
    CREATE INDEX anomaly_findings_code_idx ON anomaly_findings (code);
  `);
}

export async function down({ context: { sequelize } }: { context: MigrationContext }): Promise<void> {
  await sequelize.query(`
    DROP TABLE anomaly_findings; DROP TABLE anomaly_item_state; DROP TABLE anomaly_sweep_state;
  `);
}
