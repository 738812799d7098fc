/**
 * Sign-in lockout per (account, client address), the per-address limit, and the account-wide exponential
 * back-off (server/auth/session.ts), on two app instances over one database (two nodes). Someone who
 * knows an address must not be able to lock its owner out (OWASP Authentication Cheat Sheet, "Account
 * Lockout"). Small budgets here; TRUST_PROXY lets each request speak from its own address.
 */
import { afterEach, describe, expect, it, vi } from 'vitest'
import request from 'supertest'

const { appNodes } = await import('../helpers/nodes')
// a distinctive back-off cap, so the back-off's timer is told apart from every other timer of the process
const { nodes } = await appNodes({ SIGN_IN_FAILURES_PER_ACCOUNT: '3', LOGIN_RATE_LIMIT: '6', SIGN_IN_BACKOFF_MAX_MS: '333', TRUST_PROXY: 'true' })
const { makeUser, uniqueEmail } = await import('../helpers/api')
const { signInBackoffMs, SIGN_IN_BACKOFF_BASE_MS } = await import('../../server/auth/session')
afterEach(() => vi.restoreAllMocks())

/** A sign-in on one node from one address; with `status`, the answer must have it. */
async function login(node: 0 | 1, address: string, email: string, password: string, status?: number): Promise<request.Response> {
  const agent = request.agent(nodes[node].app)
  const { body } = await agent.get('/api/auth/csrf').expect(200)
  const res = await agent.post('/api/auth/login').set('X-CSRF-Token', body.token).set('X-Forwarded-For', address).send({ email, password })
  if (status !== undefined) expect(res.status, JSON.stringify(res.body)).toBe(status)
  return res
}

describe('signInBackoffMs', () => {
  it('is 0 below the threshold, then 250 ms doubling with every failure, never above the cap; a cap of 0 turns it off', () => {
    expect([0, 1, 2].map((f) => signInBackoffMs(f, 3, 5000))).toEqual([0, 0, 0])
    expect([3, 4, 5, 6, 7, 8].map((f) => signInBackoffMs(f, 3, 5000))).toEqual([250, 500, 1000, 2000, 4000, 5000])
    expect(signInBackoffMs(3, 3, 5000)).toBe(SIGN_IN_BACKOFF_BASE_MS)
    expect(signInBackoffMs(10_000, 3, 5000)).toBe(5000)
    expect(signInBackoffMs(50, 3, 0)).toBe(0)
  })
})

describe('sign-in lockout per account and address', () => {
  it('failures from one address lock that address out of the account (429 even with the right password, on either node); the owner elsewhere signs in', async () => {
    const victim = await makeUser('listener')
    for (let i = 0; i < 3; i++) await login((i % 2) as 0 | 1, '198.51.100.81', victim.email, 'wrong-password-123', 401)
    const refused = await login(0, '198.51.100.81', victim.email, victim.password, 429)
    expect(refused.body.error.code).toBe('rate_limited')
    await login(1, '198.51.100.81', victim.email, victim.password, 429)
    // the owner, from the address they use
    await login(1, '203.0.113.81', victim.email, victim.password, 200)
  })

  it('many addresses failing on one account never lock the owner out: it is slowed (the back-off\'s timer), not refused', async () => {
    const victim = await makeUser('listener')
    // two failures from each of four addresses: no address reaches its lockout, the account has 8 failures
    for (let i = 0; i < 8; i++) await login((i % 2) as 0 | 1, `198.51.100.${90 + (i % 4)}`, victim.email, 'wrong-password-123', 401)
    const timers = vi.spyOn(globalThis, 'setTimeout')
    await login(0, '203.0.113.90', victim.email, victim.password, 200)
    // 8 failures, threshold 3: 250 · 2⁵ ms, capped at 333 ms
    expect(timers.mock.calls.some(([, ms]) => ms === 333)).toBe(true)
  })

  it('an account with no failures is not held at all', async () => {
    const u = await makeUser('listener')
    const timers = vi.spyOn(globalThis, 'setTimeout')
    await login(1, '203.0.113.95', u.email, u.password, 200)
    expect(timers.mock.calls.some(([, ms]) => ms === 333 || ms === SIGN_IN_BACKOFF_BASE_MS)).toBe(false)
  })

  it('a locked address keeps signing in to other accounts, until the per-address limit (failures on any accounts) answers 429', async () => {
    const victim = await makeUser('listener')
    const colleague = await makeUser('listener')
    for (let i = 0; i < 3; i++) await login(0, '192.0.2.81', victim.email, 'wrong-password-123', 401)
    await login(0, '192.0.2.81', victim.email, victim.password, 429)
    await login(1, '192.0.2.81', colleague.email, colleague.password, 200)
    // the address limit has counted 4 failures (the refused attempt too); failures on any account add to them
    for (let i = 0; ; i++) {
      const r = await login((i % 2) as 0 | 1, '192.0.2.81', uniqueEmail('guess'), 'wrong-password-123')
      if (r.status === 429) break
      expect(r.status).toBe(401)
      expect(i).toBeLessThan(6)
    }
    await login(0, '192.0.2.82', uniqueEmail('guess'), 'wrong-password-123', 401)
  })
})
