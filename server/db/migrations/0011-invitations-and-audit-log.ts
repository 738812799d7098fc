import type { QueryInterface } from 'sequelize'

/** Invitations to the team (one-time links, only a SHA-256 of the token is kept) and the audit log. */
export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.sequelize.query(`
    CREATE TABLE team_invitations (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      email varchar(254) NOT NULL,
      name varchar(120) NOT NULL,
      role enum_users_role NOT NULL CHECK (role IN ('advisor', 'supervisor')),
      token_hash char(64) NOT NULL UNIQUE,
      invited_by uuid REFERENCES users(id) ON DELETE SET NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      expires_at timestamptz NOT NULL,
      accepted_at timestamptz,
      accepted_user_id uuid REFERENCES users(id) ON DELETE SET NULL,
      revoked_at timestamptz
    );
    CREATE INDEX team_invitations_email ON team_invitations (lower(email), created_at DESC);

    CREATE TABLE audit_log (
      id bigserial PRIMARY KEY,
      actor_id uuid REFERENCES users(id) ON DELETE SET NULL,
      action varchar(40) NOT NULL,
      target_user_id uuid REFERENCES users(id) ON DELETE SET NULL,
      target_name varchar(120),
      target_email varchar(254),
      details jsonb NOT NULL DEFAULT '{}',
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX audit_log_time ON audit_log (created_at DESC, id DESC);
    CREATE INDEX audit_log_actor ON audit_log (actor_id, created_at DESC);
    CREATE INDEX audit_log_action ON audit_log (action, created_at DESC);
  `)
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.sequelize.query('DROP TABLE audit_log; DROP TABLE team_invitations;')
}
