import { DataTypes, literal, type QueryInterface } from 'sequelize'

/** The latest triage's flags (id + severity) on the case row, so the queue never reads whole snapshots. */
export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.addColumn('cases', 'flags', { type: DataTypes.JSONB, allowNull: false, defaultValue: literal("'[]'") })
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.removeColumn('cases', 'flags')
}
