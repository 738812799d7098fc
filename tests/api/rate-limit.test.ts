import { afterAll, describe, expect, it } from 'vitest'

// This file's app gets a small sign-in budget; the other test files run with a large one.
process.env.LOGIN_RATE_LIMIT = '3'
const { client, closeTestApp, uniqueEmail } = await import('../helpers/api')

afterAll(closeTestApp)

describe('POST /api/auth/login rate limit (express-rate-limit)', () => {
  it('after 3 attempts from one address the 4th answers 429 rate_limited with a Retry-After hint', async () => {
    const c = await client()
    for (let i = 0; i < 3; i++) await c.post('/api/auth/login', { email: uniqueEmail('guess'), password: 'wrong-password-123' }).expect(401)
    const res = await c.post('/api/auth/login', { email: uniqueEmail('guess'), password: 'wrong-password-123' }).expect(429)
    expect(res.body.error.code).toBe('rate_limited')
    expect(res.headers['ratelimit-policy'] ?? res.headers['ratelimit']).toBeDefined()
  })
})

describe('POST /api/auth/password-reset/request rate limit', () => {
  it('after 3 requests from one address the 4th answers 429, whatever e-mail it names; sign-in keeps its own budget', async () => {
    const c = await client()
    for (let i = 0; i < 3; i++) await c.post('/api/auth/password-reset/request', { email: uniqueEmail('forgot') }).expect(202)
    const res = await c.post('/api/auth/password-reset/request', { email: uniqueEmail('forgot') }).expect(429)
    expect(res.body.error.code).toBe('rate_limited')
  })
})
