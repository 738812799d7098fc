import type { QueryInterface } from 'sequelize'

/** The table @socket.io/postgres-adapter uses for payloads too large for NOTIFY (its README's schema). */
export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.sequelize.query(`
    CREATE TABLE socket_io_attachments (
      id bigserial UNIQUE,
      created_at timestamptz DEFAULT now(),
      payload bytea
    )`)
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.sequelize.query('DROP TABLE socket_io_attachments')
}
