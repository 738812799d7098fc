import { afterAll, describe, expect, it } from 'vitest'
import express from 'express'
import request from 'supertest'
import { closeTestApp, makeUser, testApp } from '../helpers/api'
import { errorHandler } from '../../server/middleware/errors'

afterAll(async () => {
  await closeTestApp()
})

const cookieOf = (res: request.Response, name: string) => ([] as string[]).concat(res.headers['set-cookie'] ?? []).find((c) => c.startsWith(`${name}=`))

describe('security headers (helmet) on API answers', () => {
  it('answers carry CSP, nosniff, frame and referrer policies, and no X-Powered-By', async () => {
    const res = await request(testApp()).get('/api/health')
    expect(res.headers['x-powered-by']).toBeUndefined()
    expect(res.headers['x-content-type-options']).toBe('nosniff')
    expect(res.headers['x-frame-options']).toBe('SAMEORIGIN')
    expect(res.headers['referrer-policy']).toBe('no-referrer')
    expect(res.headers['cross-origin-opener-policy']).toBe('same-origin')
    expect(res.headers['cross-origin-resource-policy']).toBe('same-origin')
    expect(res.headers['x-dns-prefetch-control']).toBe('off')
    expect(res.headers['strict-transport-security']).toMatch(/max-age=\d{7,}/)
    const csp = String(res.headers['content-security-policy'])
    const directives = Object.fromEntries(csp.split(';').map((d) => d.trim().split(/\s+/)).map(([k, ...v]) => [k, v]))
    expect(directives['default-src']).toEqual(["'self'"])
    expect(directives['script-src']).toEqual(["'self'"])
    expect(directives['object-src']).toEqual(["'none'"])
    expect(directives['frame-ancestors']).toEqual(["'none'"])
    expect(directives['base-uri']).toEqual(["'self'"])
    expect(directives['form-action']).toEqual(["'self'"])
    expect(csp).not.toMatch(/unsafe-eval/)
    expect(directives['script-src']).not.toContain("'unsafe-inline'")
  })
  it('error answers (404, 401, 400) get the same headers and are JSON', async () => {
    for (const path of ['/api/nowhere', '/api/auth/me', '/api/cases/not-a-uuid']) {
      const res = await request(testApp()).get(path)
      expect(res.status).toBeGreaterThanOrEqual(400)
      expect(res.headers['content-type']).toMatch(/application\/json/)
      expect(res.headers['content-security-policy']).toMatch(/default-src 'self'/)
      expect(res.headers['x-powered-by']).toBeUndefined()
    }
  })
})

describe('the session cookie', () => {
  it('is HttpOnly, SameSite=Lax, path / and has a bounded lifetime; it is renewed with a new id at sign-in', async () => {
    const user = await makeUser('listener')
    const agent = request.agent(testApp())
    const first = await agent.get('/api/auth/csrf').expect(200)
    const before = cookieOf(first, 'rw.sid')!
    expect(before).toMatch(/;\s*HttpOnly/i)
    expect(before).toMatch(/;\s*SameSite=Lax/i)
    expect(before).toMatch(/;\s*Path=\//i)
    const expires = /Expires=([^;]+)/i.exec(before)?.[1]
    expect(expires).toBeTruthy()
    const days = (new Date(expires!).getTime() - Date.now()) / 86_400_000
    expect(days).toBeGreaterThan(13)
    expect(days).toBeLessThanOrEqual(14.01)
    // no Secure flag on plain-HTTP loopback in tests; production over https sets it (server/app.ts)
    const login = await agent.post('/api/auth/login').set('X-CSRF-Token', first.body.token).send({ email: user.email, password: user.password }).expect(200)
    const after = cookieOf(login, 'rw.sid')!
    expect(after).toMatch(/HttpOnly/i)
    expect(after.split(';')[0]).not.toBe(before.split(';')[0])
  })
  it('sign-out clears the cookie and the old session id no longer signs anyone in', async () => {
    const user = await makeUser('advisor')
    const agent = request.agent(testApp())
    const { body } = await agent.get('/api/auth/csrf')
    const login = await agent.post('/api/auth/login').set('X-CSRF-Token', body.token).send({ email: user.email, password: user.password }).expect(200)
    const sid = cookieOf(login, 'rw.sid')!.split(';')[0]
    const out = await agent.post('/api/auth/logout').set('X-CSRF-Token', body.token).expect(204)
    expect(cookieOf(out, 'rw.sid')).toMatch(/Expires=Thu, 01 Jan 1970/i)
    await request(testApp()).get('/api/auth/me').set('Cookie', sid).expect(401)
  })
})

describe('no stack traces to clients', () => {
  it("an unexpected error answers 500 with the product's JSON message only: no stack, no file path, no error text", async () => {
    const app = express()
    app.get('/boom', () => {
      throw new Error('secret detail at /work/main/server/secret.ts:42 password=hunter2')
    })
    app.use(errorHandler)
    const res = await request(app).get('/boom').expect(500)
    expect(res.body).toEqual({ error: { code: 'internal', message: expect.any(String) } })
    expect(res.text).not.toMatch(/secret|hunter2|\.ts|at |Error:/)
  })
  it('the real app answers a malformed JSON body with 400 JSON, no parser stack', async () => {
    const agent = request.agent(testApp())
    const { body } = await agent.get('/api/auth/csrf')
    const res = await agent.post('/api/auth/login').set('X-CSRF-Token', body.token).set('Content-Type', 'application/json').send('{"email": "a@b.test", ')
    expect(res.status).toBe(400)
    expect(res.body).toEqual({ error: { code: 'invalid_json', message: expect.any(String) } })
    expect(res.text).not.toMatch(/node_modules|at |SyntaxError/)
  })
})
