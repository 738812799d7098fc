/**
 * The short session path for GETs (server/auth/session-middleware.ts) in one process: a signed-in session
 * this node holds in memory is answered without the store's read, yet a sign-out, a deactivation or a
 * forged cookie is refused at once, and the rolling expiry still moves (written at most every
 * TOUCH_EVERY_MS). A long cache bound (SESSION_CACHE_SECONDS=3600) here, so only the invalidation can make
 * the node forget. (Across two processes: session-cache-nodes.test.ts.)
 */
import { afterAll, afterEach, describe, expect, it, vi } from 'vitest'
import request from 'supertest'

process.env.SESSION_CACHE_SECONDS = '3600'
const { setConfigForTests, loadConfig } = await import('../../server/config')
setConfigForTests(loadConfig())
const { closeTestApp, makeUser, testApp, clientOf } = await import('../helpers/api')
const { SessionStore, TOUCH_EVERY_MS } = await import('../../server/auth/session-store')
const { db } = await import('../../server/db/sequelize')
const { QueryTypes } = await import('sequelize')

afterEach(() => {
  vi.useRealTimers()
  vi.restoreAllMocks()
})
afterAll(async () => {
  await closeTestApp()
})

/** Signs in over a fresh agent and returns the session cookie as sent back (`rw.sid=…`) and the session id. */
async function signInCookie(user: { email: string; password: string }) {
  const agent = request.agent(testApp())
  const csrf = (await agent.get('/api/auth/csrf').expect(200)).body.token as string
  const res = await agent.post('/api/auth/login').set('X-CSRF-Token', csrf).send({ email: user.email, password: user.password }).expect(200)
  const cookie = ([] as string[]).concat(res.headers['set-cookie'] ?? []).find((c) => c.startsWith('rw.sid='))!.split(';')[0]
  const value = decodeURIComponent(cookie.slice('rw.sid='.length))
  return { agent, csrf, cookie, sid: value.slice(2, value.lastIndexOf('.')) }
}

const me = (cookie: string) => request(testApp()).get('/api/auth/me').set('Cookie', cookie)

/** GETs /api/auth/me until one is answered without the store's read (the change feed connects on its own time). */
async function untilShortPath(cookie: string): Promise<void> {
  const reads = vi.spyOn(SessionStore.prototype, 'get')
  for (let i = 0; i < 50; i++) {
    const before = reads.mock.calls.length
    await me(cookie).expect(200)
    if (reads.mock.calls.length === before) return
    await new Promise((r) => setTimeout(r, 100))
  }
  throw new Error('the session was never answered from memory')
}

async function storedExpiry(sid: string): Promise<number> {
  const [row] = await db().query<{ ms: number }>(`SELECT date_part('epoch', expire) * 1000 AS ms FROM "session" WHERE sid = $1`, { bind: [sid], type: QueryTypes.SELECT })
  return Number(row.ms)
}

describe('the short session path for GETs', () => {
  it('answers a held session without reading the store, and refuses it at once after a sign-out through the same node', async () => {
    const l = await makeUser('listener', 'Short Path Sign-out')
    const s = await signInCookie(l)
    await untilShortPath(s.cookie)
    expect((await me(s.cookie).expect(200)).body).toMatchObject({ id: l.id, name: 'Short Path Sign-out' })
    await s.agent.post('/api/auth/logout').set('X-CSRF-Token', s.csrf).expect(204)
    await me(s.cookie).expect(401)
    await me(s.cookie).expect(401)
  })

  it('refuses a held session at once when its account is switched off', async () => {
    const l = await makeUser('listener', 'Short Path Deactivated')
    const s = await signInCookie(l)
    await untilShortPath(s.cookie)
    const sup = await clientOf(testApp(), await makeUser('supervisor'))
    await sup.post(`/api/team/members/${l.id}/deactivate`).expect(200)
    await me(s.cookie).expect(401)
  })

  it('refuses a cookie carrying a held session\'s id with a wrong signature (the remembered signature is per cookie value)', async () => {
    const l = await makeUser('listener', 'Short Path Forged')
    const s = await signInCookie(l)
    await untilShortPath(s.cookie)
    const forged = `rw.sid=${encodeURIComponent(`s:${s.sid}.AAAAforgedsignatureAAAAAAAAAAAAAAAAAAAAAAA`)}`
    await me(forged).expect(401)
    await me(`rw.sid=${encodeURIComponent(s.sid)}`).expect(401)
    await me(s.cookie).expect(200)
  })

  it('moves the rolling expiry (stored and cookie) once it would move by TOUCH_EVERY_MS, and not on every request', async () => {
    const l = await makeUser('listener', 'Short Path Rolling')
    const s = await signInCookie(l)
    await untilShortPath(s.cookie)
    const before = await storedExpiry(s.sid)
    // soon after the last write: neither a write nor a new cookie
    const soon = await me(s.cookie).expect(200)
    expect(soon.headers['set-cookie']).toBeUndefined()
    expect(await storedExpiry(s.sid)).toBe(before)
    // the clock of this process moved on by more than TOUCH_EVERY_MS (only Date is faked; timers and sockets are real)
    vi.useFakeTimers({ toFake: ['Date'] })
    vi.setSystemTime(Date.now() + TOUCH_EVERY_MS + 60_000)
    const reads = vi.spyOn(SessionStore.prototype, 'get')
    reads.mockClear() // the spy of untilShortPath, with its calls
    const later = await me(s.cookie).expect(200)
    expect(reads).not.toHaveBeenCalled()
    const sent = ([] as string[]).concat(later.headers['set-cookie'] ?? []).find((c) => c.startsWith('rw.sid='))
    expect(sent).toBeDefined()
    expect(sent!.split(';')[0]).toBe(s.cookie)
    const expires = Date.parse(/Expires=([^;]+)/i.exec(sent!)![1])
    expect(expires - before).toBeGreaterThanOrEqual(TOUCH_EVERY_MS)
    expect(await storedExpiry(s.sid) - before).toBeGreaterThanOrEqual(TOUCH_EVERY_MS)
  })
})
