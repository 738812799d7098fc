import { DataTypes, literal, type QueryInterface } from 'sequelize'
import { required } from '../columns'

/** The latest triage's flags (id + severity) on the case row, so the queue never reads whole snapshots. */
export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.addColumn('cases', 'flags', required(DataTypes.JSONB, literal("'[]'")))
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.removeColumn('cases', 'flags')
}
