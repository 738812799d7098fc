import type { QueryInterface } from 'sequelize'

/**
 * One-time links for choosing a new password. Only a SHA-256 of the token is kept (a leaked row
 * cannot be turned back into a working link); `spent_at` marks a link used, or replaced by a
 * newer one, or spent by a reset through another link.
 */
export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.sequelize.query(`
    CREATE TABLE password_reset_tokens (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      token_hash char(64) NOT NULL UNIQUE,
      created_at timestamptz NOT NULL DEFAULT now(),
      expires_at timestamptz NOT NULL,
      spent_at timestamptz
    );
    CREATE INDEX password_reset_tokens_user ON password_reset_tokens (user_id, created_at DESC);
  `)
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.sequelize.query('DROP TABLE password_reset_tokens')
}
