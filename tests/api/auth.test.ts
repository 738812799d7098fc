import { afterAll, describe, expect, it } from 'vitest'
import request from 'supertest'
import { client, closeTestApp, makeUser, signedIn, testApp, uniqueEmail, TEST_PASSWORD } from '../helpers/api'
import { QueryTypes } from 'sequelize'
import { db } from '../../server/db/sequelize'

afterAll(closeTestApp)

describe('POST /api/auth/register', () => {
  it('creates a listener, signs them in and answers 201 with the public user', async () => {
    const c = await client()
    const email = uniqueEmail('Rosalind')
    const res = await c.post('/api/auth/register', { email, password: 'a-long-passphrase-1', name: 'Rosalind Quarshie' }).expect(201)
    expect(res.body).toEqual({ id: expect.any(String), email: email.toLowerCase(), name: 'Rosalind Quarshie', role: 'listener' })
    expect(res.body.passwordHash).toBeUndefined()
    const me = await c.get('/api/auth/me').expect(200)
    expect(me.body.email).toBe(email.toLowerCase())
  })
  it('when the password is shorter than 12 characters, answers 400 with the field path', async () => {
    const c = await client()
    const res = await c.post('/api/auth/register', { email: uniqueEmail('short'), password: 'elevenchars', name: 'Short Pass' }).expect(400)
    expect(res.body.error.code).toBe('invalid')
    expect(res.body.error.fields).toEqual([{ path: 'password', message: expect.stringContaining('12') }])
  })
  it('when the e-mail is taken (in any letter case), answers 409', async () => {
    const existing = await makeUser('listener')
    const c = await client()
    const res = await c.post('/api/auth/register', { email: existing.email.toUpperCase(), password: 'a-long-passphrase-1', name: 'Copy Cat' }).expect(409)
    expect(res.body.error.code).toBe('email_taken')
  })
  it('without the CSRF header, answers 403 and creates nothing', async () => {
    const email = uniqueEmail('nocsrf')
    const agent = request.agent(testApp())
    await agent.get('/api/auth/csrf')
    const res = await agent.post('/api/auth/register').send({ email, password: 'a-long-passphrase-1', name: 'No Token' }).expect(403)
    expect(res.body.error.code).toBe('csrf')
    const c = await client()
    await c.post('/api/auth/login', { email, password: 'a-long-passphrase-1' }).expect(401)
  })
})

describe('POST /api/auth/login', () => {
  it('signs in with the right password and regenerates the session id', async () => {
    const u = await makeUser('advisor')
    const c = await client()
    const before = (await c.get('/api/auth/csrf')).headers['set-cookie']
    const res = await c.post('/api/auth/login', { email: u.email, password: TEST_PASSWORD }).expect(200)
    expect(res.body).toMatchObject({ id: u.id, role: 'advisor' })
    const cookie = String(res.headers['set-cookie'])
    expect(cookie).toMatch(/rw\.sid=/)
    expect(cookie).toMatch(/HttpOnly/i)
    expect(cookie).toMatch(/SameSite=Lax/i)
    expect(cookie).not.toEqual(String(before))
  })
  it('with a wrong password, answers 401 bad_credentials without saying which part was wrong', async () => {
    const u = await makeUser('listener')
    const c = await client()
    const res = await c.post('/api/auth/login', { email: u.email, password: 'not-the-password-at-all' }).expect(401)
    expect(res.body.error).toEqual({ code: 'bad_credentials', message: expect.any(String) })
    const res2 = await c.post('/api/auth/login', { email: uniqueEmail('nobody'), password: 'not-the-password-at-all' }).expect(401)
    expect(res2.body.error.message).toBe(res.body.error.message)
  })
  it('with a malformed body, answers 400 with field paths', async () => {
    const c = await client()
    const res = await c.post('/api/auth/login', { email: 'not-an-email' }).expect(400)
    expect(res.body.error.fields.map((f: { path: string }) => f.path).sort()).toEqual(['email', 'password'])
  })
  it('with a body that is not JSON, answers 400 invalid_json', async () => {
    const c = await client()
    const res = await c.agent.post('/api/auth/login').set('X-CSRF-Token', c.csrf).set('Content-Type', 'application/json').send('{"email":').expect(400)
    expect(res.body.error.code).toBe('invalid_json')
  })
})

describe('POST /api/auth/logout and GET /api/auth/me', () => {
  it('me answers 401 when signed out', async () => {
    const res = await request(testApp()).get('/api/auth/me').expect(401)
    expect(res.body.error.code).toBe('signed_out')
  })
  it('logout ends the session', async () => {
    const { c } = await signedIn('supervisor')
    await c.get('/api/auth/me').expect(200)
    await c.post('/api/auth/logout').expect(204)
    await c.get('/api/auth/me').expect(401)
  })
  it('session answers 200 either way: the user when signed in, null when not (a signed-out page has no failing request)', async () => {
    expect((await request(testApp()).get('/api/auth/session').expect(200)).body).toEqual({ user: null })
    const { c } = await signedIn('advisor')
    const me = (await c.get('/api/auth/me').expect(200)).body
    expect((await c.get('/api/auth/session').expect(200)).body).toEqual({ user: me })
    await c.post('/api/auth/logout').expect(204)
    expect((await c.get('/api/auth/session').expect(200)).body).toEqual({ user: null })
  })
})

describe('staff accounts have one way in: an invitation', () => {
  it('POST /api/users is gone: a supervisor cannot create an advisor directly (404) and no account appears', async () => {
    const { c } = await signedIn('supervisor')
    const email = uniqueEmail('direct-staff')
    const res = await c.post('/api/users', { email, password: 'staff-passphrase-1', name: 'Odile Brenner', role: 'advisor' }).expect(404)
    expect(res.body.error.code).toBe('not_found')
    const rows = await db().query('SELECT 1 FROM users WHERE lower(email) = $1', { bind: [email], type: QueryTypes.SELECT })
    expect(rows).toHaveLength(0)
  })
})

describe('GET /api/health and unknown routes', () => {
  it('answers ok with the database up', async () => {
    const res = await request(testApp()).get('/api/health').expect(200)
    expect(res.body).toEqual({ ok: true, db: 'up' })
  })
  it('an unknown API route answers 404 JSON, never HTML', async () => {
    const res = await request(testApp()).get('/api/no-such-thing').expect(404)
    expect(res.body.error.code).toBe('not_found')
  })
  it('sets helmet security headers', async () => {
    const res = await request(testApp()).get('/api/health')
    expect(res.headers['x-content-type-options']).toBe('nosniff')
    expect(res.headers['content-security-policy']).toContain("default-src 'self'")
    expect(res.headers['x-powered-by']).toBeUndefined()
  })
})

describe('GET/PATCH /api/auth/preferences', () => {
  it('a listener switches to imperial units and turns off non-essential e-mails; the choice is kept', async () => {
    const { c } = await signedIn('listener')
    expect((await c.get('/api/auth/preferences').expect(200)).body).toEqual({ units: 'metric', emailOptional: true })
    await c.patch('/api/auth/preferences', { units: 'imperial', emailOptional: false }).expect(200)
    expect((await c.get('/api/auth/preferences').expect(200)).body).toEqual({ units: 'imperial', emailOptional: false })
  })
  it('an unknown unit answers 400 with the field path', async () => {
    const { c } = await signedIn('listener')
    const res = await c.patch('/api/auth/preferences', { units: 'cubits' }).expect(400)
    expect(res.body.error.fields[0].path).toBe('units')
  })
  it('signed out answers 401', async () => {
    const c = await client()
    await c.get('/api/auth/preferences').expect(401)
  })
})
