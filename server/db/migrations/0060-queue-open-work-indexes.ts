import { Op, literal, type QueryInterface, type QueryInterfaceIndexOptions } from 'sequelize'

/**
 * Indexes for the queue's default views (open work, what needs an answer first; server/data/queue.ts).
 * Expression keys with DESC are `literal`s (QueryInterface takes an expression only as a literal, and
 * the order inside it); the partial predicates are `where` objects. The expressions must stay those of
 * server/data/queue.ts (`NEEDS`, `SCORE`, `RANK`) or the planner will not match them. `RANK` orders cases
 * by their priority before the cap: score + hours waiting / 4 = RANK + (now in hours) / 4, so its order
 * does not change with time and can live in an index; date_part('epoch', interval) is immutable where
 * extract on timestamptz is not.
 */
const OPEN = { status: ['submitted', 'in_review', 'waiting_on_listener', 'plan_sent'] }
const WAITING = { ...OPEN, waiting_since: { [Op.ne]: null } }
const IDLE = { ...OPEN, waiting_since: null }
const NEEDS = literal(`(status IN ('submitted', 'in_review')) DESC`)
const SCORE = literal('(coalesce(score, 0)) DESC')
const RANK = literal(`(coalesce(score, 0) - date_part('epoch', waiting_since - timestamptz 'epoch') / 14400) DESC`)

const indexes: (QueryInterfaceIndexOptions & Required<Pick<QueryInterfaceIndexOptions, 'name' | 'fields'>>)[] = [
  { name: 'cases_open_waiting_score', fields: [NEEDS, SCORE], where: WAITING },
  { name: 'cases_open_waiting_rank', fields: [NEEDS, RANK], where: WAITING },
  { name: 'cases_open_idle_score', fields: [NEEDS, SCORE], where: IDLE },
  { name: 'cases_open_assignee_waiting_score', fields: ['assignee_id', NEEDS, SCORE], where: WAITING },
  { name: 'cases_open_assignee_waiting_rank', fields: ['assignee_id', NEEDS, RANK], where: WAITING },
  { name: 'cases_open_assignee_idle_score', fields: ['assignee_id', NEEDS, SCORE], where: IDLE },
  // the capped count of the default views ("200+") reads only this small index
  { name: 'cases_open_assignee', fields: ['assignee_id'], where: OPEN },
]

export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  for (const index of indexes) await q.addIndex('cases', index)
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  for (const { name } of [...indexes].reverse()) await q.removeIndex('cases', name)
}
