import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { gzipSync } from 'node:zlib'
import { createServer, request as httpRequest } from 'node:http'
import type { AddressInfo } from 'node:net'
import { createRequire } from 'node:module'
import { randomUUID } from 'node:crypto'
import { QueryTypes } from 'sequelize'
import type { ZodType } from 'zod'
import type request from 'supertest'
import { db } from '../../server/db/sequelize'
import { stopJobs } from '../../server/jobs/queue'
import { closeTestApp, client, signedIn, testApp, type Client } from '../helpers/api'
import { openCase } from '../helpers/cases'
import { testRoom } from '../helpers/rooms'
import { loginSchema, registerSchema, updatePreferencesSchema } from '../../shared/schemas/auth'
import { roomSchema } from '../../shared/schemas/room'
import { createCaseSchema, messageSchema, updateCaseSchema } from '../../shared/schemas/case'
import { snippetSchema, snippetUpdateSchema } from '../../shared/schemas/snippet'
import { inviteSchema } from '../../shared/schemas/team'
import { queueQuerySchema, savedFilterSchema } from '../../shared/schemas/queue'
import { INBOUND_SECRET_HEADER } from '../../server/routes/mail'
import { config } from '../../server/config'
import { bodyNear, nasty } from '../unit/fuzz/bodies'
import { fcParams, fuzzTimeout } from '../unit/fuzz/helpers'

/**
 * Every JSON body schema through its real route: bodies near a valid one and bodies that are
 * anything at all. Each answer is a 2xx or a 4xx with `{ error: { code, message } }`, never a 500,
 * within seconds; a body the shared schema refuses is a 400; and a refused request leaves nothing
 * behind (the count of what a success would add is unchanged).
 */
const q = async <T extends object>(sql: string, bind: unknown[] = []) => db().query<T>(sql, { bind, type: QueryTypes.SELECT })
const count = async (sql: string, bind: unknown[]) => (await q<{ n: number }>(sql, bind))[0].n

let listener: { c: Client; user: { id: string; email: string; password: string } }
let advisor: { c: Client; user: { id: string } }
let supervisor: { c: Client; user: { id: string } }
let signedOut: Client
let caseId: string
let draftId: string
let roomId: string
let spareRoomId: string
let snippetId: string
let replyToken: string

beforeAll(async () => {
  listener = await signedIn('listener')
  advisor = await signedIn('advisor')
  supervisor = await signedIn('supervisor')
  signedOut = await client()
  const opened = await openCase(listener.c, { title: 'Fuzzed case with flutter echo' })
  caseId = opened.case.id
  roomId = opened.room.id
  draftId = (await openCase(listener.c, { submit: false, title: 'Fuzzed draft' })).case.id
  spareRoomId = (await listener.c.post('/api/rooms', testRoom({ name: 'Spare room for PUT' })).expect(201)).body.id
  snippetId = (await advisor.c.post('/api/snippets', { title: `Fuzz ${randomUUID()}`, body: 'Hello' }).expect(201)).body.id
  replyToken = (await q<{ reply_token: string }>('SELECT reply_token FROM cases WHERE id = $1', [caseId]))[0].reply_token
}, 60_000)
afterAll(async () => {
  await stopJobs()
  await closeTestApp()
})

interface Target {
  route: string
  as: () => Client
  schema?: ZodType
  valid: () => unknown
  /** what a success adds (or changes), read before and after each request */
  footprint?: (body: unknown) => Promise<unknown>
  /** the status of a success */
  ok: number[]
  runs?: number
  headers?: Record<string, string>
}

const emailOf = (b: unknown) => (b && typeof b === 'object' && typeof (b as { email?: unknown }).email === 'string' ? String((b as { email: string }).email).trim().toLowerCase() : null)
const invitationsFor = (b: unknown) => (emailOf(b) ? count('SELECT count(*)::int AS n FROM team_invitations WHERE lower(email) = $1', [emailOf(b)]) : Promise.resolve(0))
const usersWithEmail = (b: unknown) => (emailOf(b) ? count('SELECT count(*)::int AS n FROM users WHERE lower(email) = $1', [emailOf(b)]) : Promise.resolve(0))

const targets: Target[] = [
  { route: 'POST /api/auth/login', as: () => signedOut, schema: loginSchema, valid: () => ({ email: listener.user.email, password: listener.user.password }), ok: [200], runs: 40 },
  { route: 'POST /api/auth/register', as: () => signedOut, schema: registerSchema, valid: () => ({ email: `fuzz-${randomUUID().slice(0, 8)}@example.test`, password: 'long enough password', name: 'Fuzz Listener' }), footprint: usersWithEmail, ok: [201], runs: 40 },
  { route: 'POST /api/team/invitations', as: () => supervisor.c, schema: inviteSchema, valid: () => ({ email: `fuzz-staff-${randomUUID().slice(0, 8)}@example.test`, name: 'Fuzz Advisor', role: 'advisor' }), footprint: invitationsFor, ok: [201], runs: 40 },
  { route: 'PATCH /api/auth/preferences', as: () => listener.c, schema: updatePreferencesSchema, valid: () => ({ units: 'imperial', emailOptional: true }), footprint: () => q('SELECT units, email_optional FROM users WHERE id = $1', [listener.user.id]), ok: [200] },
  { route: 'POST /api/rooms', as: () => listener.c, schema: roomSchema, valid: () => testRoom(), footprint: () => count('SELECT count(*)::int AS n FROM rooms WHERE owner_id = $1', [listener.user.id]), ok: [201] },
  { route: 'POST /api/rooms/preview', as: () => listener.c, schema: roomSchema, valid: () => testRoom(), ok: [200] },
  { route: `PUT /api/rooms/:spare`, as: () => listener.c, schema: roomSchema, valid: () => testRoom({ name: 'Spare room, revised' }), footprint: () => q('SELECT current_revision FROM rooms WHERE id = $1', [spareRoomId]), ok: [200] },
  { route: 'POST /api/cases', as: () => listener.c, schema: createCaseSchema, valid: () => ({ roomId, title: 'Fuzzed new case', description: 'Bass swells', answers: { use: 'music', budget: 'not-sure' } }), footprint: () => count('SELECT count(*)::int AS n FROM cases WHERE listener_id = $1', [listener.user.id]), ok: [201] },
  {
    route: 'PATCH /api/cases/:draft', as: () => listener.c, schema: updateCaseSchema, valid: () => ({ title: 'A draft, retitled', description: 'More detail', answers: { seat: 'sofa' } }),
    footprint: async () => [await q('SELECT title, description, answers, status, room_id, assignee_id FROM cases WHERE id = $1', [draftId]), await count('SELECT count(*)::int AS n FROM case_events WHERE case_id = $1', [draftId])], ok: [200],
  },
  {
    route: 'PATCH /api/cases/:id', as: () => advisor.c, schema: updateCaseSchema, valid: () => ({ assigneeId: advisor.user.id, handoffNote: 'taking it' }),
    footprint: async () => [await q('SELECT title, status, assignee_id FROM cases WHERE id = $1', [caseId]), await count('SELECT count(*)::int AS n FROM case_events WHERE case_id = $1', [caseId])], ok: [200],
  },
  {
    route: 'POST /api/cases/:id/messages', as: () => advisor.c, schema: messageSchema, valid: () => ({ body: 'Try the **rug** first.', internal: false, ask: false, fileIds: [] }),
    footprint: async () => [await count('SELECT count(*)::int AS n FROM messages WHERE case_id = $1', [caseId]), await count('SELECT count(*)::int AS n FROM email_outbox WHERE case_id = $1', [caseId])], ok: [201],
  },
  { route: 'POST /api/snippets', as: () => advisor.c, schema: snippetSchema, valid: () => ({ title: `Fuzz snippet ${randomUUID().slice(0, 8)}`, body: 'Your room is {{room.dimensions}}' }), footprint: () => count('SELECT count(*)::int AS n FROM reply_snippets', []), ok: [201] },
  { route: 'PUT /api/snippets/:snippet', as: () => advisor.c, schema: snippetUpdateSchema, valid: () => ({ title: `Fuzz snippet ${randomUUID().slice(0, 8)}`, body: 'Edited' }), footprint: () => q('SELECT title, body FROM reply_snippets WHERE id = $1', [snippetId]), ok: [200] },
  { route: 'POST /api/saved-filters', as: () => advisor.c, schema: savedFilterSchema, valid: () => ({ name: `Fuzz ${randomUUID().slice(0, 8)}`, query: { scope: 'mine', status: ['in_review'], sort: 'waiting', dir: 'asc', pageSize: 50, q: 'bass' } }), footprint: () => count('SELECT count(*)::int AS n FROM saved_filters WHERE user_id = $1', [advisor.user.id]), ok: [201] },
  {
    route: 'POST /api/inbound/email', as: () => signedOut, headers: { [INBOUND_SECRET_HEADER]: config().INBOUND_EMAIL_SECRET },
    valid: () => ({ to: `reply+${replyToken}@${config().MAIL_REPLY_DOMAIN}`, from: listener.user.email, subject: 'Re: your case', text: 'We moved the sofa.' }),
    // a reply from a stranger's address is refused (403) but kept as a staff-only note for the advisor
    // (SECURITY.md, inbound e-mail): what must not change is what the thread shows as the listener's
    footprint: () => count('SELECT count(*)::int AS n FROM messages WHERE case_id = $1 AND NOT internal', [caseId]), ok: [201],
  },
]

const pathOf = (route: string) =>
  route.split(' ')[1].replace(':spare', spareRoomId).replace(':draft', draftId).replace(':snippet', snippetId).replace(':id', caseId)

function send(t: Target, text: string): request.Test {
  const [method] = t.route.split(' ')
  const c = t.as()
  let r = (c.agent as unknown as Record<string, (u: string) => request.Test>)[method.toLowerCase()](pathOf(t.route)).set('X-CSRF-Token', c.csrf).set('Content-Type', 'application/json')
  for (const [k, v] of Object.entries(t.headers ?? {})) r = r.set(k, v)
  return r.timeout({ response: 15_000 }).send(text)
}

function checkAnswer(res: request.Response, what: string) {
  expect(res.status, `${what}: ${res.text.slice(0, 200)}`).toBeLessThan(500)
  if (res.status >= 400) {
    expect(typeof res.body?.error?.code, `${what}: error code`).toBe('string')
    expect(typeof res.body?.error?.message, `${what}: error message`).toBe('string')
  }
}

describe('JSON bodies through the real routes', () => {
  it('covers every JSON body schema the routes validate', () => {
    const schemas = new Set(targets.map((t) => t.schema).filter(Boolean))
    for (const s of [loginSchema, registerSchema, inviteSchema, updatePreferencesSchema, roomSchema, createCaseSchema, updateCaseSchema, messageSchema, snippetSchema, savedFilterSchema]) expect(schemas.has(s)).toBe(true)
  })

  for (const t of targets) {
    it(`${t.route}: no 500, a 400 for whatever the schema refuses, nothing stored by a refused request`, async () => {
      // the valid body itself succeeds, so the properties below are about bodies near a working one
      const first = await send(t, JSON.stringify(t.valid()))
      expect(t.ok, `${t.route} with a valid body: ${first.text.slice(0, 200)}`).toContain(first.status)
      await fc.assert(
        fc.asyncProperty(fc.constant(null).chain(() => bodyNear(t.valid())), async (text) => {
          const parsed = JSON.parse(text) as unknown
          const before = await t.footprint?.(parsed)
          const res = await send(t, text)
          checkAnswer(res, `${t.route} ${text.slice(0, 160)}`)
          if (t.schema && !t.schema.safeParse(parsed).success) expect(res.status, `${t.route}: schema refuses ${text.slice(0, 160)}`).toBe(400)
          if (res.status === 400 && res.body.error.code === 'invalid') expect(Array.isArray(res.body.error.fields) || typeof res.body.error.message === 'string').toBe(true)
          if (t.footprint && !t.ok.includes(res.status)) expect(await t.footprint(parsed), `${t.route}: a refused request changed stored state (${res.status})`).toEqual(before)
        }),
        fcParams(t.runs ?? 100),
      )
    }, fuzzTimeout(120_000))
  }
})

describe('query strings and raw bodies', () => {
  it('GET /api/cases (the queue) with arbitrary query parameters: 200 or 400, never 500; a 400 only for what the schema refuses', async () => {
    const key = fc.constantFrom('scope', 'status', 'flag', 'waitingHours', 'q', 'sort', 'dir', 'page', 'pageSize', 'junk', '__proto__', 'status[]')
    const value = fc.oneof(fc.string({ maxLength: 40 }), fc.constantFrom('all', 'mine', 'in_review,closed', 'priority', 'asc', '-1', '1e9', '0', 'NaN', "' OR 1=1 --", 'bass & (boom | "flutter echo")', '!!!', ':*', '<->', 'x'.repeat(300)))
    await fc.assert(
      fc.asyncProperty(fc.dictionary(key, value, { maxKeys: 5 }), async (params) => {
        const res = await advisor.c.get('/api/cases').query(params).timeout({ response: 15_000 })
        checkAnswer(res, `GET /api/cases ${JSON.stringify(params)}`)
        const parsed = queueQuerySchema.safeParse({ ...params })
        if (res.status === 400) expect(parsed.success, `400 for a query the schema accepts: ${JSON.stringify(params)}`).toBe(false)
        if (!parsed.success && !('__proto__' in params) && !('status[]' in params)) expect(res.status).toBe(400)
      }),
      fcParams(150),
    )
  }, fuzzTimeout(120_000))
  it('GET with arbitrary ids and query values in the path: never 500', async () => {
    const id = fc.oneof(fc.uuid(), fc.string({ maxLength: 60 }), fc.constantFrom('..%2f..%2fetc%2fpasswd', '%00', '00000000-0000-0000-0000-000000000000', "1' OR '1'='1", 'a'.repeat(5000)))
    const route = fc.constantFrom('/api/cases/$', '/api/cases/$/triage', '/api/cases/$/events?after=$', '/api/cases/$/messages', '/api/cases/$/files', '/api/rooms/$?revision=$', '/api/files/$', '/api/files/$/thumbnail', '/api/snippets/for-case/$')
    await fc.assert(
      fc.asyncProperty(route, id, async (r, x) => {
        const res = await advisor.c.get(r.replace(/\$/g, encodeURIComponent(x))).timeout({ response: 15_000 })
        checkAnswer(res, `${r} ${x.slice(0, 60)}`)
      }),
      fcParams(150),
    )
  }, fuzzTimeout(120_000))
  it('raw bytes sent as JSON get 400 invalid_json (or 413), never 500', async () => {
    const bytes = fc.oneof(fc.uint8Array({ maxLength: 2000 }).map((u) => Buffer.from(u)), fc.string({ maxLength: 200 }).map((s) => Buffer.from(`{"body": ${s}`)))
    await fc.assert(
      fc.asyncProperty(bytes, fc.constantFrom('/api/rooms', '/api/cases', `/api/cases/$/messages`, '/api/auth/login'), async (b, path) => {
        const res = await listener.c.agent.post(path.replace('$', caseId)).set('X-CSRF-Token', listener.c.csrf).set('Content-Type', 'application/json').send(b).timeout({ response: 15_000 })
        checkAnswer(res, `${path} ${b.subarray(0, 40).toString('hex')}`)
      }),
      fcParams(150),
    )
  }, fuzzTimeout(120_000))
  /** A raw HTTP POST (supertest re-encodes compressed bodies), against the in-process app on a loopback port. */
  async function rawPost(path: string, body: Buffer, headers: Record<string, string>): Promise<{ status: number; body: { error?: { code: string; message: string } } }> {
    const srv = createServer(testApp()).listen(0, '127.0.0.1')
    await new Promise((r) => srv.once('listening', r))
    try {
      const port = (srv.address() as AddressInfo).port
      const cookie = (listener.c.agent as unknown as { jar: { getCookies: (o: object) => { toValueString: () => string } } }).jar
        .getCookies(createRequire(import.meta.url)('cookiejar').CookieAccessInfo.All).toValueString()
      return await new Promise((resolve, reject) => {
        const req = httpRequest({ host: '127.0.0.1', port, method: 'POST', path, headers: { 'content-type': 'application/json', 'content-length': body.length, 'x-csrf-token': listener.c.csrf, cookie, ...headers } }, (res) => {
          let text = ''
          res.on('data', (d) => (text += d))
          res.on('end', () => resolve({ status: res.statusCode ?? 0, body: text ? JSON.parse(text) : {} }))
        })
        req.on('error', reject)
        req.end(body)
      })
    } finally {
      srv.close()
    }
  }
  it('a body past 1 MB answers 413; a gzip bomb (200 MB unpacked from about 200 kB) answers 413 without unpacking it all', async () => {
    const big = Buffer.from(JSON.stringify({ body: 'x'.repeat(1_100_000) }))
    expect(await rawPost(`/api/cases/${caseId}/messages`, big, {})).toMatchObject({ status: 413, body: { error: { code: 'too_large' } } })
    const bomb = gzipSync(Buffer.concat([Buffer.from('{"body":"'), Buffer.alloc(200 * 1024 * 1024, 0x61), Buffer.from('"}')]), { level: 9 })
    expect(bomb.length).toBeLessThan(300_000)
    const rss = process.memoryUsage().rss
    const t0 = Date.now()
    expect(await rawPost(`/api/cases/${caseId}/messages`, bomb, { 'content-encoding': 'gzip' })).toMatchObject({ status: 413, body: { error: { code: 'too_large' } } })
    expect(Date.now() - t0).toBeLessThan(5_000)
    expect(process.memoryUsage().rss - rss).toBeLessThan(150 * 1024 * 1024)
    // and a small gzip body is read as usual
    expect((await rawPost(`/api/cases/${caseId}/messages`, gzipSync(JSON.stringify({ body: 'Compressed hello' })), { 'content-encoding': 'gzip' })).status).toBe(201)
  }, 60_000)
  it('a body that claims gzip but is not, answers 400; an unknown Content-Encoding answers 415 (not 500)', async () => {
    const before = await count('SELECT count(*)::int AS n FROM messages WHERE case_id = $1', [caseId])
    const bad = await rawPost(`/api/cases/${caseId}/messages`, Buffer.from('{"body":"not compressed"}'), { 'content-encoding': 'gzip' })
    expect(bad.status).toBe(400)
    expect(bad.body.error?.code).toBe('unreadable_body')
    const unknown = await rawPost(`/api/cases/${caseId}/messages`, Buffer.from('{"body":"x"}'), { 'content-encoding': 'x-roomwright-squeeze' })
    expect(unknown.status).toBe(415)
    expect(unknown.body.error?.code).toBe('unsupported_encoding')
    expect(await count('SELECT count(*)::int AS n FROM messages WHERE case_id = $1', [caseId])).toBe(before)
  })
  it('a JSON body with a __proto__ key does not pollute prototypes or change who owns what', async () => {
    const text = `{"__proto__":{"role":"supervisor","polluted":true},"constructor":{"prototype":{"polluted":true}},"roomId":"${roomId}","title":"Proto case","listenerId":"${advisor.user.id}"}`
    const res = await listener.c.agent.post('/api/cases').set('X-CSRF-Token', listener.c.csrf).set('Content-Type', 'application/json').send(text)
    expect(res.status).toBe(201)
    expect(({} as Record<string, unknown>).polluted).toBeUndefined()
    expect((await q<{ listener_id: string }>('SELECT listener_id FROM cases WHERE id = $1', [res.body.id]))[0].listener_id).toBe(listener.user.id)
    expect((await listener.c.get('/api/auth/me').expect(200)).body.role).toBe('listener')
  })
  it('a nasty value is not echoed back as HTML: error answers are JSON', async () => {
    const sample = fc.sample(nasty, 20)
    for (const v of sample) {
      const res = await listener.c.post('/api/rooms', { name: v })
      expect(res.headers['content-type']).toMatch(/application\/json/)
    }
  })
})

