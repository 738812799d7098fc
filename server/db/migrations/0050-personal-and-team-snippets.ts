import { DataTypes, type QueryInterface } from 'sequelize'
import { lower, required } from '../columns'

/**
 * Reply snippets get an owner scope: `personal` ones belong to their author alone (created_by),
 * `team` ones are shared and every change to them is written to the audit log. Snippets that
 * existed before were shared with everyone, so they become team snippets (the column is added with
 * the default 'team', which fills the rows there are, and the default then becomes 'personal').
 * Titles are unique per author among personal snippets and across the team among team snippets.
 */
export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.addColumn('reply_snippets', 'scope', required(DataTypes.STRING(8), 'team'))
  // changeColumn also says the column's type again, which would re-derive a check on it: so the check comes after.
  await q.changeColumn('reply_snippets', 'scope', required(DataTypes.STRING(8), 'personal'))
  await q.addConstraint('reply_snippets', { type: 'check', name: 'reply_snippets_scope_check', fields: ['scope'], where: { scope: ['personal', 'team'] } })
  await q.removeIndex('reply_snippets', 'reply_snippets_title')
  await q.addIndex('reply_snippets', { fields: [lower('title')], name: 'reply_snippets_team_title', unique: true, where: { scope: 'team' } })
  await q.addIndex('reply_snippets', { fields: ['created_by', lower('title')], name: 'reply_snippets_personal_title', unique: true, where: { scope: 'personal' } })
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.removeIndex('reply_snippets', 'reply_snippets_personal_title')
  await q.removeIndex('reply_snippets', 'reply_snippets_team_title')
  // A personal snippet whose title another snippet (a team one, or an older personal one) already has goes,
  // so that the single unique title index can come back. Raw SQL: a self-join DELETE … USING.
  await q.sequelize.query(`DELETE FROM reply_snippets a USING reply_snippets b WHERE a.scope = 'personal' AND lower(a.title) = lower(b.title) AND a.id <> b.id AND (b.scope = 'team' OR b.id < a.id)`)
  await q.addIndex('reply_snippets', { fields: [lower('title')], name: 'reply_snippets_title', unique: true })
  await q.removeColumn('reply_snippets', 'scope')
}
