import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import express from 'express'
import passport from 'passport'
import request from 'supertest'
import nodemailer from 'nodemailer'
import { randomBytes } from 'node:crypto'
import { QueryTypes } from 'sequelize'
import { JSDOM } from 'jsdom'
import { config, setConfigForTests } from '../../server/config'
import { createApp } from '../../server/app'
import { db } from '../../server/db/sequelize'
import { csrfProtection } from '../../server/middleware/csrf'
import { errorHandler } from '../../server/middleware/errors'
import { mailRouter, INBOUND_SECRET_HEADER } from '../../server/routes/mail'
import { startFakeSmtp, type FakeSmtp } from '../../server/mail/fake-smtp'
import { deliverOutboxEmail } from '../../server/mail/deliver'
import { stopJobs } from '../../server/jobs/queue'
import { clientOf, closeTestApp, makeUser, signedIn, type Client } from '../helpers/api'
import { openCase } from '../helpers/cases'

/**
 * The mail routes inside the real middleware stack of server/app.ts (JSON body, PostgreSQL
 * sessions, passport, CSRF with /inbound/ exempt, the JSON error handler), in front of the rest of
 * the app for sign-in and cases, so the tests do not depend on where the router is mounted.
 */
const built = createApp({ clientDir: false })
const app = express()
app.use('/api', express.json({ limit: '1mb' }), built.sessionMiddleware, passport.session(), csrfProtection({ exempt: ['/inbound/'] }), mailRouter())
app.use(built.app)
app.use(errorHandler)

const mailClient = (user?: { email: string; password: string }): Promise<Client> => clientOf(app, user)
const mailAs = async (role: 'listener' | 'advisor' | 'supervisor') => {
  const user = await makeUser(role)
  return { user, c: await mailClient(user) }
}

const SECRET = 'inbound-secret-for-the-mail-tests-5b1e'
const REPLY_DOMAIN = 'reply.mailtests.roomwright.test'
let fake: FakeSmtp
const base = config()

beforeAll(async () => {
  fake = await startFakeSmtp({ port: 0, host: '127.0.0.1' })
  setConfigForTests({ ...base, FAKE_SMTP: 'on', SMTP_HOST: '127.0.0.1', SMTP_PORT: fake.port, INBOUND_EMAIL_SECRET: SECRET, MAIL_REPLY_DOMAIN: REPLY_DOMAIN, PUBLIC_URL: 'https://desk.mailtests.roomwright.test' })
})
afterAll(async () => {
  await fake?.stop()
  await stopJobs()
  await built.close()
  await closeTestApp()
})

const smtpTo = () => nodemailer.createTransport({ host: '127.0.0.1', port: fake.port, secure: false, ignoreTLS: true })
const q = <T extends object>(sql: string, bind: unknown[]) => db().query<T>(sql, { bind, type: QueryTypes.SELECT })
const tokenOf = async (caseId: string) => (await q<{ reply_token: string }>('SELECT reply_token FROM cases WHERE id = $1', [caseId]))[0].reply_token
const inboundLog = (fromAddress: string) => q<{ status: string; reason: string | null; case_id: string | null; via: string }>('SELECT status, reason, case_id, via FROM inbound_email_log WHERE from_address ILIKE $1 ORDER BY id', [`%${fromAddress}%`])

/** A listener with a submitted case, through the product's own API. */
async function listenerWithCase(title = 'Boom at 43 Hz in the attic room') {
  const listener = await signedIn('listener')
  const { case: c } = await openCase(listener.c, { title })
  return { listener, caseId: c.id, token: await tokenOf(c.id) }
}

describe('GET /api/dev/mailbox', () => {
  it('a supervisor reads every received message with its HTML, text and headers, newest first (200)', async () => {
    const to = `mailbox-${randomBytes(4).toString('hex')}@example.test`
    await smtpTo().sendMail({ from: 'Roomwright <desk@roomwright.test>', to, subject: 'First of two', text: 'plain one', html: '<p>html <b>one</b></p>' })
    await smtpTo().sendMail({ from: 'Roomwright <desk@roomwright.test>', to, subject: 'Second of two', text: 'plain two', html: '<p>html two</p>' })
    const { c } = await mailAs('supervisor')
    const res = await c.get(`/api/dev/mailbox?to=${encodeURIComponent(to)}`).expect(200)
    expect(res.body.messages.map((m: { subject: string }) => m.subject)).toEqual(['Second of two', 'First of two'])
    expect(res.body.messages[1]).toMatchObject({
      envelopeTo: [to],
      envelopeFrom: 'desk@roomwright.test',
      text: expect.stringContaining('plain one'),
      html: expect.stringContaining('<b>one</b>'),
      messageId: expect.stringMatching(/^<.+@.+>$/),
      rawSize: expect.any(Number),
      headers: expect.objectContaining({ subject: 'First of two', to }),
    })
  })
  it.each(['advisor', 'listener'] as const)('a %s gets 403', async (role) => {
    const { c } = await mailAs(role)
    const res = await c.get('/api/dev/mailbox').expect(403)
    expect(res.body.error.code).toBe('forbidden')
  })
  it('signed out gets 401', async () => {
    const c = await mailClient()
    await c.get('/api/dev/mailbox').expect(401)
  })
  it('when the fake SMTP server is not in use, answers 404 even to a supervisor', async () => {
    const { c } = await mailAs('supervisor')
    setConfigForTests({ ...config(), FAKE_SMTP: 'off' })
    try {
      const res = await c.get('/api/dev/mailbox').expect(404)
      expect(res.body.error.code).toBe('not_found')
    } finally {
      setConfigForTests({ ...config(), FAKE_SMTP: 'on' })
    }
  })
  it('an invalid query answers 400 with the field path', async () => {
    const { c } = await mailAs('supervisor')
    const res = await c.get('/api/dev/mailbox?limit=5000').expect(400)
    expect(res.body.error.fields[0].path).toBe('limit')
  })
})

describe('POST /api/inbound/email (a provider\'s inbound webhook)', () => {
  const post = (body: object, secret?: string) => {
    const r = request(app).post('/api/inbound/email')
    if (secret !== undefined) r.set(INBOUND_SECRET_HEADER, secret)
    return r.send(body)
  }
  const mail = (to: string, from: string, text: string) => ({ to, from, subject: 'Re: your case', text })

  it('without the secret header answers 401 and appends nothing', async () => {
    const { caseId, token, listener } = await listenerWithCase()
    const res = await post(mail(`reply+${token}@${REPLY_DOMAIN}`, listener.user.email, 'sneaky')).expect(401)
    expect(res.body.error.code).toBe('bad_inbound_secret')
    const thread = (await listener.c.get(`/api/cases/${caseId}/messages`).expect(200)).body.messages
    expect(thread.some((m: { body: string }) => m.body === 'sneaky')).toBe(false)
  })
  it('with a wrong secret (same length, or another length) answers 401', async () => {
    const { token, listener } = await listenerWithCase()
    const body = mail(`reply+${token}@${REPLY_DOMAIN}`, listener.user.email, 'hello')
    await post(body, SECRET.replace(/.$/, (ch) => (ch === 'x' ? 'y' : 'x'))).expect(401)
    await post(body, 'short').expect(401)
    await post(body, '').expect(401)
  })
  it('with the secret and no CSRF token, appends the stripped reply as the listener\'s message (201)', async () => {
    const { caseId, token, listener } = await listenerWithCase()
    const text = 'The sofa is 80 cm from the back wall.\n\nOn Tue, 4 Jun 2024 at 09:12, Roomwright <desk@roomwright.test> wrote:\n> Where exactly is the seat?'
    const res = await post({ ...mail(`Roomwright <reply+${token}@${REPLY_DOMAIN}>`, `${listener.user.name} <${listener.user.email.toUpperCase()}>`, text) }, SECRET).expect(201)
    expect(res.body).toMatchObject({ accepted: true, caseId })
    const thread = (await listener.c.get(`/api/cases/${caseId}/messages`).expect(200)).body.messages
    const m = thread.find((x: { body: string }) => x.body === 'The sofa is 80 cm from the back wall.')
    expect(m).toMatchObject({ source: 'email', internal: false, author: { id: listener.user.id } })
    expect(await inboundLog(listener.user.email)).toEqual([{ status: 'accepted', reason: null, case_id: caseId, via: 'webhook' }])
  })
  it('an unknown or forged token answers 403 unknown_token and is logged', async () => {
    const { listener } = await listenerWithCase()
    const forged = randomBytes(18).toString('base64url')
    const res = await post(mail(`reply+${forged}@${REPLY_DOMAIN}`, listener.user.email, 'let me in'), SECRET).expect(403)
    expect(res.body.error.code).toBe('unknown_token')
    expect(await inboundLog(listener.user.email)).toEqual([{ status: 'rejected', reason: 'unknown_token', case_id: null, via: 'webhook' }])
  })
  it('a sender who is not the case\'s listener answers 403 sender_mismatch, logged with the case', async () => {
    const { caseId, token, listener } = await listenerWithCase()
    const stranger = `stranger-${randomBytes(4).toString('hex')}@example.test`
    const res = await post(mail(`reply+${token}@${REPLY_DOMAIN}`, stranger, 'I am the listener, honestly'), SECRET).expect(403)
    expect(res.body.error.code).toBe('sender_mismatch')
    expect(await inboundLog(stranger)).toEqual([{ status: 'rejected', reason: 'sender_mismatch', case_id: caseId, via: 'webhook' }])
    const thread = (await listener.c.get(`/api/cases/${caseId}/messages`).expect(200)).body.messages
    expect(thread.some((m: { body: string }) => m.body.includes('honestly'))).toBe(false)
  })
  it("a reply from someone else is held for the team (issue 13, finding 6): an internal note and history entry only staff see, never the listener's message", async () => {
    const { caseId, token, listener } = await listenerWithCase()
    const stranger = `held-${randomBytes(4).toString('hex')}@example.test`
    await post(mail(`reply+${token}@${REPLY_DOMAIN}`, stranger, 'Please send the plan to me instead, 7731'), SECRET).expect(403)
    const { c: advisor } = await signedIn('advisor')
    const staffThread = (await advisor.get(`/api/cases/${caseId}/messages`).expect(200)).body.messages as { body: string; internal: boolean; author: unknown; source: string }[]
    const held = staffThread.find((m) => m.body.includes('7731'))
    expect(held).toMatchObject({ internal: true, author: null, source: 'email' })
    expect(held!.body).toContain(stranger)
    const staffEvents = (await advisor.get(`/api/cases/${caseId}/events`).expect(200)).body.events as { kind: string }[]
    expect(staffEvents.some((e) => e.kind === 'email-held')).toBe(true)
    const listenerThread = await listener.c.get(`/api/cases/${caseId}/messages`).expect(200)
    const listenerEvents = await listener.c.get(`/api/cases/${caseId}/events`).expect(200)
    for (const r of [listenerThread, listenerEvents]) {
      expect(r.text).not.toContain('7731')
      expect(r.text).not.toContain(stranger)
      expect(r.text).not.toContain('email-held')
    }
  })
  it('a reply that is only quoted history answers 422 empty_reply', async () => {
    const { token, listener } = await listenerWithCase()
    const res = await post(mail(`reply+${token}@${REPLY_DOMAIN}`, listener.user.email, '> only the quote\n> of our e-mail'), SECRET).expect(422)
    expect(res.body.error.code).toBe('empty_reply')
  })
  it('a recipient that is no reply address answers 403 no_reply_address', async () => {
    const { listener } = await listenerWithCase()
    const res = await post(mail('desk@roomwright.test', listener.user.email, 'hello'), SECRET).expect(403)
    expect(res.body.error.code).toBe('no_reply_address')
  })
  it('a reply to a closed case answers 422 case_closed and is logged', async () => {
    const { caseId, token, listener } = await listenerWithCase()
    await listener.c.patch(`/api/cases/${caseId}`, { status: 'closed', fromStatus: 'submitted' }).expect(200)
    const res = await post(mail(`reply+${token}@${REPLY_DOMAIN}`, listener.user.email, 'One more thing about the rug.'), SECRET).expect(422)
    expect(res.body.error.code).toBe('case_closed')
    expect(await inboundLog(listener.user.email)).toEqual([{ status: 'rejected', reason: 'case_closed', case_id: caseId, via: 'webhook' }])
  })
  it('a malformed body answers 400 with field paths', async () => {
    const res = await post({ to: 'reply+x@y', subject: 5 }, SECRET).expect(400)
    expect(res.body.error.fields.map((f: { path: string }) => f.path).sort()).toEqual(['from', 'subject'])
  })
})

describe('reply by e-mail through the fake SMTP server, end to end', () => {
  it('the advisor\'s reply arrives in the mailbox with the case reply address; the listener\'s answer lands in the thread', async () => {
    const { listener, caseId, token } = await listenerWithCase('Flutter echo between bare walls')
    const advisor = await signedIn('advisor')
    const xss = 'Try a rug. <script>alert("x")</script><img src=x onerror="alert(1)"> [see](javascript:alert(2))'
    await advisor.c.post(`/api/cases/${caseId}/messages`, { body: xss }).expect(201)
    await advisor.c.post(`/api/cases/${caseId}/messages`, { body: 'Internal: listener seems to have a concrete floor', internal: true }).expect(201)

    const rows = await q<{ id: string; kind: string; text: string }>("SELECT id, kind, text FROM email_outbox WHERE case_id = $1 AND kind IN ('reply', 'info-requested') ORDER BY created_at", [caseId])
    expect(rows.map((r) => r.kind)).toEqual(['reply']) // the internal note sent no e-mail
    expect(rows.some((r) => r.text.includes('concrete floor'))).toBe(false)
    expect(['sent', 'already-sent']).toContain(await deliverOutboxEmail(rows[0].id))

    const sup = await mailAs('supervisor')
    const box = (await sup.c.get(`/api/dev/mailbox?to=${encodeURIComponent(listener.user.email)}`).expect(200)).body.messages
    const reply = box.find((m: { subject: string }) => m.subject.includes('answered on'))
    expect(reply).toBeDefined()
    expect(reply.headers['reply-to']).toBe(`reply+${token}@${REPLY_DOMAIN}`)
    expect(reply.text).toMatch(/reply to this e-mail to answer in the case/i)
    expect(reply.html).toContain(`https://desk.mailtests.roomwright.test/cases/${caseId}`)
    const { document } = new JSDOM(reply.html).window
    expect(document.querySelectorAll('script').length).toBe(0)
    expect([...document.querySelectorAll('*')].flatMap((el) => [...el.attributes]).filter((a) => /^on/i.test(a.name) || /^\s*javascript:/i.test(a.value))).toEqual([])
    expect(reply.html).not.toContain('concrete floor')

    // The listener answers from their mail client, quoting the e-mail as clients do.
    const quoted = reply.text.split('\n').map((l: string) => `> ${l}`).join('\n')
    await smtpTo().sendMail({
      from: `${listener.user.name} <${listener.user.email}>`,
      to: reply.headers['reply-to'],
      subject: `Re: ${reply.subject}`,
      text: `A rug is down now; the flutter is much less.\n\nOn Wed, 5 Jun 2024 at 18:40, Roomwright <desk@roomwright.test> wrote:\n${quoted}`,
      inReplyTo: reply.messageId,
    })
    const thread = (await listener.c.get(`/api/cases/${caseId}/messages`).expect(200)).body.messages
    const answer = thread.find((m: { source: string }) => m.source === 'email')
    expect(answer).toMatchObject({ body: 'A rug is down now; the flutter is much less.', author: { id: listener.user.id } })
    expect(await inboundLog(listener.user.email)).toEqual([{ status: 'accepted', reason: null, case_id: caseId, via: 'smtp' }])
  })

  it('an out-of-office reply to the case address is kept in the mailbox but not added to the thread', async () => {
    const { listener, caseId, token } = await listenerWithCase()
    await smtpTo().sendMail({
      from: listener.user.email,
      to: `reply+${token}@${REPLY_DOMAIN}`,
      subject: 'Out of office',
      text: 'I am away until Monday.',
      headers: { 'Auto-Submitted': 'auto-replied' },
    })
    const thread = (await listener.c.get(`/api/cases/${caseId}/messages`).expect(200)).body.messages
    expect(thread.some((m: { body: string }) => m.body.includes('away until Monday'))).toBe(false)
    expect(await inboundLog(listener.user.email)).toEqual([{ status: 'rejected', reason: 'auto_reply', case_id: caseId, via: 'smtp' }])
  })
})
