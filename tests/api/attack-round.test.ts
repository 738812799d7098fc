import { afterAll, describe, expect, it } from 'vitest'
import request from 'supertest'
import { performance } from 'node:perf_hooks'
import { QueryTypes } from 'sequelize'
import nodemailer from 'nodemailer'

// Findings of our own break-in round (SECURITY.md "Findings of our own review"). Small budgets so the
// limit tests stay short; TRUST_PROXY lets each test speak from its own client address.
process.env.LOGIN_RATE_LIMIT = '4'
process.env.TRUST_PROXY = 'true'
const SECRET = 'attack-round-inbound-secret-0123456789'
process.env.INBOUND_EMAIL_SECRET = SECRET
const { client, closeTestApp, makeUser, signedIn, testApp, uniqueEmail } = await import('../helpers/api')
const { openCase } = await import('../helpers/cases')
const { setConfigForTests, loadConfig, config } = await import('../../server/config')
setConfigForTests(loadConfig())
const { db } = await import('../../server/db/sequelize')
const { INBOUND_SECRET_HEADER } = await import('../../server/routes/mail')
const { bcryptRounds, registerListener } = await import('../../server/services/auth')
const { startFakeSmtp } = await import('../../server/mail/fake-smtp')

afterAll(closeTestApp)

const sidOf = (res: request.Response) => (res.headers['set-cookie'] as unknown as string[] | undefined)?.find((c) => c.startsWith('rw.sid='))?.split(';')[0]

describe('session fixation: a password change renews the session id (OWASP session management)', () => {
  it('after POST /api/auth/password the old cookie no longer signs anyone in; the new one does', async () => {
    const u = await makeUser('listener')
    const agent = request.agent(testApp())
    const csrf = (await agent.get('/api/auth/csrf').expect(200)).body.token
    const before = sidOf(await agent.post('/api/auth/login').set('X-CSRF-Token', csrf).send({ email: u.email, password: u.password }).expect(200))
    expect(before).toBeDefined()
    const changed = await agent.post('/api/auth/password').set('X-CSRF-Token', csrf).send({ currentPassword: u.password, newPassword: 'quartz-meadow-lantern-58' }).expect(200)
    const after = sidOf(changed)
    expect(after).toBeDefined()
    expect(after).not.toBe(before)
    await request(testApp()).get('/api/auth/me').set('Cookie', before!).expect(401)
    expect((await request(testApp()).get('/api/auth/me').set('Cookie', after!).expect(200)).body.id).toBe(u.id)
    // the page goes on working with the CSRF token it has
    await agent.patch('/api/auth/preferences').set('X-CSRF-Token', csrf).send({ units: 'imperial' }).expect(200)
  })
})

describe('sign-up does not tell by its timing whether an address has an account', () => {
  // Same method as sign-in-timing.test.ts: the ratio of two medians at the production cost factor, not a
  // wall-clock bound. Before the fix a taken address answered without hashing (ratio far above 10).
  it('with the production cost factor, a taken address and a free one take alike (medians within a factor 1.6)', async () => {
    const before = process.env.NODE_ENV
    process.env.NODE_ENV = 'production'
    try {
      expect(bcryptRounds()).toBe(12)
      const taken = await makeUser('listener')
      const password = 'harbour-velvet-cinder-72'
      const time = async (email: string, ok: boolean) => {
        const t = performance.now()
        await registerListener({ email, name: 'Timing Listener', password }).then(() => expect(ok).toBe(true), (e) => expect((e as { code?: string }).code).toBe('email_taken'))
        return performance.now() - t
      }
      await time(uniqueEmail('warm'), true)
      const takenMs: number[] = []
      const freeMs: number[] = []
      for (let i = 0; i < 5; i++) {
        takenMs.push(await time(taken.email, false))
        freeMs.push(await time(uniqueEmail('free'), true))
      }
      const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]
      const ratio = median(freeMs) / median(takenMs)
      expect(ratio, `medians ${median(freeMs).toFixed(0)} ms (free) vs ${median(takenMs).toFixed(0)} ms (taken)`).toBeLessThan(1.6)
      expect(ratio).toBeGreaterThan(1 / 1.6)
    } finally {
      process.env.NODE_ENV = before
    }
  }, 120_000)
})

describe('the inbound reply webhook', () => {
  const post = (body: object, secret: string, from = '198.51.100.200') =>
    request(testApp()).post('/api/inbound/email').set(INBOUND_SECRET_HEADER, secret).set('X-Forwarded-For', from).send(body)

  it('refuses a reply from a switched-off listener (403 listener_inactive), by e-mail as on the web', async () => {
    const listener = await signedIn('listener')
    const { case: c } = await openCase(listener.c)
    const [{ reply_token: token }] = await db().query<{ reply_token: string }>('SELECT reply_token FROM cases WHERE id = $1', { bind: [c.id], type: QueryTypes.SELECT })
    const sup = await signedIn('supervisor')
    await sup.c.post(`/api/team/members/${listener.user.id}/deactivate`).expect(200)
    const res = await post({ to: `reply+${token}@${config().MAIL_REPLY_DOMAIN}`, from: listener.user.email, subject: 'Re: case', text: 'written after being switched off' }, SECRET).expect(403)
    expect(res.body.error.code).toBe('listener_inactive')
    const [{ n }] = await db().query<{ n: string }>('SELECT count(*) AS n FROM messages WHERE case_id = $1 AND body = $2', { bind: [c.id, 'written after being switched off'], type: QueryTypes.SELECT })
    expect(Number(n)).toBe(0)
  })

  it('a reply whose sender the receiving server found forged (RFC 8601 dmarc=fail, or spf=fail without dkim=pass) is held for the team, not posted as the listener', async () => {
    const listener = await signedIn('listener')
    const { case: c } = await openCase(listener.c)
    const [{ reply_token: token }] = await db().query<{ reply_token: string }>('SELECT reply_token FROM cases WHERE id = $1', { bind: [c.id], type: QueryTypes.SELECT })
    const to = `reply+${token}@${config().MAIL_REPLY_DOMAIN}`
    const forged = await post({ to, from: listener.user.email, subject: 'Re: case', text: 'Please send the panels to my new address', authenticationResults: `mx.example.net; spf=fail smtp.mailfrom=${listener.user.email}; dkim=none; dmarc=fail header.from=example.test` }, SECRET, '198.51.100.201').expect(403)
    expect(forged.body.error.code).toBe('sender_unverified')
    const softly = await post({ to, from: listener.user.email, subject: 'Re: case', text: 'SPF failed but the signature holds', authenticationResults: 'mx.example.net; spf=fail smtp.mailfrom=example.test; dkim=pass header.d=example.test' }, SECRET, '198.51.100.201').expect(201)
    expect(softly.body.accepted).toBe(true)
    const thread = (await listener.c.get(`/api/cases/${c.id}/messages`).expect(200)).body.messages as { body: string }[]
    expect(thread.some((m) => m.body.includes('new address'))).toBe(false)
    expect(thread.some((m) => m.body === 'SPF failed but the signature holds')).toBe(true)
    const advisor = await signedIn('advisor')
    const staffThread = (await advisor.c.get(`/api/cases/${c.id}/messages`).expect(200)).body.messages as { body: string; internal: boolean }[]
    expect(staffThread.find((m) => m.body.includes('new address'))).toMatchObject({ internal: true })
  })

  it('wrong secrets are limited per address (4 here, then 429); the right secret is never counted nor limited, even many at once', async () => {
    const body = { to: `reply+nothing@${config().MAIL_REPLY_DOMAIN}`, from: 'someone@example.test', subject: 'x', text: 'x' }
    for (let i = 0; i < 4; i++) await post(body, `guess-${i}-0123456789abcdef`, '203.0.113.90').expect(401)
    expect((await post(body, 'guess-4-0123456789abcdef', '203.0.113.90').expect(429)).body.error.code).toBe('rate_limited')
    // the provider behind the same address still gets through (403: no case has that token)
    await post(body, SECRET, '203.0.113.90').expect(403)
    // right-secret posts in flight together never count: afterwards the address still has its 4 wrong tries
    await Promise.all(Array.from({ length: 10 }, () => post(body, SECRET, '203.0.113.92').expect(403)))
    for (let i = 0; i < 4; i++) await post(body, `guess-${i}-0123456789abcdef`, '203.0.113.92').expect(401)
    await post(body, 'guess-4-0123456789abcdef', '203.0.113.92').expect(429)
  })
})

describe('a replayed inbound e-mail is taken in once per case (inbound_email_receipts, migration 0100)', () => {
  const post = (body: object, from = '198.51.100.210') =>
    request(testApp()).post('/api/inbound/email').set(INBOUND_SECRET_HEADER, SECRET).set('X-Forwarded-For', from).send(body)
  const caseWithToken = async () => {
    const listener = await signedIn('listener')
    const { case: c } = await openCase(listener.c)
    const [{ reply_token: token }] = await db().query<{ reply_token: string }>('SELECT reply_token FROM cases WHERE id = $1', { bind: [c.id], type: QueryTypes.SELECT })
    return { listener, caseId: c.id, to: `reply+${token}@${config().MAIL_REPLY_DOMAIN}` }
  }
  const count = async (caseId: string, body: string) => Number((await db().query<{ n: string }>('SELECT count(*) AS n FROM messages WHERE case_id = $1 AND body LIKE $2', { bind: [caseId, `%${body}%`], type: QueryTypes.SELECT }))[0].n)

  it('the same Message-ID posted again to the webhook answers 200 duplicate with the first message id and adds nothing (before: a second message)', async () => {
    const { listener, caseId, to } = await caseWithToken()
    const mail = { to, from: listener.user.email, subject: 'Re: your case', text: 'The panels went up on Saturday, the flutter is gone.', messageId: '<CAF7q-replay-41@mail.example.test>' }
    const first = await post(mail).expect(201)
    const again = await post(mail).expect(200)
    expect(again.body).toEqual({ accepted: true, caseId, messageId: first.body.messageId, duplicate: true })
    // the same id written differently (no angle brackets, folded) and another text is still the same e-mail
    await post({ ...mail, messageId: ' CAF7q-replay-41@mail.example.test ', text: 'tampered text' }).expect(200)
    expect(await count(caseId, 'panels went up on Saturday')).toBe(1)
    expect(await count(caseId, 'tampered text')).toBe(0)
    const events = await db().query<{ n: string }>("SELECT count(*) AS n FROM case_events WHERE case_id = $1 AND kind = 'message'", { bind: [caseId], type: QueryTypes.SELECT })
    expect(Number(events[0].n)).toBe(1)
    // another Message-ID is another e-mail
    await post({ ...mail, messageId: '<CAF7q-replay-42@mail.example.test>' }).expect(201)
    expect(await count(caseId, 'panels went up on Saturday')).toBe(2)
  })

  it('five deliveries of one e-mail at the same moment add one message (the unique constraint decides, not a prior read)', async () => {
    const { listener, caseId, to } = await caseWithToken()
    const mail = { to, from: listener.user.email, subject: 'Re: case', text: 'Concurrent replay of the bass trap answer', messageId: '<race-7731@mail.example.test>' }
    // each from its own address: the wrong-secret limiter counts every request until it is answered
    const answers = await Promise.all([1, 2, 3, 4, 5].map((i) => post(mail, `198.51.100.${220 + i}`)))
    expect(answers.map((a) => a.status).sort()).toEqual([200, 200, 200, 200, 201])
    expect(new Set(answers.map((a) => a.body.messageId)).size).toBe(1)
    expect(await count(caseId, 'Concurrent replay of the bass trap answer')).toBe(1)
  })

  it('without a Message-ID, the same headers and text count as the same e-mail (normalised hash); other words are a new one', async () => {
    const { listener, caseId, to } = await caseWithToken()
    const mail = { to, from: `Listener <${listener.user.email.toUpperCase()}>`, subject: 'Re:  the  case', date: 'Thu, 03 Dec 2026 09:12:00 +0000', text: 'No id here: the sofa moved 40 cm forward.' }
    await post(mail).expect(201)
    // CRLF line ends, trailing spaces, another spelling of the same Date and the address in another case: still the same e-mail
    await post({ ...mail, from: listener.user.email, subject: 'Re: the case', date: 'Thu, 3 Dec 2026 10:12:00 +0100', text: 'No id here: the sofa moved 40 cm forward.  \r\n' }).expect(200)
    expect(await count(caseId, 'sofa moved 40 cm forward')).toBe(1)
    await post({ ...mail, text: 'No id here: the sofa moved 60 cm forward.' }).expect(201)
    expect(await count(caseId, 'sofa moved 60 cm forward')).toBe(1)
  })

  it('a held e-mail from a stranger replayed is not held twice: the same 403 sender_mismatch, one internal note', async () => {
    const { caseId, to } = await caseWithToken()
    const mail = { to, from: 'stranger-replay@example.test', subject: 'Re: case', text: 'Send the panels to this other address', messageId: '<held-once@example.test>' }
    expect((await post(mail).expect(403)).body.error.code).toBe('sender_mismatch')
    expect((await post(mail).expect(403)).body.error.code).toBe('sender_mismatch')
    expect(await count(caseId, 'Send the panels to this other address')).toBe(1)
    const held = await db().query<{ n: string }>("SELECT count(*) AS n FROM case_events WHERE case_id = $1 AND kind = 'email-held'", { bind: [caseId], type: QueryTypes.SELECT })
    expect(Number(held[0].n)).toBe(1)
  })

  it('the same message delivered twice by SMTP (and once more through the webhook) is one message in the thread', async () => {
    const { listener, caseId, to } = await caseWithToken()
    const fake = await startFakeSmtp({ port: 0, host: '127.0.0.1' })
    try {
      const smtp = nodemailer.createTransport({ host: '127.0.0.1', port: fake.port, secure: false, ignoreTLS: true })
      const mail = { from: listener.user.email, to, subject: 'Re: case', text: 'Measured again after the rug: 4 dB less at 63 Hz.', messageId: '<smtp-twice-9@mail.example.test>' }
      await smtp.sendMail(mail)
      await smtp.sendMail(mail)
      await post({ ...mail }).expect(200)
    } finally {
      await fake.stop()
    }
    expect(await count(caseId, '4 dB less at 63 Hz')).toBe(1)
    const log = await db().query<{ status: string; reason: string | null; via: string }>('SELECT status, reason, via FROM inbound_email_log WHERE case_id = $1 ORDER BY id', { bind: [caseId], type: QueryTypes.SELECT })
    expect(log).toEqual([{ status: 'accepted', reason: null, via: 'smtp' }, { status: 'accepted', reason: 'duplicate', via: 'smtp' }, { status: 'accepted', reason: 'duplicate', via: 'webhook' }])
  })
})

describe('sign-up answers', () => {
  it('a taken address answers 409 email_taken and nothing about the account (no id, no name)', async () => {
    const taken = await makeUser('listener', 'Hidden Name Odalys')
    const c = await client()
    const res = await c.agent.post('/api/auth/register').set('X-CSRF-Token', c.csrf).set('X-Forwarded-For', '192.0.2.201').send({ email: taken.email, name: 'X Y', password: 'harbour-velvet-cinder-72' }).expect(409)
    expect(JSON.stringify(res.body)).not.toContain('Odalys')
    expect(JSON.stringify(res.body)).not.toContain(taken.id)
  })
})
