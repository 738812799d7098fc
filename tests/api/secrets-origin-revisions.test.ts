import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest'
import { QueryTypes } from 'sequelize'
import { io, type Socket } from 'socket.io-client'
import { config, setConfigForTests } from '../../server/config'
import { startServer, type RunningServer } from '../../server/server'
import { db } from '../../server/db/sequelize'
import { signedIn } from '../helpers/api'
import { openCase } from '../helpers/cases'
import { testRoom } from '../helpers/rooms'
import { sessionFor } from '../helpers/sockets'
import { makeUser } from '../helpers/api'

/** Issue 13, finding 12: no secret reaches a browser; socket handshakes only from our own origin; the team reads only sent room revisions. */
let server: RunningServer
const base = config()
beforeAll(async () => {
  server = await startServer({ port: 0, clientDir: false, background: false })
})
afterEach(() => setConfigForTests(base))
afterAll(async () => {
  await server?.close()
})

const tokenOf = async (caseId: string) =>
  (await db().query<{ reply_token: string }>('SELECT reply_token FROM cases WHERE id = $1', { bind: [caseId], type: QueryTypes.SELECT }))[0].reply_token

describe('the reply-by-e-mail token never reaches the browser', () => {
  it('POST /api/cases, GET, PATCH and the lists answer without it', async () => {
    const { c } = await signedIn('listener')
    const room = (await c.post('/api/rooms', testRoom()).expect(201)).body
    const created = await c.post('/api/cases', { roomId: room.id, title: 'Flutter echo between the side walls' }).expect(201)
    const token = await tokenOf(created.body.id)
    expect(token.length).toBeGreaterThanOrEqual(16)
    expect(created.body).not.toHaveProperty('replyToken')
    const answers = [
      created,
      await c.get(`/api/cases/${created.body.id}`).expect(200),
      await c.patch(`/api/cases/${created.body.id}`, { status: 'submitted', fromStatus: 'draft' }).expect(200),
      await c.get('/api/cases').expect(200),
    ]
    for (const a of answers) expect(a.text).not.toContain(token)
    const { c: advisor } = await signedIn('advisor')
    for (const url of ['/api/cases', `/api/cases/${created.body.id}`, `/api/cases/${created.body.id}/events`]) {
      expect((await advisor.get(url).expect(200)).text).not.toContain(token)
    }
  })
})

function socketWithOrigin(origin: string | undefined, cookie: string, transport: 'websocket' | 'polling'): Promise<Socket> {
  const s = io(server.url, { transports: [transport], extraHeaders: { Cookie: cookie, ...(origin ? { Origin: origin } : {}) }, reconnection: false, forceNew: true })
  return new Promise((resolve, reject) => {
    s.once('connect', () => resolve(s))
    s.once('connect_error', (e) => {
      s.disconnect()
      reject(e)
    })
  })
}

describe('socket.io handshakes are checked against the configured public URL', () => {
  it('without PUBLIC_URL: a loopback origin connects, another site is refused (WebSocket and polling)', async () => {
    const u = await makeUser('listener', 'Origin Listener')
    const { cookie } = await sessionFor(server.url, u.email, u.password)
    for (const transport of ['websocket', 'polling'] as const) {
      const ok = await socketWithOrigin(server.url, cookie, transport)
      ok.disconnect()
      await expect(socketWithOrigin('https://evil.example', cookie, transport)).rejects.toThrow()
      await expect(socketWithOrigin('null', cookie, transport)).rejects.toThrow()
    }
  })
  it('with PUBLIC_URL: only that origin connects (a loopback page or a look-alike host is refused)', async () => {
    setConfigForTests({ ...base, PUBLIC_URL: 'https://desk.roomwright.test' })
    const u = await makeUser('advisor', 'Origin Advisor')
    const { cookie } = await sessionFor(server.url, u.email, u.password)
    const ok = await socketWithOrigin('https://desk.roomwright.test', cookie, 'websocket')
    ok.disconnect()
    for (const bad of [server.url, 'https://desk.roomwright.test.evil.example', 'http://desk.roomwright.test']) {
      await expect(socketWithOrigin(bad, cookie, 'websocket'), bad).rejects.toThrow()
    }
  })
})

describe('the team reads only the room revisions the listener sent', () => {
  it('a revision saved after the case was closed answers 404 to the team, the sent one 200 (and the list names only sent ones)', async () => {
    const { c: listener } = await signedIn('listener')
    const { c: advisor } = await signedIn('advisor')
    const { room, case: c } = await openCase(listener)
    await listener.patch(`/api/cases/${c.id}`, { status: 'closed', fromStatus: 'submitted' }).expect(200)
    await listener.put(`/api/rooms/${room.id}`, testRoom({ name: 'Unsent: moved the sofa', length: 6.1 })).expect(200)
    expect((await listener.get(`/api/rooms/${room.id}?revision=2`).expect(200)).body.revision).toBe(2)
    await advisor.get(`/api/rooms/${room.id}?revision=2`).expect(404)
    await advisor.get(`/api/rooms/${room.id}`).expect(404) // the current revision is the unsent one
    const sent = (await advisor.get(`/api/rooms/${room.id}?revision=1`).expect(200)).body
    expect(sent.revisions).toEqual([1])
  })
  it('a revision saved while the case is open is sent with it (the case moves to it), and the earlier one stays readable', async () => {
    const { c: listener } = await signedIn('listener')
    const { c: advisor } = await signedIn('advisor')
    const { room } = await openCase(listener)
    await listener.put(`/api/rooms/${room.id}`, testRoom({ name: 'Sent: panels added', length: 5.9 })).expect(200)
    await advisor.get(`/api/rooms/${room.id}?revision=2`).expect(200)
    await advisor.get(`/api/rooms/${room.id}?revision=1`).expect(200)
  })
})
