/**
 * The queue priority has one definition, `queuePriority()` (shared/queue-priority.ts), and one SQL twin,
 * `prioritySql` (server/data/queue.ts), which the queue sorts by. They must agree on every case: here a
 * table of cases in each status with waits around the 96-hour cap, evaluated by PostgreSQL on rows of the
 * cases table and by the function at the statement's own now(). The weights are our own (no source).
 */
import { afterAll, describe, expect, it } from 'vitest'
import { QueryTypes } from 'sequelize'
import { closeTestApp, signedIn } from '../helpers/api'
import { openCase } from '../helpers/cases'
import { db } from '../../server/db/sequelize'
import { prioritySql } from '../../server/data/queue'
import { WAIT_CAP_HOURS, needsAnswer, queuePriority } from '../../shared/queue-priority'
import { caseStatusSchema, type CaseStatus } from '../../shared/schemas/case'

afterAll(closeTestApp)

// hours waited (null: not waiting), around the cap and far from it; a wait set in the future counts negative in both
const waits = [null, 0, 0.5, 1, 47.25, 95, 95.99, 96, 96.01, 97, 150, 2000, -1]
// real (float4) scores: a case's score column is `real`, so compare with the value PostgreSQL stores
const scores = [null, 0, 2.5, 7.3, 9.99, 52]

describe('queuePriority() and prioritySql agree', () => {
  it('on a table of cases: each status, waits around the cap, every score kind', async () => {
    const statuses = caseStatusSchema.options.filter((s) => s !== 'draft') as CaseStatus[]
    const listener = await signedIn('listener')
    const { case: template } = await openCase(listener.c, { title: 'Priority template' })
    const table = statuses.flatMap((status) => waits.flatMap((hours) => scores.map((score) => ({ status, hours, score }))))
    // one row per combination, copied from the template case in one statement
    const rows = await db().query<{ id: string; status: CaseStatus; score: number | null; waiting_since: Date | null; sql_priority: number; now: Date }>(
      `WITH spec AS (SELECT * FROM jsonb_to_recordset($2::jsonb) AS s(i int, status case_status, hours float, score real)),
            made AS (
              INSERT INTO cases (listener_id, room_id, room_revision, title, description, answers, status, score, reply_token, submitted_at, waiting_since)
              SELECT c.listener_id, c.room_id, c.room_revision, 'Priority case ' || s.i, c.description, c.answers, s.status, s.score,
                     md5(random()::text || s.i) || md5(s.i::text), now(), now() - make_interval(secs => s.hours * 3600)
                FROM cases c, spec s WHERE c.id = $1
              RETURNING id)
       SELECT id FROM made`,
      { bind: [template.id, JSON.stringify(table.map((t, i) => ({ i, ...t })))], type: QueryTypes.SELECT },
    ).then(async (made) =>
      db().query<{ id: string; status: CaseStatus; score: number | null; waiting_since: Date | null; sql_priority: number; now: Date }>(
        `SELECT c.id, c.status, c.score, c.waiting_since, ${prioritySql} AS sql_priority, now() AS now FROM cases c WHERE c.id = ANY($1::uuid[])`,
        { bind: [made.map((m) => m.id)], type: QueryTypes.SELECT },
      ))
    expect(rows).toHaveLength(table.length)
    let capped = 0
    for (const r of rows) {
      // PostgreSQL widens the stored real to double precision in the expression; so does Math.fround here.
      // 6 decimals: JavaScript dates keep milliseconds where PostgreSQL keeps microseconds (at most 1.4e-7 points apart)
      const ts = queuePriority({ score: r.score === null ? null : Math.fround(r.score), waitingSince: r.waiting_since }, r.now)
      expect(Number(r.sql_priority), `${r.status} score ${r.score} since ${r.waiting_since?.toISOString()}`).toBeCloseTo(ts, 6)
      if (r.waiting_since && (new Date(r.now).getTime() - new Date(r.waiting_since).getTime()) / 3.6e6 > WAIT_CAP_HOURS) {
        capped++
        expect(ts).toBeCloseTo(Math.fround(r.score ?? 0) + WAIT_CAP_HOURS / 4, 9)
      }
    }
    // 96.01 h, 97 h, 150 h and 2000 h in every status and score (96 h itself has waited a little longer by the SELECT)
    expect(capped).toBeGreaterThanOrEqual(statuses.length * scores.length * 4)
    // and the figure the queue answers with is the function's, to one decimal, for every status
    const advisor = await signedIn('advisor')
    for (const status of statuses) {
      const page = (await advisor.c.get(`/api/cases?status=${status}&pageSize=100`).expect(200)).body as { rows: { id: string; priority: number; status: CaseStatus }[] }
      const now = Date.now()
      const mine = page.rows.filter((p) => rows.some((r) => r.id === p.id))
      expect(mine.length).toBeGreaterThan(0)
      for (const p of mine) {
        const r = rows.find((x) => x.id === p.id)!
        expect(Math.abs(p.priority - queuePriority({ score: r.score, waitingSince: r.waiting_since }, now))).toBeLessThanOrEqual(0.051)
        expect(needsAnswer(p.status)).toBe(status === 'submitted' || status === 'in_review')
      }
    }
  })

  it('the cap by hand: 95 h adds 23.75, 96 h and 150 h add 24 (a quarter point an hour, our own weights)', () => {
    const now = Date.parse('2026-12-01T12:00:00Z')
    const since = (h: number) => new Date(now - h * 3.6e6)
    expect(queuePriority({ score: 2, waitingSince: since(95) }, now)).toBeCloseTo(25.75, 9)
    expect(queuePriority({ score: 2, waitingSince: since(96) }, now)).toBeCloseTo(26, 9)
    expect(queuePriority({ score: 2, waitingSince: since(150) }, now)).toBeCloseTo(26, 9)
    expect(queuePriority({ score: null, waitingSince: null }, now)).toBe(0)
  })
})
