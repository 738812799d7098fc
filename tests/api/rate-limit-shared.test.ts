import { describe, expect, it } from 'vitest'
import request from 'supertest'

// Two app instances (two nodes) against one database, each with its own limiter objects, as two processes
// behind a balancer would have. Small budgets here; TRUST_PROXY lets each test speak from its own address.
const { appNodes } = await import('../helpers/nodes')
const { nodes } = await appNodes({ LOGIN_RATE_LIMIT: '4', SIGN_IN_FAILURES_PER_ACCOUNT: '3', SIGN_IN_BACKOFF_MAX_MS: '300', TRUST_PROXY: 'true' })
const { makeUser, uniqueEmail } = await import('../helpers/api')
const { models } = await import('../../server/db/models')
const { sweepRateLimits } = await import('../../server/middleware/rate-limit-store')
const { db } = await import('../../server/db/sequelize')

async function on(node: 0 | 1, address: string) {
  const agent = request.agent(nodes[node].app)
  const { body } = await agent.get('/api/auth/csrf').expect(200)
  return {
    login: (email: string, password: string) => agent.post('/api/auth/login').set('X-CSRF-Token', body.token).set('X-Forwarded-For', address).send({ email, password }),
    reset: (email: string) => agent.post('/api/auth/password-reset/request').set('X-CSRF-Token', body.token).set('X-Forwarded-For', address).send({ email }),
  }
}

describe('rate-limit counters live in PostgreSQL, shared by every node', () => {
  it('failed sign-ins on one account from one address spread over two nodes are counted together (3 failures, then 429 on either node); the owner elsewhere signs in', async () => {
    const victim = await makeUser('listener')
    await (await on(0, '198.51.100.21')).login(victim.email, 'wrong-password-123').expect(401)
    await (await on(1, '198.51.100.21')).login(victim.email, 'wrong-password-123').expect(401)
    await (await on(0, '198.51.100.21')).login(victim.email, 'wrong-password-123').expect(401)
    expect((await (await on(1, '198.51.100.21')).login(victim.email, victim.password).expect(429)).body.error.code).toBe('rate_limited')
    expect((await (await on(0, '198.51.100.21')).login(victim.email, victim.password).expect(429)).body.error.code).toBe('rate_limited')
    await (await on(1, '198.51.100.25')).login(victim.email, victim.password).expect(200)
  })

  it('failures from one address alternate between nodes and the 5th answers 429; successes on both nodes never count', async () => {
    for (let i = 0; i < 6; i++) {
      const u = await makeUser('listener')
      await (await on((i % 2) as 0 | 1, '192.0.2.40')).login(u.email, u.password).expect(200)
    }
    for (let i = 0; i < 4; i++) await (await on((i % 2) as 0 | 1, '192.0.2.40')).login(uniqueEmail('guess'), 'wrong-password-123').expect(401)
    await (await on(0, '192.0.2.40')).login(uniqueEmail('guess'), 'wrong-password-123').expect(429)
    await (await on(1, '192.0.2.40')).login(uniqueEmail('guess'), 'wrong-password-123').expect(429)
    // another address keeps its own budget, and another account on the blocked address is limited only by address
    await (await on(1, '192.0.2.41')).login(uniqueEmail('guess'), 'wrong-password-123').expect(401)
  })

  it('reset-link requests count every request, across nodes, in a budget of their own', async () => {
    for (let i = 0; i < 4; i++) await (await on((i % 2) as 0 | 1, '192.0.2.60')).reset(uniqueEmail('forgot')).expect(202)
    await (await on(1, '192.0.2.60')).reset(uniqueEmail('forgot')).expect(429)
    // sign-in failures from that address still have their own budget
    await (await on(0, '192.0.2.60')).login(uniqueEmail('guess'), 'wrong-password-123').expect(401)
  })

  it('no client key is stored in the clear (e-mail addresses are hashed)', async () => {
    const email = uniqueEmail('hashed')
    await (await on(0, '192.0.2.70')).login(email, 'wrong-password-123').expect(401)
    const keys = (await models().RateLimitHit.findAll()).map((r) => r.key)
    expect(keys.length).toBeGreaterThan(0)
    for (const k of keys) {
      expect(k).toMatch(/^[a-z-]+:[0-9a-f]{64}$/)
      expect(k).not.toContain(email)
    }
  })

  it('expired counters are deleted by the sweep, and a blocked account signs in again once its window ended', async () => {
    const u = await makeUser('listener')
    for (let i = 0; i < 3; i++) await (await on((i % 2) as 0 | 1, '203.0.113.60')).login(u.email, 'wrong-password-123').expect(401)
    await (await on(0, '203.0.113.60')).login(u.email, u.password).expect(429)
    // end every window now (the database's clock decides, as in the store)
    await models().RateLimitHit.update({ resetAt: db().literal("now() - interval '1 second'") as unknown as Date }, { where: {} })
    expect(await sweepRateLimits()).toBeGreaterThan(0)
    expect(await models().RateLimitHit.count()).toBe(0)
    await (await on(1, '203.0.113.60')).login(u.email, u.password).expect(200)
  })
})
