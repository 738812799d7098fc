import { QueryTypes } from 'sequelize'
import { db } from '../db/sequelize'
import { models, type DeskSettingsModel } from '../db/models'
import { dbNow } from '../db/models/now'
import type { BusinessHours, Targets } from '../../shared/schemas/metrics'
import type { CaseStatus } from '../../shared/schemas/case'

/**
 * Every figure here is one SQL statement over cases and case_events (window functions,
 * percentile_cont, the working-time function rw_working_seconds from migration 0010).
 *
 * Definitions (also in the report of issue 7):
 * - submitted: the first draft → submitted move of the case.
 * - first response: the first event after submission, by an advisor or supervisor, that the listener
 *   sees: a message that is not an internal note, or a status move out of "submitted" (starting
 *   review, asking, sending a plan, closing). Claiming or assigning alone does not count.
 * - resolution: from submission to the first move to "closed" after it; a later reopening does not
 *   change it (it shows in the reopen rate).
 * - weeks are Monday 00:00 to Monday 00:00 in the team's time zone (UTC without business hours); a
 *   time counts in the week its interval ended (the response, the closing).
 */
export interface Scope {
  from: Date
  to: Date
  advisorIds: string[] | null
  listenerIds: string[] | null
  /** Time zone for weeks and working time. */
  timeZone: string
  /** null: calendar time. */
  week: BusinessHours['week'] | null
}

const select = async <T extends object>(sql: string, bind: unknown[]) => {
  try {
    // raw SQL: the supervisor's figures (window functions, percentile_cont, working time), one statement each
    return await db().query<T>(sql, { bind, type: QueryTypes.SELECT })
  } catch (e) {
    const reason = (e as { parent?: { message?: string } }).parent?.message
    throw reason ? new Error(`metrics query failed: ${reason}`, { cause: e }) : e
  }
}

// $1 from, $2 to, $3 advisorIds, $4 listenerIds, $5 time zone, $6 working week (jsonb or null)
const scopeBind = (s: Scope) => [s.from, s.to, s.advisorIds, s.listenerIds, s.timeZone, s.week ? JSON.stringify(s.week) : null]

const scopedCases = `
  params AS (SELECT $1::timestamptz AS p_from, $2::timestamptz AS p_to, $5::text AS tz, $6::jsonb AS week), -- every parameter typed, used or not
  scoped AS (
    SELECT c.id, c.status, c.assignee_id, c.listener_id, c.flag_ids, c.title
      FROM cases c
     WHERE c.status <> 'draft'
       AND ($3::uuid[] IS NULL OR c.assignee_id = ANY($3::uuid[]))
       AND ($4::uuid[] IS NULL OR c.listener_id = ANY($4::uuid[])))`

/** Seconds from a to b: working seconds with business hours ($6), else calendar seconds (kept out of the function, which the planner then handles better). */
const seconds = (a: string, b: string) =>
  `CASE WHEN $6::jsonb IS NULL THEN EXTRACT(EPOCH FROM ${b} - ${a})::double precision ELSE rw_working_seconds(${a}, ${b}, $5::text, $6::jsonb) END`

/**
 * Per case: submission, first response (time and who), first closing after submission. One pass
 * over the scoped cases' events: a window gives every event its case's submission time, then one
 * grouped aggregate picks the firsts (row estimates stay sane at 10 000 cases, see bench/queue-metrics.ts).
 */
const timeline = `
  ${scopedCases},
  ev AS (
    SELECT e.case_id, e.id, e.created_at, e.to_status, e.actor_id,
           u.role IN ('advisor', 'supervisor')
             AND ((e.kind = 'message' AND NOT coalesce((e.data->>'internal')::boolean, false)) OR (e.kind = 'status' AND e.from_status = 'submitted')) AS is_response,
           min(e.created_at) FILTER (WHERE e.from_status = 'draft' AND e.to_status = 'submitted') OVER (PARTITION BY e.case_id) AS submitted_at
      FROM case_events e JOIN scoped s ON s.id = e.case_id LEFT JOIN users u ON u.id = e.actor_id),
  firsts AS (
    SELECT case_id, min(submitted_at) AS submitted_at,
           min(created_at) FILTER (WHERE is_response AND created_at >= submitted_at) AS first_response_at,
           (array_agg(actor_id ORDER BY created_at, id) FILTER (WHERE is_response AND created_at >= submitted_at))[1] AS first_responder_id,
           min(created_at) FILTER (WHERE to_status = 'closed' AND created_at >= submitted_at) AS closed_at
      FROM ev WHERE submitted_at IS NOT NULL GROUP BY case_id),
  timeline AS (
    SELECT s.id AS case_id, s.status, s.assignee_id, s.flag_ids, f.submitted_at, f.first_response_at, f.first_responder_id, f.closed_at,
           ${seconds('f.submitted_at', 'f.first_response_at')} AS response_s,
           ${seconds('f.submitted_at', 'f.closed_at')} AS resolution_s
      FROM scoped s JOIN firsts f ON f.case_id = s.id)`

/** Monday-to-Monday weeks (team time zone) overlapping [from, to). */
const weeks = `
  weeks AS (
    SELECT (w AT TIME ZONE $5::text) AS week_start
      FROM generate_series(date_trunc('week', $1::timestamptz AT TIME ZONE $5::text),
                           date_trunc('week', ($2::timestamptz - interval '1 millisecond') AT TIME ZONE $5::text),
                           interval '1 week') AS w)`
const weekOf = (col: string) => `(date_trunc('week', ${col} AT TIME ZONE $5::text) AT TIME ZONE $5::text)`

export async function statusCounts(s: Scope): Promise<{ status: CaseStatus; count: number }[]> {
  return select(`WITH ${scopedCases} SELECT status, count(*)::int AS count FROM scoped GROUP BY status`, scopeBind(s))
}

export interface WaitingRow { bucket: number; count: number; median_h: number | null; longest_h: number | null }
/** Cases waiting for the team now (submitted or in review), by calendar hours since `waiting_since`. */
export async function waitingDistribution(s: Scope, edgesHours: number[]): Promise<WaitingRow[]> {
  return select(
    `WITH ${scopedCases},
       waiting AS (
         SELECT EXTRACT(EPOCH FROM now() - c.waiting_since) / 3600 AS h
           FROM cases c JOIN scoped s ON s.id = c.id
          WHERE c.status IN ('submitted', 'in_review') AND c.waiting_since IS NOT NULL)
     SELECT width_bucket(h, $7::double precision[]) AS bucket, count(*)::int AS count,
            percentile_cont(0.5) WITHIN GROUP (ORDER BY h) AS median_h, max(h) AS longest_h
       FROM waiting GROUP BY GROUPING SETS ((width_bucket(h, $7::double precision[])), ())`,
    [...scopeBind(s), edgesHours],
  )
}

export interface WeekRow { week_start: Date | null; count: number; median_h: number | null; p90_h: number | null; within: number }

/** Median and 90th percentile per week, and over the whole period (the row with week_start null). */
export async function responseWeeks(s: Scope, which: 'first_response' | 'resolution', targetHours: number): Promise<WeekRow[]> {
  const at = which === 'first_response' ? 'first_response_at' : 'closed_at'
  const secs = which === 'first_response' ? 'response_s' : 'resolution_s'
  return select(
    `WITH ${timeline}, ${weeks},
       done AS (
         SELECT ${weekOf(at)} AS week_start, ${secs} / 3600 AS h
           FROM timeline WHERE ${at} >= $1 AND ${at} < $2),
       figures AS (
         SELECT week_start, count(*)::int AS count,
                percentile_cont(0.5) WITHIN GROUP (ORDER BY h) AS median_h,
                percentile_cont(0.9) WITHIN GROUP (ORDER BY h) AS p90_h,
                count(*) FILTER (WHERE h <= $7)::int AS within, GROUPING(week_start) AS overall
           FROM done GROUP BY GROUPING SETS ((week_start), ()))
     SELECT w.week_start, coalesce(f.count, 0) AS count, f.median_h, f.p90_h, coalesce(f.within, 0) AS within
       FROM weeks w LEFT JOIN figures f ON f.week_start = w.week_start AND f.overall = 0
     UNION ALL
     SELECT NULL, count, median_h, p90_h, within FROM figures WHERE overall = 1
     ORDER BY 1 NULLS LAST`,
    [...scopeBind(s), targetHours],
  )
}

export interface OpenClockRow {
  case_id: string; title: string; status: CaseStatus; listener_id: string; listener_name: string
  assignee_id: string | null; assignee_name: string | null; clock_start: Date; responded: boolean; elapsed_s: number
}

/**
 * Open cases whose clock has used at least `warnFraction` of its target: the first-response clock
 * while nobody has answered, then the resolution clock from the (latest re-)submission.
 */
export async function openClocks(s: Scope, t: Targets, limit = 200): Promise<OpenClockRow[]> {
  return select(
    `WITH ${timeline},
       reopened AS (
         SELECT e.case_id, max(e.created_at) AS at FROM case_events e JOIN scoped s ON s.id = e.case_id
          WHERE e.kind = 'reopened' GROUP BY e.case_id),
       clocks AS (
         SELECT tl.case_id, tl.first_response_at IS NOT NULL AS responded,
                CASE WHEN tl.first_response_at IS NULL THEN tl.submitted_at ELSE greatest(tl.submitted_at, ro.at) END AS clock_start
           FROM timeline tl LEFT JOIN reopened ro ON ro.case_id = tl.case_id
          WHERE tl.status NOT IN ('draft', 'closed')),
       measured AS (
         SELECT k.*, ${seconds('k.clock_start', 'now()')} AS elapsed_s,
                CASE WHEN k.responded THEN $8::double precision ELSE $7::double precision END * 3600 AS target_s
           FROM clocks k)
     SELECT m.case_id, c.title, c.status, c.listener_id, l.name AS listener_name, c.assignee_id, a.name AS assignee_name,
            m.clock_start, m.responded, m.elapsed_s
       FROM measured m JOIN cases c ON c.id = m.case_id JOIN users l ON l.id = c.listener_id LEFT JOIN users a ON a.id = c.assignee_id
      WHERE m.elapsed_s >= m.target_s * $9::double precision
      ORDER BY m.elapsed_s / m.target_s DESC, m.clock_start
      LIMIT $10`,
    [...scopeBind(s), t.firstResponseHours, t.resolutionHours, t.warnAtPercent / 100, limit],
  )
}

export interface WorkloadRow {
  id: string | null; name: string | null; role: 'advisor' | 'supervisor' | null; active: boolean | null
  open: number; waiting_on_team: number; waiting_on_listener: number; plan_sent: number
  closed_in_period: number; first_responses_in_period: number; median_resolution_h: number | null
}

/** One row per team member (active, or holding open cases), plus the unassigned open cases (id null). */
export async function workload(s: Scope): Promise<WorkloadRow[]> {
  return select(
    `WITH ${timeline},
       holding AS (
         SELECT assignee_id AS id,
                count(*) FILTER (WHERE status NOT IN ('draft', 'closed'))::int AS open,
                count(*) FILTER (WHERE status IN ('submitted', 'in_review'))::int AS waiting_on_team,
                count(*) FILTER (WHERE status = 'waiting_on_listener')::int AS waiting_on_listener,
                count(*) FILTER (WHERE status = 'plan_sent')::int AS plan_sent
           FROM scoped GROUP BY assignee_id),
       closed AS (
         SELECT assignee_id AS id, count(*)::int AS closed_in_period,
                percentile_cont(0.5) WITHIN GROUP (ORDER BY resolution_s) / 3600 AS median_resolution_h
           FROM timeline WHERE closed_at >= $1 AND closed_at < $2 GROUP BY assignee_id),
       answered AS (
         SELECT first_responder_id AS id, count(*)::int AS first_responses_in_period
           FROM timeline WHERE first_response_at >= $1 AND first_response_at < $2 GROUP BY first_responder_id),
       members AS (
         SELECT u.id FROM users u
          WHERE u.role IN ('advisor', 'supervisor') AND u.active AND ($3::uuid[] IS NULL OR u.id = ANY($3::uuid[]))
         UNION SELECT id FROM holding WHERE id IS NOT NULL AND open > 0)
     SELECT u.id, u.name, u.role, u.active,
            coalesce(h.open, 0) AS open, coalesce(h.waiting_on_team, 0) AS waiting_on_team,
            coalesce(h.waiting_on_listener, 0) AS waiting_on_listener, coalesce(h.plan_sent, 0) AS plan_sent,
            coalesce(cl.closed_in_period, 0) AS closed_in_period, coalesce(an.first_responses_in_period, 0) AS first_responses_in_period,
            cl.median_resolution_h
       FROM members m JOIN users u ON u.id = m.id
       LEFT JOIN holding h ON h.id = u.id LEFT JOIN closed cl ON cl.id = u.id LEFT JOIN answered an ON an.id = u.id
     UNION ALL
     SELECT NULL, NULL, NULL, NULL, coalesce((SELECT open FROM holding WHERE id IS NULL), 0), 0, 0, 0, 0, 0, NULL
     ORDER BY 5 DESC, 2`,
    scopeBind(s),
  )
}

export interface ReopenRow { week_start: Date | null; closed: number; reopened: number }
/** Closings in the period, and how many of them were followed by a reopening (lead() over each case's moves). */
export async function reopenWeeks(s: Scope): Promise<ReopenRow[]> {
  return select(
    `WITH ${scopedCases}, ${weeks},
       moves AS (
         SELECT e.created_at, e.to_status, lead(e.kind) OVER (PARTITION BY e.case_id ORDER BY e.created_at, e.id) AS next_kind
           FROM case_events e JOIN scoped s ON s.id = e.case_id WHERE e.to_status IS NOT NULL),
       figures AS (
         SELECT ${weekOf('created_at')} AS week_start, count(*)::int AS closed,
                count(*) FILTER (WHERE next_kind = 'reopened')::int AS reopened, GROUPING(${weekOf('created_at')}) AS overall
           FROM moves WHERE to_status = 'closed' AND created_at >= $1 AND created_at < $2
          GROUP BY GROUPING SETS ((${weekOf('created_at')}), ()))
     SELECT w.week_start, coalesce(f.closed, 0) AS closed, coalesce(f.reopened, 0) AS reopened
       FROM weeks w LEFT JOIN figures f ON f.week_start = w.week_start AND f.overall = 0
     UNION ALL SELECT NULL, closed, reopened FROM figures WHERE overall = 1
     UNION ALL SELECT NULL, 0, 0 WHERE NOT EXISTS (SELECT 1 FROM figures WHERE overall = 1)
     ORDER BY 1 NULLS LAST`,
    scopeBind(s),
  )
}

export interface FlagRow { flag_id: string | null; cases: number; open: number; median_resolution_h: number | null }
/** Cases submitted in the period per setup flag (a case with three flags counts under each); flag_id null is the total. */
export async function flagBreakdown(s: Scope): Promise<FlagRow[]> {
  return select(
    `WITH ${timeline},
       period AS (SELECT * FROM timeline WHERE submitted_at >= $1 AND submitted_at < $2)
     SELECT f.flag_id, count(*)::int AS cases, count(*) FILTER (WHERE p.status <> 'closed')::int AS open,
            percentile_cont(0.5) WITHIN GROUP (ORDER BY p.resolution_s) FILTER (WHERE p.closed_at IS NOT NULL) / 3600 AS median_resolution_h
       FROM period p CROSS JOIN LATERAL unnest(p.flag_ids) AS f(flag_id)
      GROUP BY f.flag_id
     UNION ALL SELECT NULL, count(*)::int, count(*) FILTER (WHERE status <> 'closed')::int, NULL FROM period
     ORDER BY 2 DESC, 1`,
    scopeBind(s),
  )
}

export interface RatingWeekRow { week_start: Date | null; count: number; average: number | null; d1: number; d2: number; d3: number; d4: number; d5: number; closed: number }
export async function satisfactionWeeks(s: Scope): Promise<RatingWeekRow[]> {
  return select(
    `WITH ${scopedCases}, ${weeks},
       rated AS (SELECT r.score, r.created_at FROM case_ratings r JOIN scoped s ON s.id = r.case_id WHERE r.created_at >= $1 AND r.created_at < $2),
       figures AS (
         SELECT ${weekOf('created_at')} AS week_start, count(*)::int AS count, avg(score)::float AS average,
                count(*) FILTER (WHERE score = 1)::int AS d1, count(*) FILTER (WHERE score = 2)::int AS d2, count(*) FILTER (WHERE score = 3)::int AS d3,
                count(*) FILTER (WHERE score = 4)::int AS d4, count(*) FILTER (WHERE score = 5)::int AS d5,
                GROUPING(${weekOf('created_at')}) AS overall
           FROM rated GROUP BY GROUPING SETS ((${weekOf('created_at')}), ())),
       closed AS (
         SELECT count(DISTINCT e.case_id)::int AS n FROM case_events e JOIN scoped s ON s.id = e.case_id
          WHERE e.to_status = 'closed' AND e.created_at >= $1 AND e.created_at < $2)
     SELECT w.week_start, coalesce(f.count, 0) AS count, f.average, 0 AS d1, 0 AS d2, 0 AS d3, 0 AS d4, 0 AS d5, 0 AS closed
       FROM weeks w LEFT JOIN figures f ON f.week_start = w.week_start AND f.overall = 0
     UNION ALL
     SELECT NULL, coalesce(f.count, 0), f.average, coalesce(f.d1, 0), coalesce(f.d2, 0), coalesce(f.d3, 0), coalesce(f.d4, 0), coalesce(f.d5, 0), (SELECT n FROM closed)
       FROM (SELECT 1) one LEFT JOIN figures f ON f.overall = 1
     ORDER BY 1 NULLS LAST`,
    scopeBind(s),
  )
}

export interface RecentRatingRow { case_id: string; title: string; score: number; comment: string; created_at: Date; listener_name: string }
export async function recentRatings(s: Scope, limit = 8): Promise<RecentRatingRow[]> {
  return select(
    `WITH ${scopedCases}
     SELECT r.case_id, s.title, r.score, r.comment, r.created_at, l.name AS listener_name
       FROM case_ratings r JOIN scoped s ON s.id = r.case_id JOIN users l ON l.id = r.listener_id
      WHERE r.created_at >= $1 AND r.created_at < $2
      ORDER BY r.created_at DESC LIMIT $7`,
    [...scopeBind(s), limit],
  )
}

/** The default period: Monday 00:00 (team zone) eleven weeks before this week's, until now. */
export async function defaultPeriod(timeZone: string): Promise<{ from: Date; to: Date }> {
  const [row] = await select<{ from: Date; to: Date }>(
    `SELECT (date_trunc('week', now() AT TIME ZONE $1::text) - interval '11 weeks') AT TIME ZONE $1::text AS "from", now() AS "to"`,
    [timeZone],
  )
  return { from: new Date(row.from), to: new Date(row.to) }
}

// ----------------------------------------------------------------- settings

/** The desk's one settings row, with the name of whoever changed it last. */
export async function readSettings(t?: import('sequelize').Transaction): Promise<DeskSettingsModel> {
  const row = await models().DeskSettings.findByPk(1, { include: [{ association: 'editor', attributes: ['id', 'name'], required: false }], transaction: t })
  if (!row) throw new Error('desk_settings has no row 1 (migration 0010 writes it)')
  return row
}
export async function writeSettings(t: Targets, by: string, tx: import('sequelize').Transaction): Promise<void> {
  await models().DeskSettings.update(
    {
      firstResponseHours: t.firstResponseHours, resolutionHours: t.resolutionHours, warnAtPercent: t.warnAtPercent,
      timeZone: t.businessHours?.timeZone ?? null, week: t.businessHours?.week ?? null, updatedAt: dbNow(), updatedBy: by,
    },
    { where: { id: 1 }, transaction: tx },
  )
}

/** Whether PostgreSQL's own time-zone database knows the zone (the SQL function needs it too). */
export async function databaseKnowsZone(timeZone: string): Promise<boolean> {
  const [row] = await select<{ n: number }>('SELECT count(*)::int AS n FROM pg_timezone_names WHERE name = $1', [timeZone])
  return row.n > 0
}
