import { afterAll, describe, expect, it } from 'vitest'
import { QueryTypes } from 'sequelize'
import { closeTestApp, signedIn } from '../helpers/api'
import { openCase } from '../helpers/cases'
import { db } from '../../server/db/sequelize'
import { hoursAgo, models } from '../helpers/rows'
import type { CaseStatus } from '../../shared/schemas/case'

afterAll(closeTestApp)

type Row = { id: string; status: string; priority: number; assignee: { id: string } | null }
const ids = (rows: { id: string }[]) => rows.map((r) => r.id)

/** Sets a case's status, score and the start of its wait directly (the queue reads only these columns). */
async function setCase(id: string, status: string, score: number, waitingHours: number | null) {
  await models().Case.update(
    { status: status as CaseStatus, score, waitingSince: waitingHours === null ? null : hoursAgo(waitingHours) },
    { where: { id } },
  )
}

/** Every page of a view, in order. */
async function everyPage(c: Awaited<ReturnType<typeof signedIn>>['c'], query: string, pageSize = 7): Promise<Row[]> {
  const rows: Row[] = []
  for (let page = 1; page < 200; page++) {
    const body = (await c.get(`/api/cases?${query}&pageSize=${pageSize}&page=${page}`).expect(200)).body
    rows.push(...body.rows)
    if (body.rows.length < pageSize) break
  }
  return rows
}

describe('GET /api/cases — the default views cover open work, what needs an answer first', () => {
  it('closed cases leave Mine, Unassigned and All, and come back with the status filter', async () => {
    const listener = await signedIn('listener')
    const advisor = await signedIn('advisor')
    const { case: open } = await openCase(listener.c, { title: 'Open: flutter between the bookshelves' })
    const { case: closedMine } = await openCase(listener.c, { title: 'Closed: the hum is gone' })
    const { case: closedFree } = await openCase(listener.c, { title: 'Closed before anyone claimed it' })
    await advisor.c.patch(`/api/cases/${open.id}`, { assigneeId: advisor.user.id }).expect(200)
    await advisor.c.patch(`/api/cases/${closedMine.id}`, { assigneeId: advisor.user.id }).expect(200)
    await advisor.c.patch(`/api/cases/${closedMine.id}`, { status: 'closed', fromStatus: 'submitted' }).expect(200)
    await advisor.c.patch(`/api/cases/${closedFree.id}`, { status: 'closed', fromStatus: 'submitted' }).expect(200)

    const mine = (await advisor.c.get('/api/cases?scope=mine').expect(200)).body
    expect(ids(mine.rows)).toEqual([open.id])
    expect(mine).toMatchObject({ total: 1, totalCapped: false })
    for (const scope of ['unassigned', 'all']) {
      const rows = await everyPage(advisor.c, `scope=${scope}`, 100)
      expect(ids(rows)).not.toContain(closedMine.id)
      expect(ids(rows)).not.toContain(closedFree.id)
      expect(rows.every((r) => r.status !== 'closed' && r.status !== 'draft')).toBe(true)
    }
    const closed = (await advisor.c.get('/api/cases?scope=mine&status=closed').expect(200)).body
    expect(ids(closed.rows)).toEqual([closedMine.id])
    const both = (await advisor.c.get('/api/cases?scope=all&status=closed,submitted&pageSize=100').expect(200)).body
    expect(ids(both.rows)).toEqual(expect.arrayContaining([open.id, closedMine.id, closedFree.id]))
  })

  it('orders by what needs an answer first, then by priority = score + hours waiting / 4, capped at four days, on every page', async () => {
    const listener = await signedIn('listener')
    const advisor = await signedIn('advisor')
    // [status, score, hours waiting for us or null]: scores and waits chosen so the cap and the groups both matter
    const plan: [string, number, number | null][] = [
      ['waiting_on_listener', 9.5, null], ['plan_sent', 8, null], ['submitted', 1, 150], ['in_review', 3, 97],
      ['submitted', 9, 2], ['in_review', 2, 60], ['submitted', 0.5, 0.5], ['in_review', 7, 95.9], ['submitted', 4, 200],
      ['waiting_on_listener', 0.2, null], ['in_review', 5, 30], ['submitted', 6, 12], ['plan_sent', 3.3, null], ['submitted', 2.5, 96],
    ]
    const made: string[] = []
    for (const [i, [status, score, hours]] of plan.entries()) {
      const { case: c } = await openCase(listener.c, { title: `Ordering case ${i}` })
      await setCase(c.id, status, score, hours)
      made.push(c.id)
    }
    const rows = (await everyPage(advisor.c, 'scope=all', 4)).filter((r) => made.includes(r.id))
    // The expected order computed here from the definition (services/triage.ts; our own rule, no outside source).
    const expected = plan
      .map(([status, score, hours], i) => ({ id: made[i], needs: status === 'submitted' || status === 'in_review', p: score + Math.min(hours ?? 0, 96) / 4 }))
      .sort((a, b) => (a.needs !== b.needs ? (a.needs ? -1 : 1) : b.p - a.p))
    expect(ids(rows)).toEqual(ids(expected))
    // capped: 150 h and 200 h both count as 96 h
    expect(rows.find((r) => r.id === made[2])!.priority).toBe(25)
    expect(rows.find((r) => r.id === made[8])!.priority).toBe(28)
    // the groups: every case that needs an answer comes before every case waiting on the listener
    const firstIdle = rows.findIndex((r) => r.status === 'waiting_on_listener' || r.status === 'plan_sent')
    expect(rows.slice(firstIdle).every((r) => r.status === 'waiting_on_listener' || r.status === 'plan_sent')).toBe(true)
  })

  it('pages without gaps or repeats and counts up to a cap ("200+")', async () => {
    const listener = await signedIn('listener')
    const advisor = await signedIn('advisor')
    const { case: seed } = await openCase(listener.c, { title: 'Paging template case' })
    // 260 more open cases in one statement (copies of the template with distinct scores and waits)
    await db().query(
      `INSERT INTO cases (listener_id, room_id, room_revision, title, description, answers, status, score, reply_token, submitted_at, waiting_since)
       SELECT listener_id, room_id, room_revision, 'Paging copy ' || i, description, answers,
              (ARRAY['submitted','in_review','waiting_on_listener','plan_sent']::case_status[])[1 + i % 4], (i * 37 % 100) / 10.0,
              md5(random()::text || i) || md5(i::text), now(), CASE WHEN i % 4 < 2 THEN now() - (i * 7 % 130) * interval '1 hour' END
         FROM cases, generate_series(1, 260) i WHERE id = $1`,
      { bind: [seed.id] },
    )
    const first = (await advisor.c.get('/api/cases?scope=all&pageSize=25').expect(200)).body
    expect(first.rows).toHaveLength(25)
    expect(first).toMatchObject({ total: 250, totalCapped: true })
    const all = await everyPage(advisor.c, 'scope=all', 25)
    const [{ n }] = await db().query<{ n: number }>(
      `SELECT count(*)::int AS n FROM cases WHERE status IN ('submitted','in_review','waiting_on_listener','plan_sent')`, { type: QueryTypes.SELECT },
    )
    expect(n).toBeGreaterThan(261)
    expect(n).toBeLessThan(325)
    // ten pages ahead of page 4 is 325 cases: the count there reaches every one, exactly
    const later = (await advisor.c.get('/api/cases?scope=all&pageSize=25&page=4').expect(200)).body
    expect(later).toMatchObject({ total: n, totalCapped: false })
    expect(all).toHaveLength(n)
    expect(new Set(ids(all)).size).toBe(n)
    // priorities never rise within a group from one page to the next
    for (let i = 1; i < all.length; i++) {
      const needs = (r: Row) => r.status === 'submitted' || r.status === 'in_review'
      if (needs(all[i]) === needs(all[i - 1])) expect(all[i].priority).toBeLessThanOrEqual(all[i - 1].priority + 0.05)
    }
    const last = (await advisor.c.get(`/api/cases?scope=all&pageSize=25&page=${Math.ceil(n / 25)}`).expect(200)).body
    expect(last).toMatchObject({ total: n, totalCapped: false })
  })
})
