import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { randomBytes } from 'node:crypto'
import { QueryTypes } from 'sequelize'
import { client, closeTestApp, makeUser, signedIn, type Client } from '../helpers/api'
import { testRoom } from '../helpers/rooms'
import { db } from '../../server/db/sequelize'
import { workingMs } from '../../server/services/business-hours'
import type { BusinessHours } from '../../shared/schemas/metrics'
import type { CaseStatus } from '../../shared/schemas/case'
import { hoursAgo, models } from '../helpers/rows'

afterAll(closeTestApp)

/**
 * A small fixed history, inserted through the models under fresh users so figures can be filtered to it
 * (other test files write to the same database at the same time). Every expected value below is
 * worked out by hand from these timestamps; percentiles are linear interpolation between closest
 * ranks, PostgreSQL's percentile_cont (PostgreSQL manual, "Aggregate Functions", table 9.62).
 */
type Ev = { at: Date; kind: string; by: 'L' | 'A1' | 'A2'; from?: string; to?: string; internal?: boolean }
interface Fixture { listenerId: string; a1: string; a2: string; ids: Record<string, string> }

async function insertCase(f: Omit<Fixture, 'ids'>, roomId: string, c: { title: string; status: string; assignee: 'A1' | 'A2'; flags: string[]; waitingSince?: Date; events: Ev[]; rating?: { score: number; at: Date; comment: string } }) {
  const { Case, CaseEvent, CaseRating } = models()
  const who = { L: f.listenerId, A1: f.a1, A2: f.a2 }
  const sub = c.events.find((e) => e.to === 'submitted')!.at
  const row = await Case.create({
    listenerId: f.listenerId, roomId, roomRevision: 1, title: c.title, status: c.status as CaseStatus, assigneeId: who[c.assignee], flagIds: c.flags,
    replyToken: randomBytes(24).toString('hex'), submittedAt: sub, waitingSince: c.waitingSince ?? null, createdAt: sub,
  })
  for (const e of c.events) {
    await CaseEvent.create({
      caseId: row.id, actorId: who[e.by], kind: e.kind, fromStatus: (e.from ?? null) as CaseStatus | null, toStatus: (e.to ?? null) as CaseStatus | null,
      data: e.internal ? { internal: true } : {}, createdAt: e.at,
    })
  }
  if (c.rating) await CaseRating.create({ caseId: row.id, listenerId: f.listenerId, score: c.rating.score, comment: c.rating.comment, createdAt: c.rating.at })
  return row.id
}

const t = (iso: string) => new Date(iso)
const ago = hoursAgo
const submit = (at: Date): Ev => ({ at, kind: 'status', by: 'L', from: 'draft', to: 'submitted' })
const close = (at: Date, by: Ev['by']): Ev => ({ at, kind: 'status', by, from: 'in_review', to: 'closed' })

let fx: Fixture
let sup: Client
let listener: Client
const period = { from: '2024-03-04T00:00:00Z', to: '2024-03-18T00:00:00Z' }
const qs = (o: Record<string, string>) => new URLSearchParams(o).toString()
let byListener: string
let byAdvisors: string

beforeAll(async () => {
  const l = await makeUser('listener', 'Fixture Listener Quill')
  const a1 = await makeUser('advisor', 'Fixture Advisor Ada')
  const a2 = await makeUser('advisor', 'Fixture Advisor Bo')
  listener = await client(l)
  sup = (await signedIn('supervisor')).c
  const room = (await listener.post('/api/rooms', testRoom()).expect(201)).body
  const base = { listenerId: l.id, a1: a1.id, a2: a2.id }
  const ids: Record<string, string> = {}
  ids.C1 = await insertCase(base, room.id, {
    title: 'C1 quick answer', status: 'closed', assignee: 'A1', flags: ['near-square-plan', 'facing-long-wall'],
    events: [submit(t('2024-03-04T09:00:00Z')), { at: t('2024-03-04T11:00:00Z'), kind: 'status', by: 'A1', from: 'submitted', to: 'in_review' }, close(t('2024-03-05T09:00:00Z'), 'A1')],
    rating: { score: 5, at: t('2024-03-05T10:00:00Z'), comment: 'Clear plan, thank you' },
  })
  ids.C2 = await insertCase(base, room.id, {
    title: 'C2 reopened', status: 'closed', assignee: 'A1', flags: ['near-square-plan'],
    events: [
      submit(t('2024-03-05T08:00:00Z')),
      { at: t('2024-03-05T09:00:00Z'), kind: 'note', by: 'A1', internal: true }, // internal: not a response
      { at: t('2024-03-05T09:30:00Z'), kind: 'claimed', by: 'A1' }, // claiming alone: not a response
      { at: t('2024-03-05T14:00:00Z'), kind: 'message', by: 'A1' },
      { at: t('2024-03-05T14:00:00Z'), kind: 'status', by: 'A1', from: 'submitted', to: 'in_review' },
      close(t('2024-03-07T08:00:00Z'), 'A1'),
      { at: t('2024-03-08T10:00:00Z'), kind: 'reopened', by: 'L', from: 'closed', to: 'submitted' },
      { at: t('2024-03-09T10:00:00Z'), kind: 'status', by: 'A1', from: 'submitted', to: 'closed' },
    ],
    rating: { score: 2, at: t('2024-03-09T11:00:00Z'), comment: 'Had to come back' },
  })
  ids.C3 = await insertCase(base, room.id, {
    title: 'C3 slow answer', status: 'closed', assignee: 'A2', flags: ['seat-at-room-centre'],
    events: [
      submit(t('2024-03-11T10:00:00Z')),
      { at: t('2024-03-11T11:00:00Z'), kind: 'message', by: 'L' }, // the listener's own message: not a response
      { at: t('2024-03-12T20:00:00Z'), kind: 'message', by: 'A2' },
      close(t('2024-03-14T10:00:00Z'), 'A2'),
    ],
  })
  ids.C4 = await insertCase(base, room.id, {
    title: 'C4 closed straight away', status: 'closed', assignee: 'A2', flags: [],
    events: [submit(t('2024-03-11T12:00:00Z')), { at: t('2024-03-11T13:00:00Z'), kind: 'status', by: 'A2', from: 'submitted', to: 'closed' }],
  })
  ids.C5 = await insertCase(base, room.id, { title: 'C5 unanswered 30 h', status: 'submitted', assignee: 'A2', flags: [], waitingSince: ago(30), events: [submit(ago(30))] })
  ids.C6 = await insertCase(base, room.id, {
    title: 'C6 unanswered 20 h', status: 'submitted', assignee: 'A1', flags: [], waitingSince: ago(20),
    events: [submit(ago(20)), { at: ago(19), kind: 'claimed', by: 'A1' }],
  })
  ids.C7 = await insertCase(base, room.id, { title: 'C7 new', status: 'submitted', assignee: 'A1', flags: [], waitingSince: ago(2), events: [submit(ago(2))] })
  ids.C8 = await insertCase(base, room.id, {
    title: 'C8 open 130 h', status: 'waiting_on_listener', assignee: 'A2', flags: [],
    events: [
      submit(ago(130)),
      { at: ago(125), kind: 'message', by: 'A2' },
      { at: ago(125), kind: 'status', by: 'A2', from: 'submitted', to: 'in_review' },
      { at: ago(100), kind: 'status', by: 'A2', from: 'in_review', to: 'waiting_on_listener' },
    ],
  })
  fx = { ...base, ids }
  byListener = qs({ ...period, listenerIds: l.id })
  byAdvisors = qs({ ...period, advisorIds: `${a1.id},${a2.id}` })
  await sup.put('/api/metrics/targets', { firstResponseHours: 24, resolutionHours: 120, warnAtPercent: 75, businessHours: null }).expect(200)
})

describe('GET /api/metrics/* — calendar time, targets 24 h and 120 h', () => {
  it('/status counts the cases by status now (drafts left out)', async () => {
    const body = (await sup.get(`/api/metrics/status?${byListener}`).expect(200)).body
    const count = Object.fromEntries(body.statuses.map((s: { status: string; count: number }) => [s.status, s.count]))
    expect(count).toEqual({ submitted: 3, in_review: 0, waiting_on_listener: 1, plan_sent: 0, closed: 4 })
    expect(body.open).toBe(4)
  })

  it('/waiting puts the cases waiting for the team into buckets by hours waited', async () => {
    const body = (await sup.get(`/api/metrics/waiting?${byListener}`).expect(200)).body
    const count = Object.fromEntries(body.buckets.map((b: { key: string; count: number }) => [b.key, b.count]))
    expect(count).toEqual({ lt4h: 1, '4to24h': 1, '1to2d': 1, '2to4d': 0, '4to7d': 0, gt7d: 0 })
    expect(body.total).toBe(3)
    expect(body.medianHours).toBeCloseTo(20, 1)
    expect(body.longestHours).toBeCloseTo(30, 1)
  })

  it('/response-times gives median and 90th percentile per week and overall', async () => {
    const body = (await sup.get(`/api/metrics/response-times?${byListener}`).expect(200)).body
    expect(body.clock).toBe('calendar')
    expect(body.firstResponse.weeks).toEqual([
      // C1 2 h, C2 6 h (the internal note and the claim do not count): p90 = 2 + 0.9·4
      { weekStart: '2024-03-04T00:00:00.000Z', count: 2, medianHours: 4, p90Hours: 5.6, withinTarget: 2 },
      // C3 34 h (the listener's own message does not count), C4 1 h (closed by the team): p90 = 1 + 0.9·33
      { weekStart: '2024-03-11T00:00:00.000Z', count: 2, medianHours: 17.5, p90Hours: 30.7, withinTarget: 1 },
    ])
    // [1, 2, 6, 34]: p90 at rank 2.7 = 6 + 0.7·28
    expect(body.firstResponse.overall).toEqual({ count: 4, medianHours: 4, p90Hours: 25.6, withinTarget: 3 })
    expect(body.resolution.weeks).toEqual([
      // C1 24 h, C2 48 h to its first closing (the reopening does not change it)
      { weekStart: '2024-03-04T00:00:00.000Z', count: 2, medianHours: 36, p90Hours: 45.6, withinTarget: 2 },
      { weekStart: '2024-03-11T00:00:00.000Z', count: 2, medianHours: 36.5, p90Hours: 64.9, withinTarget: 2 },
    ])
    expect(body.resolution.overall).toEqual({ count: 4, medianHours: 36, p90Hours: 64.8, withinTarget: 4 })
    expect(body.firstResponse.targetHours).toBe(24)
    expect(body.resolution.targetHours).toBe(120)
  })

  it('/breaches lists open cases past or near their target, worst first, with the due time', async () => {
    const body = (await sup.get(`/api/metrics/breaches?${byListener}`).expect(200)).body
    const rows = body.rows.map((r: { caseId: string; target: string; state: string; elapsedHours: number }) => [r.caseId, r.target, r.state, Math.round(r.elapsedHours)])
    expect(rows).toEqual([
      [fx.ids.C5, 'first_response', 'breached', 30], // 30/24 = 125 %
      [fx.ids.C8, 'resolution', 'breached', 130], // answered, but open 130 h of 120
      [fx.ids.C6, 'first_response', 'at_risk', 20], // 20/24 = 83 % ≥ 75 %; C7 (2 h) is not listed
    ])
    const c5 = body.rows[0]
    expect(Date.parse(c5.dueAt) - Date.parse(c5.submittedAt)).toBe(24 * 3_600_000)
    expect(c5.assignee).toEqual({ id: fx.a2, name: 'Fixture Advisor Bo' })
  })

  it('/workload gives open cases and throughput per advisor', async () => {
    const body = (await sup.get(`/api/metrics/workload?${byAdvisors}`).expect(200)).body
    const ada = body.advisors.find((a: { advisor: { id: string } }) => a.advisor.id === fx.a1)
    const bo = body.advisors.find((a: { advisor: { id: string } }) => a.advisor.id === fx.a2)
    expect(body.advisors).toHaveLength(2)
    expect(ada).toMatchObject({ open: 2, waitingOnTeam: 2, waitingOnListener: 0, planSent: 0, closedInPeriod: 2, firstResponsesInPeriod: 2, medianResolutionHours: 36 })
    expect(bo).toMatchObject({ open: 2, waitingOnTeam: 1, waitingOnListener: 1, planSent: 0, closedInPeriod: 2, firstResponsesInPeriod: 2, medianResolutionHours: 36.5 })
    expect(ada.advisor).toEqual({ id: fx.a1, name: 'Fixture Advisor Ada', role: 'advisor', active: true })
  })

  it('/reopen-rate counts closings followed by a reopening', async () => {
    const body = (await sup.get(`/api/metrics/reopen-rate?${byListener}`).expect(200)).body
    expect(body).toMatchObject({ closed: 5, reopened: 1, rate: 0.2 })
    expect(body.weeks).toEqual([
      { weekStart: '2024-03-04T00:00:00.000Z', closed: 3, reopened: 1, rate: 0.3333 },
      { weekStart: '2024-03-11T00:00:00.000Z', closed: 2, reopened: 0, rate: 0 },
    ])
  })

  it('/flags breaks the cases submitted in the period down by setup flag', async () => {
    const body = (await sup.get(`/api/metrics/flags?${byListener}`).expect(200)).body
    expect(body.cases).toBe(4)
    expect(body.flags).toEqual([
      { flagId: 'near-square-plan', label: 'Near-square floor plan', cases: 2, share: 0.5, open: 0, medianResolutionHours: 36 },
      { flagId: 'facing-long-wall', label: 'Speakers on the long wall', cases: 1, share: 0.25, open: 0, medianResolutionHours: 24 },
      { flagId: 'seat-at-room-centre', label: 'Seat at the room centre', cases: 1, share: 0.25, open: 0, medianResolutionHours: 72 },
    ])
  })

  it('/satisfaction gives the ratings, their spread and the weekly trend', async () => {
    const body = (await sup.get(`/api/metrics/satisfaction?${byListener}`).expect(200)).body
    expect(body).toMatchObject({ count: 2, average: 3.5, distribution: [0, 1, 0, 0, 1], closedInPeriod: 4 })
    expect(body.weeks).toEqual([
      { weekStart: '2024-03-04T00:00:00.000Z', count: 2, average: 3.5 },
      { weekStart: '2024-03-11T00:00:00.000Z', count: 0, average: null },
    ])
    expect(body.recent.map((r: { score: number; comment: string }) => [r.score, r.comment])).toEqual([[2, 'Had to come back'], [5, 'Clear plan, thank you']])
  })

  it('a period outside the fixture gives empty figures, not errors', async () => {
    const q = qs({ from: '2023-01-02T00:00:00Z', to: '2023-01-16T00:00:00Z', listenerIds: fx.listenerId })
    const rt = (await sup.get(`/api/metrics/response-times?${q}`).expect(200)).body
    expect(rt.firstResponse.weeks.map((w: { count: number }) => w.count)).toEqual([0, 0])
    expect(rt.firstResponse.overall).toEqual({ count: 0, medianHours: null, p90Hours: null, withinTarget: 0 })
    expect((await sup.get(`/api/metrics/satisfaction?${q}`).expect(200)).body).toMatchObject({ count: 0, average: null })
    expect((await sup.get(`/api/metrics/reopen-rate?${q}`).expect(200)).body).toMatchObject({ closed: 0, reopened: 0, rate: null })
  })

  it('bad query parameters answer 400 with the field path', async () => {
    const r1 = await sup.get('/api/metrics/workload?advisorIds=not-a-uuid').expect(400)
    expect(r1.body.error.fields[0].path).toMatch(/^advisorIds/)
    const r2 = await sup.get(`/api/metrics/status?${qs({ from: '2024-03-18T00:00:00Z', to: '2024-03-04T00:00:00Z' })}`).expect(400)
    expect(r2.body.error.fields[0].path).toBe('to')
  })
})

describe('business hours (Europe/Berlin, Monday to Friday 09:00–17:00)', () => {
  const nineToFive = { start: '09:00', end: '17:00' }
  const berlin: BusinessHours = { timeZone: 'Europe/Berlin', week: [nineToFive, nineToFive, nineToFive, nineToFive, nineToFive, null, null] }
  beforeAll(async () => {
    await sup.put('/api/metrics/targets', { firstResponseHours: 8, resolutionHours: 40, warnAtPercent: 75, businessHours: berlin }).expect(200)
  })
  afterAll(async () => {
    await sup.put('/api/metrics/targets', { firstResponseHours: 24, resolutionHours: 120, warnAtPercent: 75, businessHours: null }).expect(200)
  })

  it('response times count working hours and weeks start on Monday 00:00 Berlin time', async () => {
    const body = (await sup.get(`/api/metrics/response-times?${byListener}`).expect(200)).body
    expect(body).toMatchObject({ clock: 'working', timeZone: 'Europe/Berlin' })
    // C1 Mon 10:00→12:00 = 2 h; C2 Tue 09:00→15:00 = 6 h; C3 Mon 11:00 → Tue 21:00 = 6 + 8 = 14 h; C4 1 h (local times, CET)
    expect(body.firstResponse.weeks.map((w: object) => w)).toEqual([
      { weekStart: '2024-03-03T23:00:00.000Z', count: 2, medianHours: 4, p90Hours: 5.6, withinTarget: 2 },
      { weekStart: '2024-03-10T23:00:00.000Z', count: 2, medianHours: 7.5, p90Hours: 12.7, withinTarget: 1 },
      // the period ends at 01:00 on Monday 18 March, Berlin time: that week is in it, empty
      { weekStart: '2024-03-17T23:00:00.000Z', count: 0, medianHours: null, p90Hours: null, withinTarget: 0 },
    ])
    // [1, 2, 6, 14]: p90 = 6 + 0.7·8
    expect(body.firstResponse.overall).toEqual({ count: 4, medianHours: 4, p90Hours: 11.6, withinTarget: 3 })
    // C1 Mon 10:00 → Tue 10:00 = 7 + 1 = 8 h; C2 Tue 09:00 → Thu 09:00 = 16 h; C3 Mon 11:00 → Thu 11:00 = 6 + 8 + 8 + 2 = 24 h; C4 1 h
    expect(body.resolution.overall).toEqual({ count: 4, medianHours: 12, p90Hours: 21.6, withinTarget: 4 })
  })

  it('the SQL working-time function agrees with the pure function, clock changes included', async () => {
    const cases: [string, string, BusinessHours][] = [
      ['2024-03-04T09:00:00Z', '2024-03-05T09:00:00Z', berlin],
      ['2025-03-28T15:00:00Z', '2025-03-31T08:00:00Z', berlin],
      ['2025-10-24T12:00:00Z', '2025-10-28T12:00:00Z', berlin],
      ['2025-11-01T12:00:00Z', '2025-11-03T12:00:00Z', { timeZone: 'America/New_York', week: [null, null, null, null, null, null, { start: '00:00', end: '06:00' }] }],
      ['2025-03-09T00:00:00Z', '2025-03-10T00:00:00Z', { timeZone: 'America/New_York', week: [null, null, null, null, null, null, { start: '02:30', end: '04:00' }] }],
      ['2025-03-08T12:00:00Z', '2025-03-10T12:00:00Z', { timeZone: 'America/New_York', week: Array(7).fill({ start: '00:00', end: '24:00' }) }],
      ['2025-06-01T00:00:00Z', '2025-07-15T00:00:00Z', { timeZone: 'Asia/Kolkata', week: [nineToFive, nineToFive, null, nineToFive, nineToFive, { start: '10:00', end: '13:30' }, null] }],
    ]
    for (const [a, b, bh] of cases) {
      const [row] = await db().query<{ s: number }>('SELECT rw_working_seconds($1::timestamptz, $2::timestamptz, $3, $4::jsonb) AS s', {
        bind: [a, b, bh.timeZone, JSON.stringify(bh.week)], type: QueryTypes.SELECT,
      })
      expect(Number(row.s) * 1000, `${a} → ${b} in ${bh.timeZone}`).toBeCloseTo(workingMs(new Date(a), new Date(b), bh), 0)
    }
  })

  it('breaches use working hours: due times fall inside the working week', async () => {
    const body = (await sup.get(`/api/metrics/breaches?${byListener}`).expect(200)).body
    for (const r of body.rows) {
      const due = new Date(r.dueAt)
      const local = new Intl.DateTimeFormat('en-GB', { timeZone: 'Europe/Berlin', weekday: 'short', hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).format(due)
      expect(local).toMatch(/^(Mon|Tue|Wed|Thu|Fri) (09|1[0-7]):/)
      expect(workingMs(new Date(r.submittedAt), due, berlin)).toBeCloseTo(r.targetHours * 3_600_000, 0)
    }
  })
})

describe('PUT /api/metrics/targets', () => {
  it('answers 400 with field paths for an unknown time zone or a day that ends before it starts', async () => {
    const r = await sup
      .put('/api/metrics/targets', { firstResponseHours: 24, resolutionHours: 120, warnAtPercent: 75, businessHours: { timeZone: 'Mars/Olympus_Mons', week: [{ start: '17:00', end: '09:00' }, null, null, null, null, null, null] } })
      .expect(400)
    const paths = r.body.error.fields.map((f: { path: string }) => f.path)
    expect(paths).toContain('businessHours.timeZone')
    expect(paths).toContain('businessHours.week.0.end')
  })
  it('is written to the audit log with the values before and after', async () => {
    const { c, user } = await signedIn('supervisor')
    const before = (await c.get('/api/metrics/targets').expect(200)).body
    const after = (await c.put('/api/metrics/targets', { ...before, updatedAt: undefined, updatedBy: undefined }).expect(200)).body
    expect(after.updatedBy).toEqual({ id: user.id, name: user.name })
    const audit = (await c.get(`/api/audit?actorId=${user.id}&action=targets.changed`).expect(200)).body
    expect(audit.total).toBe(1)
    expect(audit.entries[0].details.after.firstResponseHours).toBe(before.firstResponseHours)
  })
})

describe('role guards on every metrics route', () => {
  const routes = ['status', 'queue', 'waiting', 'response-times', 'breaches', 'workload', 'reopen-rate', 'flags', 'satisfaction', 'targets']
  it.each(routes)('GET /api/metrics/%s: signed out 401, listener and advisor 403', async (r) => {
    await (await client()).get(`/api/metrics/${r}`).expect(401)
    await listener.get(`/api/metrics/${r}`).expect(403)
    await (await signedIn('advisor')).c.get(`/api/metrics/${r}`).expect(403)
  })
  it('PUT /api/metrics/targets: signed out 401, advisor 403', async () => {
    const body = { firstResponseHours: 1, resolutionHours: 2, warnAtPercent: 50, businessHours: null }
    await (await client()).put('/api/metrics/targets', body).expect(401)
    await (await signedIn('advisor')).c.put('/api/metrics/targets', body).expect(403)
  })
})
