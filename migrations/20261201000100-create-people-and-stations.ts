import type { MigrationContext } from '../server/migrator';

/** Users, the stations where hand-offs happen, and the tokens instruments post events with. */
export async function up({ context: { sequelize } }: { context: MigrationContext }): Promise<void> {
  await sequelize.query(`
    CREATE TABLE users (
      id              serial PRIMARY KEY,
      email           text NOT NULL,
      name            text NOT NULL,
      role            text NOT NULL CHECK (role IN ('machinist','technician','clerk','auditor','manager')),
      active          boolean NOT NULL DEFAULT true,
      badge_code      text UNIQUE,
      password_hash   text,
      pin_hash        text,
      failed_logins   integer NOT NULL DEFAULT 0,
      locked_until    timestamptz,
      session_version integer NOT NULL DEFAULT 0,
      created_at      timestamptz NOT NULL DEFAULT now(),
      updated_at      timestamptz NOT NULL DEFAULT now()
    );
    -- Sign-in looks a user up by e-mail whatever its case; one account per address.
    CREATE UNIQUE INDEX users_email_lower_key ON users (lower(email));

    CREATE TABLE stations (
      id          serial PRIMARY KEY,
      code        text NOT NULL UNIQUE,
      name        text NOT NULL,
      kind        text NOT NULL CHECK (kind IN ('saw','mill','conditioning','gauge','frame','bins','store','dispatch','other')),
      active      boolean NOT NULL DEFAULT true,
      created_at  timestamptz NOT NULL DEFAULT now(),
      updated_at  timestamptz NOT NULL DEFAULT now()
    );

    CREATE TABLE instrument_tokens (
      id           serial PRIMARY KEY,
      station_id   integer NOT NULL REFERENCES stations(id),
      name         text NOT NULL,
      token_hash   text NOT NULL UNIQUE,
      token_prefix text NOT NULL,
      event_types  text[] NOT NULL,
      created_by   integer REFERENCES users(id),
      created_at   timestamptz NOT NULL DEFAULT now(),
      revoked_at   timestamptz,
      last_used_at timestamptz
    );
  `);
}

export async function down({ context: { sequelize } }: { context: MigrationContext }): Promise<void> {
  await sequelize.query('DROP TABLE instrument_tokens; DROP TABLE stations; DROP TABLE users;');
}
