import { QueryTypes } from 'sequelize'
import { db } from '../db/sequelize'
import { caseSelect, toSummary } from './cases'
import type { QueueQuery } from '../../shared/schemas/queue'
import type { CaseSummary } from '../../shared/schemas/case'

/** Queue priority: the triage score plus a quarter point per hour waiting for us, capped at four days (see services/triage.ts). */
export const prioritySql = `(coalesce(c.score, 0) + least(coalesce(extract(epoch FROM now() - c.waiting_since) / 3600, 0), 96) / 4)`

const sortSql: Record<QueueQuery['sort'], string> = {
  priority: prioritySql,
  waiting: `coalesce(c.waiting_since, 'infinity'::timestamptz)`,
  age: 'c.submitted_at',
  activity: 'c.last_activity_at',
  score: 'coalesce(c.score, 0)',
  title: 'lower(c.title)',
}

/**
 * One page of the team's queue with its total. Full-text search (PostgreSQL tsvector, websearch syntax)
 * covers titles, descriptions and every message of the case; drafts never appear.
 */
export async function queuePage(userId: string, query: QueueQuery): Promise<{ rows: (CaseSummary & { priority: number })[]; total: number }> {
  const where: string[] = [`c.status <> 'draft'`]
  const bind: unknown[] = []
  const p = (v: unknown) => {
    bind.push(v)
    return `$${bind.length}`
  }
  if (query.scope === 'mine') where.push(`c.assignee_id = ${p(userId)}`)
  if (query.scope === 'unassigned') where.push('c.assignee_id IS NULL')
  if (query.status?.length) where.push(`c.status = ANY(${p(query.status)}::case_status[])`)
  if (query.flag) where.push(`${p(query.flag)} = ANY(c.flag_ids)`)
  if (query.waitingHours !== undefined) where.push(`c.waiting_since <= now() - make_interval(secs => ${p(query.waitingHours * 3600)})`)
  if (query.q) {
    const ts = `websearch_to_tsquery('english', ${p(query.q)})`
    // Two GIN index scans joined by UNION (an OR with a correlated EXISTS would check every case's messages).
    where.push(`c.id IN (SELECT id FROM cases WHERE search @@ ${ts} UNION SELECT case_id FROM messages WHERE search @@ ${ts})`)
  }
  const whereSql = where.join(' AND ')
  const order = `${sortSql[query.sort]} ${query.dir === 'asc' ? 'ASC' : 'DESC'} NULLS LAST, c.id`
  const limit = p(query.pageSize)
  const offset = p((query.page - 1) * query.pageSize)
  const [rows, count] = await Promise.all([
    db().query<Parameters<typeof toSummary>[0] & { priority: number }>(
      `WITH page AS (SELECT c.id, ${prioritySql} AS priority FROM cases c WHERE ${whereSql} ORDER BY ${order} LIMIT ${limit} OFFSET ${offset})
       ${caseSelect.replace('SELECT', 'SELECT page.priority,')} JOIN page ON page.id = c.id ORDER BY ${order}`,
      { bind, type: QueryTypes.SELECT },
    ),
    db().query<{ n: number }>(`SELECT count(*)::int AS n FROM cases c WHERE ${whereSql}`, { bind: bind.slice(0, bind.length - 2), type: QueryTypes.SELECT }),
  ])
  return { rows: rows.map((r) => ({ ...toSummary(r), priority: Math.round(Number(r.priority) * 10) / 10 })), total: count[0].n }
}
