import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import request from 'supertest'
import { QueryTypes } from 'sequelize'
import type { Express } from 'express'
import type { Socket } from 'socket.io-client'
import { config, setConfigForTests } from '../../server/config'
import { startServer, type RunningServer } from '../../server/server'
import { createApp, type BuiltApp } from '../../server/app'
import { sockets } from '../../server/sockets'
import { stopJobs } from '../../server/jobs/queue'
import { db } from '../../server/db/sequelize'
import { makeUser } from '../helpers/api'
import { connectSocket, emitAck, nextEvent } from '../helpers/sockets'
import { png, responseText } from '../unit/uploads/make-files'
import { WHO, routeEntries, socketEntries, type Scenario, type Who, type World } from './access-matrix.entries'

let server: RunningServer
const base = config()

interface Caller {
  who: Who
  user: { id: string; email: string; password: string } | null
  agent: ReturnType<typeof request.agent>
  csrf: string
  cookie: string
}
const callers = {} as Record<Who, Caller>
const users = {} as Record<Exclude<Who, 'out'>, { id: string; email: string; password: string; name: string }>

async function newCaller(who: Who): Promise<Caller> {
  const agent = request.agent(server.url)
  const { body, headers } = await agent.get('/api/auth/csrf').expect(200)
  let cookie = String(headers['set-cookie'] ?? '').split(';')[0]
  const user = who === 'out' ? null : users[who]
  if (user) {
    const res = await agent.post('/api/auth/login').set('X-CSRF-Token', body.token).send({ email: user.email, password: user.password }).expect(200)
    cookie = String(res.headers['set-cookie']).split(';')[0]
  }
  return { who, user, agent, csrf: body.token, cookie }
}

let PHOTO: Buffer
const MEASUREMENT = responseText(60)

function upload(c: Caller, path: string, kind: 'photo' | 'measurement') {
  return c.agent.post(path).set('X-CSRF-Token', c.csrf).attach('file', kind === 'photo' ? PHOTO : MEASUREMENT, kind === 'photo' ? 'plan.png' : 'response.txt')
}

/** One world of fixtures, made through the API as the product's users would. */
async function makeWorld(): Promise<World> {
  const o = callers.owner
  const post = (c: Caller, url: string, body: unknown, status: number) => c.agent.post(url).set('X-CSRF-Token', c.csrf).send(body as object).expect(status)
  const r = (await post(o, '/api/rooms', (routeEntries['POST /api/rooms'][0].body as () => unknown)(), 201)).body
  const c = (await post(o, '/api/cases', { roomId: r.id, title: 'World case: boom at 41 Hz' }, 201)).body
  await o.agent.patch(`/api/cases/${c.id}`).set('X-CSRF-Token', o.csrf).send({ status: 'submitted', fromStatus: 'draft' }).expect(200)
  const dr = (await post(o, '/api/rooms', { ...(routeEntries['POST /api/rooms'][0].body as () => object)(), name: 'Draft-only room' }, 201)).body
  const d = (await post(o, '/api/cases', { roomId: dr.id, title: 'World draft' }, 201)).body
  const photo = (await upload(o, `/api/cases/${c.id}/files`, 'photo').expect(201)).body
  const measurement = (await upload(o, `/api/cases/${c.id}/files`, 'measurement').expect(201)).body
  const noteFileName = `note-attachment-${c.id.slice(0, 8)}.png`
  const noteFile = (await callers.advisor.agent.post(`/api/cases/${c.id}/files`).set('X-CSRF-Token', callers.advisor.csrf).attach('file', PHOTO, noteFileName).expect(201)).body
  await post(callers.advisor, `/api/cases/${c.id}/messages`, { body: 'Team only: compare with the 41 Hz photo', internal: true, fileIds: [noteFile.id] }, 201)
  const snippet = (await post(callers.advisor, '/api/snippets', { title: `World snippet ${c.id.slice(0, 8)}`, body: 'Hello {{listener.name}}', scope: 'team' }, 201)).body
  const personal = (await post(callers.advisor, '/api/snippets', { title: `World own snippet ${c.id.slice(0, 8)}`, body: 'My own words, {{listener.name}}' }, 201)).body
  const filter = (await post(callers.advisor, '/api/saved-filters', { name: `World ${c.id.slice(0, 8)}`, query: { scope: 'unassigned' } }, 201)).body
  const [{ reply_token }] = await db().query<{ reply_token: string }>('SELECT reply_token FROM cases WHERE id = $1', { bind: [c.id], type: QueryTypes.SELECT })
  return {
    roomId: r.id, draftRoomId: dr.id, caseId: c.id, draftId: d.id, photoId: photo.id, measurementId: measurement.id, noteFileId: noteFile.id, noteFileName,
    snippetId: snippet.id, personalSnippetId: personal.id, filterId: filter.id, owner: { email: users.owner.email, password: users.owner.password }, replyToken: reply_token,
  }
}

/** Every route of the real app: `METHOD /path` as declared, walked from the Express router stack. */
function enumerateRoutes(app: Express): string[] {
  const out = new Set<string>()
  type Layer = { rawPath?: unknown; route?: { path: string; methods: Record<string, boolean> }; handle?: { stack?: Layer[] } }
  const walk = (stack: Layer[], prefix: string) => {
    for (const layer of stack) {
      const raw = typeof layer.rawPath === 'string' ? layer.rawPath : ''
      if (layer.route) {
        const full = (prefix + (layer.route.path === '/' ? '' : layer.route.path)) || '/'
        for (const [m, on] of Object.entries(layer.route.methods)) if (on && m !== '_all') out.add(`${m.toUpperCase()} ${full}`)
      } else if (layer.handle?.stack) {
        walk(layer.handle.stack, prefix + (raw === '/' ? '' : raw))
      }
    }
  }
  walk((app as unknown as { router: { stack: Layer[] } }).router.stack, '')
  return [...out].filter((r) => r.split(' ')[1].startsWith('/api/')).sort()
}

let shared: World
/** The app as createApp builds it for the server (socket.io wraps the server's own request listener). */
let built: BuiltApp
beforeAll(async () => {
  setConfigForTests({ ...base, FAKE_SMTP: 'on' })
  PHOTO = await png(48, 32)
  built = createApp({ clientDir: false })
  server = await startServer({ port: 0, clientDir: false, background: false })
  for (const who of ['owner', 'other', 'advisor', 'supervisor'] as const) {
    users[who] = await makeUser(who === 'owner' || who === 'other' ? 'listener' : who, `Matrix ${who}`)
  }
  for (const who of WHO) callers[who] = await newCaller(who)
  shared = await makeWorld()
}, 120_000)
afterAll(async () => {
  await built?.close()
  await server?.close()
  await stopJobs()
  setConfigForTests(base)
})

async function call(c: Caller, s: Scenario, w: World, method: string) {
  const url = s.path(w)
  let req = (c.agent as unknown as Record<string, (u: string) => request.Test>)[method.toLowerCase()](url)
  if (method !== 'GET') req = req.set('X-CSRF-Token', c.csrf)
  for (const [k, v] of Object.entries(s.headers?.(w) ?? {})) req = req.set(k, v)
  if (s.upload) return upload(c, url, s.upload)
  if (s.body) return req.send(s.body(w, c.who, c.user) as object)
  return req
}

describe('the access matrix covers the whole API', () => {
  it('every route of the real Express router has an entry, and every entry a route', () => {
    const app = built.app
    const routes = enumerateRoutes(app)
    expect(routes.length).toBeGreaterThan(30)
    expect(routes.filter((r) => !routeEntries[r]), 'routes without an entry in access-matrix.entries.ts').toEqual([])
    expect(Object.keys(routeEntries).filter((k) => !routes.includes(k)), 'entries for routes that no longer exist').toEqual([])
  })
  it('every socket event the server handles has an entry, and every entry an event', async () => {
    const s = await connectSocket(server.url, callers.advisor.cookie)
    try {
      const serverSide = [...sockets()!.of('/').sockets.values()].find((x) => x.data.user?.id === users.advisor.id)!
      const events = serverSide.eventNames().map(String).filter((e) => !['disconnect', 'disconnecting', 'error'].includes(e)).sort()
      expect(events.length).toBeGreaterThan(0)
      expect(events.filter((e) => !socketEntries[e]), 'socket events without an entry').toEqual([])
      expect(Object.keys(socketEntries).filter((k) => !events.includes(k)), 'entries for socket events that no longer exist').toEqual([])
    } finally {
      s.disconnect()
    }
  })
})

describe('HTTP routes × callers', () => {
  for (const [key, scenarios] of Object.entries(routeEntries)) {
    const method = key.split(' ')[0]
    for (const s of scenarios) {
      it(`${key}${s.note ? ` (${s.note})` : ''} answers ${WHO.map((w) => `${w} ${s.expect[w]}`).join(', ')}`, async () => {
        const got = {} as Record<Who, number>
        const shapes: string[] = []
        const leaks: string[] = []
        for (const who of WHO) {
          const w = s.fresh === 'world' ? await makeWorld() : shared
          const c = s.fresh === 'session' ? await newCaller(who) : callers[who]
          const res = await call(c, s, w, method)
          got[who] = res.status
          // never a secret to the browser: the case's reply-by-e-mail token appears in no answer to anyone
          if (res.text?.includes(w.replyToken)) leaks.push(`${who}: the reply token`)
          // nor any token or hash under a name of its own (the case a route just created has a token of its own)
          if (/"(reply_?token|token_?hash|password_?hash|password|secret)"\s*:/i.test(res.text ?? '')) leaks.push(`${who}: ${/"(reply_?token|token_?hash|password_?hash|password|secret)"/i.exec(res.text)![0]}`)
          if ((who === 'owner' || who === 'other') && s.hiddenFromListeners) {
            for (const secret of s.hiddenFromListeners(w)) if (res.text?.includes(secret) || JSON.stringify(res.headers).includes(secret)) leaks.push(`${who}: ${secret}`)
          }
          if (res.status >= 400) {
            const e = res.body?.error
            if (!(typeof e?.code === 'string' && typeof e?.message === 'string')) shapes.push(`${who}: ${res.status} without { error: { code, message } }: ${res.text.slice(0, 120)}`)
          }
        }
        expect(got).toEqual(s.expect)
        expect(shapes).toEqual([])
        expect(leaks).toEqual([])
      }, 60_000)
    }
  }

  it('every state-changing route refuses a signed-in request without the CSRF token (403 csrf), except the secret-guarded inbound webhook', async () => {
    const app = built.app
    const wrong: string[] = []
    for (const r of enumerateRoutes(app)) {
      const [method, path] = r.split(' ')
      if (method === 'GET' || path.startsWith('/api/inbound/')) continue
      const url = path.replace(':id', shared.caseId)
      const res = await (callers.supervisor.agent as unknown as Record<string, (u: string) => request.Test>)[method.toLowerCase()](url).send({})
      if (res.status !== 403 || res.body?.error?.code !== 'csrf') wrong.push(`${r}: ${res.status} ${res.body?.error?.code}`)
    }
    expect(wrong).toEqual([])
  })
})

describe('a switched-off account: every route answers as to a signed-out caller', () => {
  // Sessions made before a supervisor switched the account off (POST /api/team/members/:id/deactivate).
  // The session ends with the switch-off, so a state-changing call may also fail on its CSRF token (403 csrf);
  // never anything a signed-out caller would not get.
  const offCallers: Caller[] = []
  beforeAll(async () => {
    for (const role of ['listener', 'advisor'] as const) {
      const u = await makeUser(role, `Matrix switched-off ${role}`)
      const agent = request.agent(server.url)
      const { body } = await agent.get('/api/auth/csrf').expect(200)
      const res = await agent.post('/api/auth/login').set('X-CSRF-Token', body.token).send({ email: u.email, password: u.password }).expect(200)
      await callers.supervisor.agent.post(`/api/team/members/${u.id}/deactivate`).set('X-CSRF-Token', callers.supervisor.csrf).expect(200)
      offCallers.push({ who: 'out', user: null, agent, csrf: body.token, cookie: String(res.headers['set-cookie']).split(';')[0] })
    }
  }, 60_000)
  it('every route × a switched-off listener and advisor (first scenario of each route, sessions kept)', async () => {
    const wrong: string[] = []
    for (const [key, scenarios] of Object.entries(routeEntries)) {
      const method = key.split(' ')[0]
      const s = scenarios[0]
      if (s.fresh) continue
      for (const c of offCallers) {
        const res = await call(c, s, shared, method)
        const asOut = res.status === s.expect.out || (method !== 'GET' && res.status === 403 && res.body?.error?.code === 'csrf')
        if (!asOut) wrong.push(`${key}: ${res.status} (signed out: ${s.expect.out})`)
      }
    }
    expect(wrong).toEqual([])
  }, 120_000)
})

describe('socket events × callers', () => {
  const connect = async (who: Who): Promise<Socket | 'signed_out'> => {
    if (who === 'out') {
      await expect(connectSocket(server.url, callers.out.cookie)).rejects.toThrow(/signed_out/)
      return 'signed_out'
    }
    return connectSocket(server.url, callers[who].cookie)
  }
  const quiet = async (s: Socket, event: string, ms = 700) => {
    let seen = false
    const on = () => (seen = true)
    s.on(event, on)
    await new Promise((r) => setTimeout(r, ms))
    s.off(event, on)
    return !seen
  }

  for (const [event, scenarios] of Object.entries(socketEntries)) {
    for (const s of scenarios) {
      it(`${event}${s.note ? ` (${s.note})` : ''}: ${WHO.map((w) => `${w} ${s.expect[w]}`).join(', ')}`, async () => {
        const got = {} as Record<Who, string>
        for (const who of WHO) {
          const sock = await connect(who)
          if (sock === 'signed_out') { got[who] = sock; continue }
          try {
            if (s.kind === 'ack') {
              const a = await emitAck(sock, event, s.payload(shared))
              got[who] = a.ok ? 'ok' : a.error!.code
              if ((who === 'owner' || who === 'other') && s.hiddenFromListeners?.(shared).some((x) => JSON.stringify(a).includes(x))) got[who] = 'leaked the internal note'
              if (event === 'queue.join' && !a.ok) {
                // refused: no queue traffic reaches this socket either
                const p = quiet(sock, 'queue.changed', 1000)
                await callers.advisor.agent.post(`/api/cases/${shared.caseId}/messages`).set('X-CSRF-Token', callers.advisor.csrf).send({ body: 'queue probe' }).expect(201)
                if (!(await p)) got[who] = 'leaked queue.changed'
              }
            } else {
              // an observer who may read the case: the advisor when the owner acts, else the owner
              const observer = await connectSocket(server.url, callers[who === 'owner' ? 'advisor' : 'owner'].cookie)
              try {
                await emitAck(observer, 'case.join', { caseId: shared.caseId })
                await emitAck(sock, 'case.join', { caseId: shared.caseId })
                if (s.kind === 'typing') {
                  const saw = nextEvent<{ userId: string; state: string }>(observer, 'presence', (p) => p.userId === users[who as Exclude<Who, 'out'>].id && p.state === 'typing', 1500).then(() => true, () => false)
                  sock.emit(event, s.payload(shared))
                  got[who] = (await saw) ? 'seen' : 'unseen'
                } else {
                  sock.emit(event, s.payload(shared))
                  await new Promise((r) => setTimeout(r, 200))
                  const p = quiet(sock, 'case.message', 1000)
                  const observed = nextEvent(observer, 'case.message', () => true, 5000)
                  await callers.advisor.agent.post(`/api/cases/${shared.caseId}/messages`).set('X-CSRF-Token', callers.advisor.csrf).send({ body: 'after leave' }).expect(201)
                  await observed // the event was published, so silence on `sock` means it left
                  got[who] = (await p) ? 'stops' : 'still receives'
                }
              } finally {
                observer.disconnect()
              }
            }
          } finally {
            sock.disconnect()
          }
        }
        expect(got).toEqual(s.expect)
      }, 60_000)
    }
  }
})

describe('malformed ids and numbers never answer 500 (issue 13, finding 8)', () => {
  const MALFORMED = ['------', '99999999999', 'not-a-uuid', '1e999', '%00', '-1', 'x'.repeat(300), '00000000-0000-0000-0000-00000000000g', "1'%20OR%20'1'='1"]
  const QUERY = '?revision=99999999999&after=99999999999999999999999&page=1e999&pageSize=-1&limit=abc&before=99999999999999999999&from=garbage&to=garbage&status=nope&advisorIds=------'
  // signing out or in would end the walking caller's session; those routes are walked by the matrix above
  const skip = (path: string) => path.startsWith('/api/auth/log')
  const walk = async (who: 'owner' | 'supervisor', fill: (path: string) => string[]) => {
    const bad: string[] = []
    for (const r of enumerateRoutes(built.app)) {
      const [method, path] = r.split(' ')
      if (skip(path)) continue
      for (const url of fill(path)) {
        const c = callers[who]
        let req = (c.agent as unknown as Record<string, (u: string) => request.Test>)[method.toLowerCase()](url)
        if (method !== 'GET') req = req.set('X-CSRF-Token', c.csrf).send({})
        const res = await req
        if (res.status >= 500) bad.push(`${who} ${method} ${url.slice(0, 120)}: ${res.status} ${res.text.slice(0, 80)}`)
        if (res.status === 400 && res.body?.error?.code === 'invalid' && !(Array.isArray(res.body?.error?.fields) && res.body.error.fields.length)) bad.push(`${who} ${method} ${url.slice(0, 120)}: 400 without the field path`)
      }
    }
    return bad
  }
  it('every route, every path parameter malformed, as the owner and as a supervisor', async () => {
    const fill = (path: string) => (path.includes(':') ? MALFORMED.map((m) => path.replace(/:[a-z]+/gi, m)) : [])
    expect([...(await walk('owner', fill)), ...(await walk('supervisor', fill))]).toEqual([])
  }, 240_000)
  it('every route with real ids and malformed query numbers (huge revision, sequence, page, dates)', async () => {
    const fill = (path: string) => [path.replace(':id', path.startsWith('/api/rooms') ? shared.roomId : shared.caseId).replace(':version', '1').replace(':token', 'A'.repeat(43)) + QUERY]
    expect([...(await walk('owner', fill)), ...(await walk('supervisor', fill))]).toEqual([])
  }, 240_000)
})
