import type { QueryInterface } from 'sequelize'

/** The latest triage's flags (id + severity) on the case row, so the queue never reads whole snapshots. */
export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.sequelize.query(`ALTER TABLE cases ADD COLUMN flags jsonb NOT NULL DEFAULT '[]'`)
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.sequelize.query('ALTER TABLE cases DROP COLUMN flags')
}
