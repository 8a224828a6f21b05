import type { MigrationContext } from '../server/migrator';

/**
 * One-time links sent by e-mail (invitations and password resets) and electronic-signature
 * tokens. Both keep only a SHA-256 of the token, so a copy of the database cannot be used to
 * set a password or sign.
 */
export async function up({ context: { sequelize } }: { context: MigrationContext }): Promise<void> {
  await sequelize.query(`
    CREATE TABLE one_time_tokens (
      id          serial PRIMARY KEY,
      user_id     integer NOT NULL REFERENCES users(id),
      purpose     text NOT NULL CHECK (purpose IN ('invite','reset')),
      token_hash  text NOT NULL UNIQUE,
      expires_at  timestamptz NOT NULL,
      used_at     timestamptz,
      created_at  timestamptz NOT NULL DEFAULT now()
    );
    -- Setting a password spends every other open link of the same user, found through this index.
    CREATE INDEX one_time_tokens_user_idx ON one_time_tokens (user_id) WHERE used_at IS NULL;

    CREATE TABLE signature_tokens (
      id          serial PRIMARY KEY,
      user_id     integer NOT NULL REFERENCES users(id),
      meaning     text NOT NULL,
      token_hash  text NOT NULL UNIQUE,
      expires_at  timestamptz NOT NULL,
      used_at     timestamptz,
      created_at  timestamptz NOT NULL DEFAULT now()
    );

    -- Managers search people by name or e-mail; a trigram index would need an extension, so a
    -- plain lower(name) index serves the sort, and the table stays small enough to scan for q.
    CREATE INDEX users_name_lower_idx ON users (lower(name));
  `);
}

export async function down({ context: { sequelize } }: { context: MigrationContext }): Promise<void> {
  await sequelize.query('DROP INDEX users_name_lower_idx; DROP TABLE signature_tokens; DROP TABLE one_time_tokens;');
}
