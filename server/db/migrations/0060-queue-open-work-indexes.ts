import type { QueryInterface } from 'sequelize'

/**
 * Indexes for the queue's default views (open work, what needs an answer first; server/data/queue.ts).
 * Raw SQL because QueryInterface cannot say expression indexes with DESC keys and partial predicates.
 * The expressions must stay character-for-character those of server/data/queue.ts (`NEEDS`, `SCORE`,
 * `RANK`) or the planner will not match them. `RANK` orders cases by their priority before the cap:
 * score + hours waiting / 4 = RANK + (now in hours) / 4, so its order does not change with time and
 * can live in an index; date_part('epoch', interval) is immutable where extract on timestamptz is not.
 */
const OPEN = `status IN ('submitted', 'in_review', 'waiting_on_listener', 'plan_sent')`
const NEEDS = `(status IN ('submitted', 'in_review'))`
const SCORE = '(coalesce(score, 0))'
const RANK = `(coalesce(score, 0) - date_part('epoch', waiting_since - timestamptz 'epoch') / 14400)`

const indexes: [name: string, columns: string, where: string][] = [
  ['cases_open_waiting_score', `${NEEDS} DESC, ${SCORE} DESC`, `${OPEN} AND waiting_since IS NOT NULL`],
  ['cases_open_waiting_rank', `${NEEDS} DESC, ${RANK} DESC`, `${OPEN} AND waiting_since IS NOT NULL`],
  ['cases_open_idle_score', `${NEEDS} DESC, ${SCORE} DESC`, `${OPEN} AND waiting_since IS NULL`],
  ['cases_open_assignee_waiting_score', `assignee_id, ${NEEDS} DESC, ${SCORE} DESC`, `${OPEN} AND waiting_since IS NOT NULL`],
  ['cases_open_assignee_waiting_rank', `assignee_id, ${NEEDS} DESC, ${RANK} DESC`, `${OPEN} AND waiting_since IS NOT NULL`],
  ['cases_open_assignee_idle_score', `assignee_id, ${NEEDS} DESC, ${SCORE} DESC`, `${OPEN} AND waiting_since IS NULL`],
  // the capped count of the default views ("200+") reads only this small index
  ['cases_open_assignee', 'assignee_id', OPEN],
]

export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  for (const [name, columns, where] of indexes) await q.sequelize.query(`CREATE INDEX ${name} ON cases (${columns}) WHERE ${where}`)
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  for (const [name] of [...indexes].reverse()) await q.removeIndex('cases', name)
}
