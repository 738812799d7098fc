import type { QueryInterface } from 'sequelize'

export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.sequelize.query(`
    CREATE TABLE rooms (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      owner_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      name varchar(120) NOT NULL,
      current_revision integer NOT NULL DEFAULT 1,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX rooms_owner ON rooms (owner_id, updated_at DESC);
    CREATE TABLE room_revisions (
      room_id uuid NOT NULL REFERENCES rooms(id) ON DELETE CASCADE,
      revision integer NOT NULL,
      body jsonb NOT NULL,
      created_by uuid REFERENCES users(id) ON DELETE SET NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      PRIMARY KEY (room_id, revision)
    );
  `)
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.sequelize.query('DROP TABLE room_revisions; DROP TABLE rooms;')
}
