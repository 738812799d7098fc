import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { QueryTypes } from 'sequelize'
import { db } from '../../server/db/sequelize'
import { client, closeTestApp, signedIn, type Client } from '../helpers/api'
import { openCase } from '../helpers/cases'
import { pdfPageCount, pdfText } from '../unit/plan/pdf-text'

afterAll(closeTestApp)

const q = <T extends object>(sql: string, bind: unknown[] = []) => db().query<T>(sql, { bind, type: QueryTypes.SELECT })
const binary = (res: NodeJS.ReadableStream, cb: (err: Error | null, body: Buffer) => void) => {
  const chunks: Buffer[] = []
  res.on('data', (c: Buffer) => chunks.push(c))
  res.on('end', () => cb(null, Buffer.concat(chunks)))
}
const getPdf = (c: Client, url: string) => c.agent.get(url).buffer(true).parse(binary as never)

/** A plan for the test room of tests/helpers/rooms.ts (5.8 × 4.1 × 2.5 m). */
const planBody = (over: Record<string, unknown> = {}) => ({
  seat: { x: 3.45, y: 2.05, z: 1.1 },
  seatNote: 'Pull the sofa 15 cm towards the speakers.',
  treatments: [
    { id: 'side-left', type: 'panel', surface: 'left', materialId: 'mineral-wool-50mm-16kg', thickness: 0.05, width: 0.6, height: 0.6, x: 1.9, y: 0, z: 1.05 },
    { id: 'back-trap', type: 'bass-trap', surface: 'back', thickness: 0.15, width: 2.0, height: 1.2, x: 5.8, y: 2.05, z: 1.1 },
  ],
  notes: 'Start with the **back wall**; the rest follows.',
  ...over,
})

interface World { listener: Awaited<ReturnType<typeof signedIn>>; stranger: Awaited<ReturnType<typeof signedIn>>; advisor: Awaited<ReturnType<typeof signedIn>>; supervisor: Awaited<ReturnType<typeof signedIn>>; out: Client; caseId: string }

async function world(): Promise<World> {
  const listener = await signedIn('listener')
  const [stranger, advisor, supervisor, out] = await Promise.all([signedIn('listener'), signedIn('advisor'), signedIn('supervisor'), client()])
  const { case: c } = await openCase(listener.c, { title: 'Plans: boom at 49 Hz by the bay window' })
  await advisor.c.patch(`/api/cases/${c.id}`, { status: 'in_review', fromStatus: 'submitted' }).expect(200)
  return { listener, stranger, advisor, supervisor, out, caseId: c.id }
}

describe('POST /api/cases/:id/plans — saving versions', () => {
  let w: World
  beforeAll(async () => { w = await world() })

  it('an advisor saves numbered draft versions with the engine’s predictions stored beside them', async () => {
    const v1 = (await w.advisor.c.post(`/api/cases/${w.caseId}/plans`, planBody()).expect(201)).body
    expect(v1).toMatchObject({ caseId: w.caseId, version: 1, status: 'draft', roomRevision: 1, sentAt: null, createdBy: { id: w.advisor.user.id } })
    expect(v1.predictions.changes.map((c: { id: string }) => c.id).sort()).toEqual(['back-trap', 'seat', 'side-left'])
    expect(v1.predictions.order).toHaveLength(3)
    expect(v1.predictions.reverberation.bands.length).toBeGreaterThan(4)
    expect(v1.predictions.after.rtMidS).toBeLessThan(v1.predictions.before.rtMidS)
    const v2 = (await w.supervisor.c.post(`/api/cases/${w.caseId}/plans`, planBody({ order: ['side-left'] })).expect(201)).body
    expect(v2.version).toBe(2)
    expect(v2.predictions.order[0]).toBe('side-left')
    const list = (await w.advisor.c.get(`/api/cases/${w.caseId}/plans`).expect(200)).body.plans
    expect(list.map((p: { version: number; current: boolean; status: string }) => [p.version, p.current, p.status])).toEqual([[2, true, 'draft'], [1, false, 'draft']])
  })
  it('the listener sees no drafts: an empty list and 404 for a draft version and its PDF', async () => {
    expect((await w.listener.c.get(`/api/cases/${w.caseId}/plans`).expect(200)).body.plans).toEqual([])
    await w.listener.c.get(`/api/cases/${w.caseId}/plans/1`).expect(404)
    await w.listener.c.get(`/api/cases/${w.caseId}/plans/1/report.pdf`).expect(404)
  })
  it('answers 400 with the field path for a treatment outside the room, an unknown material or an order naming no change', async () => {
    const outside = await w.advisor.c.post(`/api/cases/${w.caseId}/plans`, planBody({ treatments: [{ id: 'far', type: 'panel', surface: 'back', thickness: 0.05, width: 1, height: 1, x: 7.3, y: 2, z: 1 }] })).expect(400)
    expect(outside.body.error.fields).toContainEqual({ path: 'treatments.0.x', message: 'x = 7.3 m lies beyond the length 5.8 m' })
    const material = await w.advisor.c.post(`/api/cases/${w.caseId}/plans`, planBody({ treatments: [{ id: 'm', type: 'panel', surface: 'left', materialId: 'unobtainium-felt', thickness: 0.05, width: 1, height: 1, x: 2, y: 0, z: 1 }] })).expect(400)
    expect(material.body.error.fields).toContainEqual({ path: 'treatments.0.materialId', message: 'unknown material "unobtainium-felt"' })
    const order = await w.advisor.c.post(`/api/cases/${w.caseId}/plans`, planBody({ order: ['curtains-later'] })).expect(400)
    expect(order.body.error.fields[0].path).toBe('order.0')
    const speaker = await w.advisor.c.post(`/api/cases/${w.caseId}/plans`, planBody({ speakers: [{ label: 'Centre', x: 1, y: 2, z: 1 }] })).expect(400)
    expect(speaker.body.error.fields[0]).toEqual({ path: 'speakers.0.label', message: 'the room has no speaker "Centre"' })
    const schema = await w.advisor.c.post(`/api/cases/${w.caseId}/plans`, planBody({ treatments: [{ id: 'w', type: 'panel', surface: 'left', thickness: 0.05, width: -1, height: 1, x: 2, y: 0, z: 1 }] })).expect(400)
    expect(schema.body.error.fields[0].path).toBe('treatments.0.width')
    expect((await w.advisor.c.get(`/api/cases/${w.caseId}/plans`)).body.plans).toHaveLength(2)
  })
  it('a saved version cannot be changed, even directly in the database', async () => {
    await expect(db().query(`UPDATE treatment_plans SET body = '{}' WHERE case_id = $1 AND version = 1`, { bind: [w.caseId] })).rejects.toThrow(/cannot be changed/)
  })
})

describe('POST /api/cases/:id/plans/:version/send', () => {
  it('moves the case to plan sent through the lifecycle, queues the plan-sent e-mail and shows the version to the listener', async () => {
    const w = await world()
    await w.advisor.c.post(`/api/cases/${w.caseId}/plans`, planBody()).expect(201)
    const sent = (await w.advisor.c.post(`/api/cases/${w.caseId}/plans/1/send`, { fromStatus: 'in_review', message: 'Here is what I would do first.' }).expect(200)).body
    expect(sent).toMatchObject({ version: 1, status: 'sent', sentBy: { id: w.advisor.user.id } })
    expect((await w.listener.c.get(`/api/cases/${w.caseId}`)).body.status).toBe('plan_sent')
    const mails = await q<{ kind: string; to_user_id: string; text: string; subject: string }>('SELECT kind, to_user_id, text, subject FROM email_outbox WHERE case_id = $1 AND kind = $2', [w.caseId, 'plan-sent'])
    expect(mails).toHaveLength(1)
    expect(mails[0].to_user_id).toBe(w.listener.user.id)
    expect(mails[0].subject).toContain('Plans: boom at 49 Hz by the bay window')
    expect(mails[0].text).toContain('Here is what I would do first.')
    expect(mails[0].text).toContain(w.advisor.user.name)
    for (const c of sent.predictions.changes) expect(mails[0].text).toContain(c.title)
    const events = (await w.advisor.c.get(`/api/cases/${w.caseId}/events`)).body.events as { kind: string; fromStatus: string | null; toStatus: string | null; data: { version?: number } }[]
    expect(events.some((e) => e.kind === 'status' && e.fromStatus === 'in_review' && e.toStatus === 'plan_sent')).toBe(true)
    expect(events.find((e) => e.kind === 'plan-sent')?.data.version).toBe(1)
    const list = (await w.listener.c.get(`/api/cases/${w.caseId}/plans`).expect(200)).body.plans
    expect(list).toMatchObject([{ version: 1, status: 'sent', current: true }])
    const got = (await w.listener.c.get(`/api/cases/${w.caseId}/plans/1`).expect(200)).body
    expect(got.room).toMatchObject({ length: 5.8, width: 4.1, height: 2.5 })
    expect(got.body.notes).toBe('Start with the **back wall**; the rest follows.')
  })
  it('answers 409 for a stale status and changes nothing', async () => {
    const w = await world()
    await w.advisor.c.post(`/api/cases/${w.caseId}/plans`, planBody()).expect(201)
    const res = await w.advisor.c.post(`/api/cases/${w.caseId}/plans/1/send`, { fromStatus: 'waiting_on_listener' }).expect(409)
    expect(res.body.error.code).toBe('stale')
    expect((await w.advisor.c.get(`/api/cases/${w.caseId}`)).body.status).toBe('in_review')
    expect((await w.advisor.c.get(`/api/cases/${w.caseId}/plans/1`)).body.status).toBe('draft')
    expect(await q('SELECT 1 FROM email_outbox WHERE case_id = $1 AND kind = $2', [w.caseId, 'plan-sent'])).toHaveLength(0)
  })
  it('a revision sent while the plan is out keeps "plan sent"; an older or already-sent version answers 409; the listener sees both sent versions', async () => {
    const w = await world()
    await w.advisor.c.post(`/api/cases/${w.caseId}/plans`, planBody()).expect(201)
    await w.advisor.c.post(`/api/cases/${w.caseId}/plans/1/send`, { fromStatus: 'in_review' }).expect(200)
    expect((await w.advisor.c.post(`/api/cases/${w.caseId}/plans/1/send`, { fromStatus: 'plan_sent' }).expect(409)).body.error.code).toBe('already_sent')
    await w.advisor.c.post(`/api/cases/${w.caseId}/plans`, planBody({ treatments: [] })).expect(201)
    await w.advisor.c.post(`/api/cases/${w.caseId}/plans`, planBody({ seat: null })).expect(201)
    expect((await w.advisor.c.post(`/api/cases/${w.caseId}/plans/2/send`, { fromStatus: 'plan_sent' }).expect(409)).body.error.code).toBe('superseded')
    await w.supervisor.c.post(`/api/cases/${w.caseId}/plans/3/send`, { fromStatus: 'plan_sent' }).expect(200)
    expect((await w.listener.c.get(`/api/cases/${w.caseId}`)).body.status).toBe('plan_sent')
    expect(await q('SELECT 1 FROM email_outbox WHERE case_id = $1 AND kind = $2', [w.caseId, 'plan-sent'])).toHaveLength(2)
    const list = (await w.listener.c.get(`/api/cases/${w.caseId}/plans`)).body.plans
    expect(list.map((p: { version: number; current: boolean }) => [p.version, p.current])).toEqual([[3, true], [1, false]])
    await w.listener.c.get(`/api/cases/${w.caseId}/plans/2`).expect(404)
  })
  it('a closed case takes no new plan version (409)', async () => {
    const w = await world()
    await w.advisor.c.patch(`/api/cases/${w.caseId}`, { status: 'closed', fromStatus: 'in_review' }).expect(200)
    expect((await w.advisor.c.post(`/api/cases/${w.caseId}/plans`, planBody()).expect(409)).body.error.code).toBe('closed')
  })
})

describe('GET /api/cases/:id/plans/:version/report.pdf', () => {
  it('renders the sent plan as a PDF for the listener, with the drawings’ dimensions and the cautions', async () => {
    const w = await world()
    await w.advisor.c.post(`/api/cases/${w.caseId}/plans`, planBody()).expect(201)
    await w.advisor.c.post(`/api/cases/${w.caseId}/plans/1/send`, { fromStatus: 'in_review' }).expect(200)
    const res = await getPdf(w.listener.c, `/api/cases/${w.caseId}/plans/1/report.pdf`).expect(200)
    expect(res.headers['content-type']).toBe('application/pdf')
    expect(res.headers['content-disposition']).toContain('roomwright-plan-v1.pdf')
    const pdf = res.body as Buffer
    expect(pdfPageCount(pdf)).toBeGreaterThanOrEqual(5)
    const text = pdfText(pdf).replace(/\s+/g, ' ')
    expect(text).toContain('Plans: boom at 49 Hz by the bay window')
    expect(text).toContain('left wall: near edge 1.60 m from the front corner, far edge 3.60 m from the back corner; bottom 0.75 m above the floor')
    expect(text).toContain('materials table: Glass or rock wool 50 mm, 16 kg/m³')
    expect(text).toContain('fixings rated for the load')
  })
})

describe('POST /api/plans/preview', () => {
  it('gives staff the predictions, snap targets and setup suggestions for an unsaved plan without storing it', async () => {
    const w = await world()
    const res = (await w.advisor.c.post('/api/plans/preview', { caseId: w.caseId, plan: planBody() }).expect(200)).body
    expect(res.roomRevision).toBe(1)
    expect(res.predictions.changes).toHaveLength(3)
    expect(res.snapTargets.filter((t: { kind: string }) => t.kind === 'corner')).toHaveLength(4)
    expect(res.snapTargets.find((t: { id: string }) => t.id === 'mirror-L-left').reason).toMatch(/First reflection of speaker L off the left wall/)
    expect(res.suggestions.seat38.x).toBeCloseTo(0.38 * 5.8, 2)
    expect((await w.advisor.c.get(`/api/cases/${w.caseId}/plans`)).body.plans).toEqual([])
    const bad = await w.advisor.c.post('/api/plans/preview', { caseId: w.caseId, plan: planBody({ seat: { x: 9, y: 1, z: 1 } }) }).expect(400)
    expect(bad.body.error.fields[0].path).toBe('seat.x')
  })
})

describe('plan routes — guards for every role', () => {
  let w: World
  let draftCaseId: string
  beforeAll(async () => {
    w = await world()
    await w.advisor.c.post(`/api/cases/${w.caseId}/plans`, planBody()).expect(201)
    await w.advisor.c.post(`/api/cases/${w.caseId}/plans/1/send`, { fromStatus: 'in_review' }).expect(200)
    await w.advisor.c.post(`/api/cases/${w.caseId}/plans`, planBody({ treatments: [] })).expect(201)
    draftCaseId = (await openCase(w.listener.c, { submit: false })).case.id
  })
  type Who = 'out' | 'owner' | 'stranger' | 'advisor' | 'supervisor'
  const as = (who: Who): Client => (who === 'out' ? w.out : who === 'owner' ? w.listener.c : who === 'stranger' ? w.stranger.c : who === 'advisor' ? w.advisor.c : w.supervisor.c)
  const cases: { name: string; call: (c: Client) => Promise<{ status: number }>; expect: Record<Who, number> }[] = [
    { name: 'GET /api/cases/:id/plans', call: (c) => c.get(`/api/cases/${w.caseId}/plans`), expect: { out: 401, owner: 200, stranger: 404, advisor: 200, supervisor: 200 } },
    { name: 'GET /api/cases/:id/plans (a draft case)', call: (c) => c.get(`/api/cases/${draftCaseId}/plans`), expect: { out: 401, owner: 200, stranger: 404, advisor: 404, supervisor: 404 } },
    { name: 'GET /api/cases/:id/plans/:version (sent)', call: (c) => c.get(`/api/cases/${w.caseId}/plans/1`), expect: { out: 401, owner: 200, stranger: 404, advisor: 200, supervisor: 200 } },
    { name: 'GET /api/cases/:id/plans/:version (draft)', call: (c) => c.get(`/api/cases/${w.caseId}/plans/2`), expect: { out: 401, owner: 404, stranger: 404, advisor: 200, supervisor: 200 } },
    { name: 'GET /api/cases/:id/plans/:version (missing)', call: (c) => c.get(`/api/cases/${w.caseId}/plans/77`), expect: { out: 401, owner: 404, stranger: 404, advisor: 404, supervisor: 404 } },
    { name: 'GET /api/cases/:id/plans/:version/report.pdf (sent)', call: (c) => getPdf(c, `/api/cases/${w.caseId}/plans/1/report.pdf`), expect: { out: 401, owner: 200, stranger: 404, advisor: 200, supervisor: 200 } },
    { name: 'GET /api/cases/:id/plans/:version/report.pdf (draft)', call: (c) => getPdf(c, `/api/cases/${w.caseId}/plans/2/report.pdf`), expect: { out: 401, owner: 404, stranger: 404, advisor: 200, supervisor: 200 } },
    { name: 'POST /api/cases/:id/plans', call: (c) => c.post(`/api/cases/${w.caseId}/plans`, planBody({ treatments: [] })), expect: { out: 401, owner: 403, stranger: 403, advisor: 201, supervisor: 201 } },
    { name: 'POST /api/cases/:id/plans (a draft case)', call: (c) => c.post(`/api/cases/${draftCaseId}/plans`, planBody()), expect: { out: 401, owner: 403, stranger: 403, advisor: 404, supervisor: 404 } },
    { name: 'POST /api/cases/:id/plans/:version/send (stale status)', call: (c) => c.post(`/api/cases/${w.caseId}/plans/2/send`, { fromStatus: 'in_review' }), expect: { out: 401, owner: 403, stranger: 403, advisor: 409, supervisor: 409 } },
    { name: 'POST /api/plans/preview', call: (c) => c.post('/api/plans/preview', { caseId: w.caseId, plan: planBody({ treatments: [] }) }), expect: { out: 401, owner: 403, stranger: 403, advisor: 200, supervisor: 200 } },
    { name: 'POST /api/plans/preview (a draft case)', call: (c) => c.post('/api/plans/preview', { caseId: draftCaseId, plan: planBody() }), expect: { out: 401, owner: 403, stranger: 403, advisor: 404, supervisor: 404 } },
  ]
  for (const k of cases) {
    it(`${k.name} — out ${k.expect.out}, owner ${k.expect.owner}, other listener ${k.expect.stranger}, advisor ${k.expect.advisor}, supervisor ${k.expect.supervisor}`, async () => {
      for (const who of ['out', 'owner', 'stranger', 'advisor', 'supervisor'] as const) {
        const res = await k.call(as(who))
        expect(res.status, `${who} on ${k.name}`).toBe(k.expect[who])
      }
    })
  }
  it('a version number that is not a positive integer answers 400', async () => {
    const res = await w.advisor.c.get(`/api/cases/${w.caseId}/plans/first`).expect(400)
    expect(res.body.error.fields[0].path).toBe('version')
  })
})
