import { createHash } from 'node:crypto'
import { db } from '../db/sequelize'
import type { QueueQuery } from '../../shared/schemas/queue'
import type { CaseStatus, CaseSummary } from '../../shared/schemas/case'
import { waitingOnTeam } from '../../shared/case-workflow'
import { POINTS_PER_HOUR, WAIT_CAP_HOURS } from '../../shared/queue-priority'
import { toSummary, type SummaryRow } from './case-summary'

// Hand-written SQL, measured faster (bench/queue.ts, README figures): the priority merge below needs
// expression-index scans with LIMIT per stream, which the ORM cannot say, and named prepared statements
// (planning cost more than running them). It goes through the Sequelize instance's own connection pool
// with bound parameters; rows are mapped to CaseSummary.

/** The statuses of open work: the queue's default views show only these (closed cases by a status filter). */
export const openStatuses: CaseStatus[] = ['submitted', 'in_review', 'waiting_on_listener', 'plan_sent']

// The expressions of the partial indexes of migration 0060 (keep them character-for-character equal).
const OPEN = `c.status IN ('submitted', 'in_review', 'waiting_on_listener', 'plan_sent')`
/** The case owes the listener an answer (shared/case-workflow.ts `waitingOnTeam`): these come first. */
const NEEDS = `(c.status IN ('submitted', 'in_review'))`
const SCORE = '(coalesce(c.score, 0))'
/** Priority before the cap, less the part that only depends on the clock: its order never changes. */
const RANK = `(coalesce(c.score, 0) - date_part('epoch', c.waiting_since - timestamptz 'epoch') / 14400)`
if (waitingOnTeam.join() !== 'submitted,in_review') throw new Error('queue.ts NEEDS and migration 0060 assume waitingOnTeam = submitted, in_review')
// RANK's divisor (3600 / POINTS_PER_HOUR) is in the indexes of migration 0060 and CAP_POINTS in the merge's bound.
if (POINTS_PER_HOUR !== 1 / 4) throw new Error('queue.ts RANK and migration 0060 assume a quarter point per hour')
const CAP_POINTS = WAIT_CAP_HOURS * POINTS_PER_HOUR

/** Hours the case has waited for us (0 when it is not waiting). */
const HOURS = `coalesce(date_part('epoch', now() - c.waiting_since) / 3600, 0)`
/**
 * Queue priority: the triage score plus a quarter point per hour waiting for us, capped at four days;
 * the SQL twin of `queuePriority()` in shared/queue-priority.ts (tests/api/queue-priority.test.ts).
 */
export const prioritySql = `(${SCORE} + least(${HOURS}, ${WAIT_CAP_HOURS}) / ${1 / POINTS_PER_HOUR})`
/** The same without the cap: with it, priority = least(score + CAP_POINTS, UNCAPPED) for a waiting case. */
const UNCAPPED = `(${SCORE} + ${HOURS} / ${1 / POINTS_PER_HOUR})`

const sortSql: Record<QueueQuery['sort'], string> = {
  priority: prioritySql,
  waiting: `coalesce(c.waiting_since, 'infinity'::timestamptz)`,
  age: 'c.submitted_at',
  activity: 'c.last_activity_at',
  score: SCORE,
  title: 'lower(c.title)',
}

export type QueueRow = CaseSummary & { priority: number }
export interface QueuePage {
  rows: QueueRow[]
  /** Matching cases, counted up to `countCap`; when `totalCapped` there are more than `total`. */
  total: number
  totalCapped: boolean
}

/** How far the count goes: 200, or ten pages past the current one when that is further. */
export const countCap = (query: Pick<QueueQuery, 'page' | 'pageSize'>) => Math.max(200, (query.page + 9) * query.pageSize)

/** The filters as SQL; `match`, the full-text test of a search, is kept apart from `where` (see searchPage). */
interface Sql { where: string; bind: unknown[]; p: (v: unknown) => string; match?: string }

function filters(userId: string, query: QueueQuery): Sql {
  const bind: unknown[] = []
  const p = (v: unknown) => {
    bind.push(v)
    return `$${bind.length}`
  }
  // Without a status filter: open work only (a constant, so the partial indexes apply).
  const where: string[] = [query.status?.length ? `c.status = ANY(${p(query.status.filter((s) => s !== 'draft'))}::case_status[])` : OPEN]
  if (query.scope === 'mine') where.push(`c.assignee_id = ${p(userId)}`)
  if (query.scope === 'unassigned') where.push('c.assignee_id IS NULL')
  if (query.flag) where.push(`${p(query.flag)} = ANY(c.flag_ids)`)
  if (query.waitingHours !== undefined) where.push(`c.waiting_since <= now() - make_interval(secs => ${p(query.waitingHours * 3600)})`)
  // One document per case: title, description and every message (search_all, migration 0101).
  const match = query.q ? `c.search_all @@ websearch_to_tsquery('english', ${p(query.q)})` : undefined
  return { where: where.join(' AND '), bind, p, match }
}

interface PgConnection { query(q: { name: string; text: string; values: unknown[] }): Promise<{ rows: unknown[] }> }
interface Pool { getConnection(o: { type: string }): Promise<PgConnection>; releaseConnection(c: PgConnection): Promise<void> }

/**
 * A SELECT as a named prepared statement on a connection of Sequelize's pool: each connection plans a
 * statement once (PostgreSQL switches to a generic plan when it is no worse) instead of on every request.
 */
const statementNames = new Map<string, string>()
async function select<T>(sql: string, bind: unknown[]): Promise<T[]> {
  const pool = db().connectionManager as unknown as Pool
  let name = statementNames.get(sql)
  if (!name) {
    if (statementNames.size > 1000) statementNames.clear()
    statementNames.set(sql, (name = `rw_queue_${createHash('sha1').update(sql).digest('hex').slice(0, 24)}`))
  }
  const connection = await pool.getConnection({ type: 'SELECT' })
  try {
    // raw SQL: the queue's priority merge and full-text search (measured in npm run bench), as named prepared statements
    return (await connection.query({ name, text: sql, values: bind })).rows as T[]
  } finally {
    await pool.releaseConnection(connection)
  }
}

/**
 * One page of the team's queue. Default views: open work, what needs an answer first (submitted and
 * in-review cases, then those waiting on the listener or with a plan sent), highest priority first.
 * Full-text search (PostgreSQL tsvector, websearch syntax) covers titles, descriptions and every message
 * of the case; drafts never appear. The total is counted up to `countCap` (the UI shows "200+").
 */
export async function queuePage(userId: string, query: QueueQuery): Promise<QueuePage> {
  const offset = (query.page - 1) * query.pageSize
  const sql = filters(userId, query)
  const cap = countCap(query)
  if (sql.match) return searchPage(sql as Sql & { match: string }, query, offset, cap)
  if (query.sort === 'priority' && query.dir === 'desc') {
    const { rows, n } = (await byPriority(sql, offset, query.pageSize, cap))!
    return { rows, total: Math.min(n, cap), totalCapped: n > cap }
  }
  const countBind = [...sql.bind, cap + 1]
  const counted = select<{ n: number }>(`SELECT count(*)::int AS n FROM (SELECT 1 FROM cases c WHERE ${sql.where} LIMIT $${countBind.length}) x`, countBind)
  const rows = await sortedPage(sql, query, offset)
  const n = (await counted)[0].n
  return { rows, total: Math.min(n, cap), totalCapped: n > cap }
}

/**
 * A full-text search, bounded by the count's cap rather than by the number of matches. In the default
 * order the priority streams are walked in index order, testing each case's own row (`match` as a
 * column, so the plan does not depend on how common the term is): a common term fills the page from the
 * first rows, and its count ("250+") from the candidates, in one statement. Otherwise at most cap + 1
 * matches are read (through the GIN index of search_all for a rare term); when that is all of them the
 * page is sorted from those few rows, with the exact count; past the cap, any other order sorts the
 * matches in PostgreSQL.
 */
async function searchPage(sql: Sql & { match: string }, query: QueueQuery, offset: number, cap: number): Promise<QueuePage> {
  const all = { ...sql, where: `${sql.where} AND ${sql.match}` }
  if (query.sort === 'priority' && query.dir === 'desc') {
    const walked = await byPriority(sql, offset, query.pageSize, cap, sql.match)
    if (walked) return { rows: walked.rows, total: Math.min(walked.n, cap), totalCapped: walked.n > cap }
  }
  // as in byPriority: small whole numbers in the text for the first pages, parameters deeper
  const b = [...sql.bind]
  const lit = (v: number) => (offset <= 4 * query.pageSize ? String(Math.trunc(v)) : (b.push(v), `$${b.length}`))
  const [capP, sizeP, offsetP] = [lit(cap + 1), lit(query.pageSize), lit(offset)]
  const rows = await select<SummaryRow & { total: number; priority: number | null }>(
    `WITH hit AS MATERIALIZED (SELECT c.* FROM cases c WHERE ${all.where} LIMIT ${capP}),
          h AS (SELECT count(*)::int AS total FROM hit)
     SELECT h.total, t.priority, d.*
       FROM h
       LEFT JOIN LATERAL (SELECT c.id, ${prioritySql} AS priority, row_number() OVER (ORDER BY ${orderSql(query)}) AS rn
                            FROM hit c ORDER BY ${orderSql(query)} LIMIT ${sizeP} OFFSET ${offsetP}) t ON true
       LEFT JOIN LATERAL (${summarySql} WHERE c.id = t.id) d ON true
      ORDER BY t.rn`,
    b,
  )
  const n = rows[0].total
  if (n <= cap) {
    const page = rows.filter((r) => r.id !== null).map((r) => ({ ...toSummary(r), priority: Math.round(Number(r.priority) * 10) / 10 }))
    return { rows: page, total: n, totalCapped: false }
  }
  return { rows: await sortedPage(all, query, offset), total: cap, totalCapped: true }
}

/** A page in any order: the ordered ids, then their summaries. */
async function sortedPage(sql: Sql, query: QueueQuery, offset: number): Promise<QueueRow[]> {
  const page = await bySort(sql, query, offset)
  const details = page.length ? await summaries(page.map((r) => r.id)) : new Map<string, CaseSummary>()
  return page.flatMap((r) => {
    const s = details.get(r.id)
    return s ? [{ ...s, priority: Math.round(r.priority * 10) / 10 }] : []
  })
}

/** ORDER BY for the query's sort over `cases c` (ties by id, so pages never overlap). */
const orderSql = (query: QueueQuery) => {
  const dir = query.dir === 'asc' ? 'ASC' : 'DESC'
  return query.sort === 'priority' ? `${NEEDS} ${dir}, ${prioritySql} ${dir}, c.id` : `${sortSql[query.sort]} ${dir} NULLS LAST, c.id`
}

/** Any sort, any filter: one ordered scan of the matching cases (open work by default, so bounded by the desk's size). */
async function bySort({ where, bind, p }: Sql, query: QueueQuery, offset: number): Promise<{ id: string; priority: number }[]> {
  const order = orderSql(query)
  const rows = await select<{ id: string; priority: number }>(
    `SELECT c.id, ${prioritySql} AS priority FROM cases c WHERE ${where} ORDER BY ${order} LIMIT ${p(query.pageSize)} OFFSET ${p(offset)}`,
    bind,
  )
  return rows.map((r) => ({ id: r.id, priority: Number(r.priority) }))
}

interface Candidate { s: 'a' | 'b' | 'n'; id: string; g: boolean; priority: number; key: number }

/** (needs an answer, priority, id) order: true before false, higher priority first, then id. */
const before = (x: { g: boolean; priority: number; id: string }, y: { g: boolean; priority: number; id: string }) =>
  x.g !== y.g ? (x.g ? -1 : 1) : x.priority !== y.priority ? y.priority - x.priority : x.id < y.id ? -1 : x.id > y.id ? 1 : 0

/**
 * The default order without sorting every open case. Priority = min(score + 24, UNCAPPED) for a waiting
 * case and = score for an idle one, so three index-ordered streams bound it: waiting cases by score (a),
 * waiting cases by RANK, whose order is UNCAPPED's (b), idle cases by score (n). The first m of each are
 * merged; Fagin's threshold algorithm (Fagin, Lotem & Naor, "Optimal aggregation algorithms for
 * middleware", PODS 2001) says when that is exact: no case outside the candidates can beat the stream
 * heads' bound. When it cannot be proved, m grows and the read repeats (rare: ties, deep pages).
 * With `hit` (a search's test of a case's row), the streams still read m rows each in index order, so
 * their heads bound the unseen cases as before, but only the rows that pass `hit` are candidates. The
 * count is then only made when the candidates do not already pass the cap; and when the first read is
 * not provably exact while the count shows few matches (a rare term), it answers null: sorting those
 * few is cheaper than reading deeper (the caller does that).
 */
export async function byPriority({ where, bind }: Sql, offset: number, size: number, cap: number, hit?: string): Promise<{ rows: QueueRow[]; n: number } | null> {
  const want = offset + size
  // m: deep enough that one read is usually provably exact (a second round trip costs more than rows)
  for (let m = Math.max(8 * want, 200); ; m *= 4) {
    // The limits are whole numbers from the validated query, written into the text: with them as
    // parameters PostgreSQL never chose a generic plan and planned the statement again on every request
    // (pg_prepared_statements: 0 generic, 66 custom plans; 3.6 ms planning for 1.5 ms execution).
    // Beyond the first pages they stay parameters, so deep paging does not prepare a statement per page.
    const b = [...bind]
    const lit = (v: number) => (offset <= 4 * size ? String(Math.trunc(v)) : (b.push(v), `$${b.length}`))
    const [lim, sizeP, offsetP] = [lit(m), lit(size), lit(offset)]
    const capP = lit(cap + 1)
    // (its own parameter as an int: the LIMIT's would be deduced as bigint)
    const capI = hit ? (offset <= 4 * size ? String(Math.trunc(cap + 1)) : (b.push(cap + 1), `$${b.length}::int`)) : ''
    const counted = `(SELECT count(*)::int FROM (SELECT 1 FROM cases c WHERE ${where}${hit ? ` AND ${hit}` : ''} LIMIT ${capP}) x)`
    const stream = (key: string, ws: string, order: string) =>
      `SELECT c.id, ${NEEDS} AS g, ${prioritySql} AS priority, ${key} AS key, ${hit ?? 'true'} AS hit FROM cases c WHERE ${where} AND c.waiting_since ${ws} ORDER BY ${NEEDS} DESC, ${order} DESC LIMIT ${lim}`
    const head = (t: string) => `(SELECT count(*)::int FROM ${t}) AS n${t}, (SELECT g FROM ${t} ORDER BY g, key LIMIT 1) AS g${t}, (SELECT key FROM ${t} ORDER BY g, key LIMIT 1) AS k${t}`
    // The merge, the stream heads, the capped count and the page's columns in one statement: one round trip, few rows.
    const rows = await select<SummaryRow & Heads & { priority: number | null; g: boolean | null; total: number }>(
      `WITH a AS (${stream(`${SCORE} + ${CAP_POINTS}`, 'IS NOT NULL', SCORE)}),
            b AS (${stream(UNCAPPED, 'IS NOT NULL', RANK)}),
            n AS (${stream(SCORE, 'IS NULL', SCORE)}),
            cand AS (SELECT id, g, priority FROM a WHERE hit UNION SELECT id, g, priority FROM b WHERE hit UNION SELECT id, g, priority FROM n WHERE hit),
            heads AS (SELECT ${head('a')}, ${head('b')}, ${head('n')},
                             ${hit ? `CASE WHEN (SELECT count(*)::int FROM cand) > ${capI} THEN ${capI} ELSE ${counted} END` : counted} AS total)
       SELECT h.*, t.g, t.priority, d.*
         FROM heads h
         LEFT JOIN LATERAL (SELECT id, g, priority FROM cand ORDER BY g DESC, priority DESC, id LIMIT ${sizeP} OFFSET ${offsetP}) t ON true
         LEFT JOIN LATERAL (${summarySql} WHERE c.id = t.id) d ON true
        ORDER BY t.g DESC, t.priority DESC, t.id`,
      b,
    )
    const h = rows[0]
    const page = rows.filter((r) => r.id !== null)
    const last = page.at(-1)
    const heads: StreamHeads = {
      a: { count: h.na, last: h.na ? { g: h.ga!, key: Number(h.ka) } : undefined },
      b: { count: h.nb, last: h.nb ? { g: h.gb!, key: Number(h.kb) } : undefined },
      n: { count: h.nn, last: h.nn ? { g: h.gn!, key: Number(h.kn) } : undefined },
    }
    if (proved(heads, m, offset + page.length, want, last ? { g: last.g!, priority: Number(last.priority) } : undefined)) {
      return { rows: page.map((r) => ({ ...toSummary(r), priority: Math.round(Number(r.priority) * 10) / 10 })), n: h.total }
    }
    if (hit && h.total <= cap) return null
  }
}

interface Heads { na: number; ga: boolean | null; ka: number | null; nb: number; gb: boolean | null; kb: number | null; nn: number; gn: boolean | null; kn: number | null }
type StreamHeads = Record<'a' | 'b' | 'n', { count: number; last?: { g: boolean; key: number } }>

/**
 * Whether the first `want` cases in queue order are provably the true first `want`, given each stream's
 * row count and last row (a stream that returned fewer than `m` rows is exhausted: nothing unseen),
 * how many were found and the last of them (`worst`).
 */
export function proved(heads: StreamHeads, m: number, found: number, want: number, worst?: { g: boolean; priority: number }): boolean {
  // The best an unseen case could be, as (needs an answer, priority).
  const bounds: { g: boolean; priority: number }[] = []
  const a = heads.a.count === m ? heads.a.last : undefined
  const b = heads.b.count === m ? heads.b.last : undefined
  if (a && b) {
    // an unseen waiting case is at most a's last in (g, score + 24) and b's last in (g, UNCAPPED)
    if (a.g === b.g) bounds.push({ g: a.g, priority: Math.min(a.key, b.key) })
    else bounds.push(a.g ? { g: b.g, priority: b.key } : { g: a.g, priority: a.key })
  }
  if (heads.n.count === m && heads.n.last) bounds.push({ g: heads.n.last.g, priority: heads.n.last.key })
  if (!bounds.length) return true
  if (found < want || !worst) return false
  // strictly better than every bound (an unseen case with an equal priority might have a smaller id)
  return bounds.every((u) => (worst.g !== u.g ? worst.g : worst.priority > u.priority))
}

/** The same test over the streams' rows themselves: the first `want` in queue order, or null when not proved. */
export function mergeStreams(rows: Candidate[], m: number, want: number): Candidate[] | null {
  const heads: StreamHeads = { a: { count: 0 }, b: { count: 0 }, n: { count: 0 } }
  const seen = new Map<string, Candidate>()
  for (const r of rows) {
    heads[r.s].count++
    heads[r.s].last = { g: r.g, key: r.key }
    seen.set(r.id, r)
  }
  const top = [...seen.values()].sort(before).slice(0, want)
  return proved(heads, m, top.length, want, top.at(-1)) ? top : null
}

/** The queue's columns of a case (no description, answers or reply token: a summary only). */
const summarySql = `SELECT c.id, c.title, c.status, c.score, c.listener_id, l.name AS listener_name, c.assignee_id, a.name AS assignee_name,
            c.room_id, r.name AS room_name, c.room_revision,
            (rr.body->>'length')::float AS length, (rr.body->>'width')::float AS width, (rr.body->>'height')::float AS height,
            c.flags, c.created_at, c.submitted_at, c.waiting_since, c.last_activity_at
       FROM cases c
       JOIN users l ON l.id = c.listener_id
       LEFT JOIN users a ON a.id = c.assignee_id
       JOIN rooms r ON r.id = c.room_id
       JOIN room_revisions rr ON rr.room_id = c.room_id AND rr.revision = c.room_revision`

/** The summaries of a page of case ids. */
async function summaries(ids: string[]): Promise<Map<string, CaseSummary>> {
  const rows = await select<SummaryRow>(`${summarySql} WHERE c.id = ANY($1::uuid[])`, [ids])
  return new Map(rows.map((r) => [r.id, toSummary(r)]))
}
