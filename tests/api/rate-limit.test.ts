import { afterAll, describe, expect, it } from 'vitest'

// This file's app gets small budgets; the other test files run with large ones. TRUST_PROXY lets each
// test speak from its own client address (X-Forwarded-For), as clients behind a trusted proxy do.
process.env.LOGIN_RATE_LIMIT = '5'
process.env.SIGN_IN_FAILURES_PER_ACCOUNT = '3'
process.env.SIGN_IN_BACKOFF_MAX_MS = '300'
process.env.TRUST_PROXY = 'true'
const { client, closeTestApp, makeUser, uniqueEmail } = await import('../helpers/api')
const { setConfigForTests, loadConfig } = await import('../../server/config')
setConfigForTests(loadConfig())

afterAll(closeTestApp)

async function from(address: string) {
  const c = await client()
  return { login: (email: string, password: string) => c.agent.post('/api/auth/login').set('X-CSRF-Token', c.csrf).set('X-Forwarded-For', address).send({ email, password }) }
}

describe('sign-in limits count failures, per account and address and per client address (express-rate-limit)', () => {
  it('successful sign-ins never count: 12 people of one office sign in from one address', async () => {
    const office = await from('203.0.113.10')
    for (let i = 0; i < 12; i++) {
      const u = await makeUser('listener')
      await office.login(u.email, u.password).expect(200)
    }
  })
  it('after 3 failures on one account from one address, that address answers 429 even with the right password; the owner elsewhere and another account on that address still sign in', async () => {
    const victim = await makeUser('listener')
    const other = await makeUser('listener')
    const guesser = await from('198.51.100.1')
    for (let i = 0; i < 3; i++) await guesser.login(victim.email, 'wrong-password-123').expect(401)
    const res = await guesser.login(victim.email, victim.password).expect(429)
    expect(res.body.error.code).toBe('rate_limited')
    expect(res.headers['ratelimit-policy'] ?? res.headers['ratelimit']).toBeDefined()
    await (await from('198.51.100.9')).login(victim.email, victim.password).expect(200)
    await (await from('198.51.100.1')).login(other.email, other.password).expect(200)
  })
  it('after 5 failures from one address (on different e-mails) the 6th answers 429 rate_limited', async () => {
    const guesser = await from('192.0.2.77')
    for (let i = 0; i < 5; i++) await guesser.login(uniqueEmail('guess'), 'wrong-password-123').expect(401)
    expect((await guesser.login(uniqueEmail('guess'), 'wrong-password-123').expect(429)).body.error.code).toBe('rate_limited')
    // another address is not affected
    await (await from('192.0.2.78')).login(uniqueEmail('guess'), 'wrong-password-123').expect(401)
  })
})

describe('trivial passwords are refused with a clear message (zxcvbn-ts estimator)', () => {
  for (const password of ['aaaaaaaaaaaa', '123456789012', 'password1234', 'qwertyuiop12']) {
    it(`POST /api/auth/register with "${password}" answers 400 naming the password field`, async () => {
      const c = await client()
      const r = await c.agent.post('/api/auth/register').set('X-CSRF-Token', c.csrf).set('X-Forwarded-For', `192.0.2.${password.length + 100}`)
        .send({ email: uniqueEmail('weak'), name: 'Weak Password', password }).expect(400)
      expect(r.body.error.fields).toEqual([{ path: 'password', message: expect.stringMatching(/^this password is too easy to guess: .+/) }])
    })
  }
  it('a passphrase of unrelated words is accepted (201)', async () => {
    const c = await client()
    await c.agent.post('/api/auth/register').set('X-CSRF-Token', c.csrf).set('X-Forwarded-For', '192.0.2.250')
      .send({ email: uniqueEmail('strong'), name: 'Strong Password', password: 'lantern-quarry-mosaic-41' }).expect(201)
  })
  it('a password built from the person\'s own name is refused', async () => {
    const c = await client()
    const r = await c.agent.post('/api/auth/register').set('X-CSRF-Token', c.csrf).set('X-Forwarded-For', '192.0.2.251')
      .send({ email: uniqueEmail('named'), name: 'Ottoline Brackenridge', password: 'ottolinebrackenridge' }).expect(400)
    expect(r.body.error.fields[0].path).toBe('password')
  })
})

describe('POST /api/auth/password-reset/request rate limit', () => {
  it('after 5 requests from one address (LOGIN_RATE_LIMIT here) the 6th answers 429, whatever e-mail it names; sign-in keeps its own budget', async () => {
    const c = await client()
    for (let i = 0; i < 5; i++) await c.post('/api/auth/password-reset/request', { email: uniqueEmail('forgot') }).expect(202)
    const res = await c.post('/api/auth/password-reset/request', { email: uniqueEmail('forgot') }).expect(429)
    expect(res.body.error.code).toBe('rate_limited')
  })
})
