import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from 'vitest'
import { SMTPServer } from 'smtp-server'
import type { AddressInfo } from 'node:net'
import { QueryTypes, type Transaction } from 'sequelize'
import { config, setConfigForTests } from '../../server/config'
import { db } from '../../server/db/sequelize'
import { jobs, startWorkers, stopJobs } from '../../server/jobs/queue'
import { startFakeSmtp, type FakeSmtp } from '../../server/mail/fake-smtp'
import { queueEmail, type QueueEmailInput } from '../../server/mail/outbox'
import { deliverOutboxEmail, MailDeliveryError, sweepOutbox } from '../../server/mail/deliver'
import { DELIVER_QUEUE } from '../../server/mail/queues'
import { updateUser } from '../../server/data/users'
import { closeTestApp, signedIn } from '../helpers/api'
import { openCase } from '../helpers/cases'
import { models, minutesAgo } from '../helpers/rows'
import { waitFor as poll } from '../helpers/wait'

const REPLY_DOMAIN = 'reply.delivery.roomwright.test'
let fake: FakeSmtp | undefined
let smtpPort = 0
const base = config()

beforeAll(async () => {
  fake = await startFakeSmtp({ port: 0, host: '127.0.0.1', inbound: async () => undefined })
  smtpPort = fake.port
  setConfigForTests({ ...base, SMTP_HOST: '127.0.0.1', SMTP_PORT: smtpPort, MAIL_REPLY_DOMAIN: REPLY_DOMAIN, MAIL_FROM: 'Roomwright <desk@delivery.roomwright.test>', PUBLIC_URL: 'https://desk.delivery.roomwright.test' })
})
afterAll(async () => {
  await fake?.stop()
  await stopJobs()
  await closeTestApp()
})

const q = <T extends object>(sql: string, bind: unknown[] = []) => db().query<T>(sql, { bind, type: QueryTypes.SELECT })
interface OutboxRow { id: string; status: string; attempts: number; last_error: string | null; message_id: string; reply_to: string | null; subject: string; sent_at: Date | null; job_id: string | null; to_user_id: string | null }
const outbox = async (id: string) => (await q<OutboxRow>('SELECT * FROM email_outbox WHERE id = $1', [id]))[0]
const received = (messageId: string) => q<{ id: string; envelope_to: string[]; subject: string; headers: Record<string, string>; html: string; text: string }>('SELECT * FROM dev_mailbox WHERE message_id = $1', [messageId])
const jobExists = async (jobId: string) => (await q('SELECT 1 FROM pgboss.job WHERE id = $1', [jobId])).length > 0

/** A listener, their submitted case and its reply token. */
async function caseFixture(title = 'Boom at 43 Hz in the attic room') {
  const listener = await signedIn('listener')
  const { case: c } = await openCase(listener.c, { title })
  const [{ reply_token }] = await q<{ reply_token: string }>('SELECT reply_token FROM cases WHERE id = $1', [c.id])
  return { listener: listener.user, caseId: c.id, token: reply_token }
}
const replyInput = (f: Awaited<ReturnType<typeof caseFixture>>, body = 'Move the sofa 40 cm forward.'): QueueEmailInput => ({
  to: f.listener.email,
  toUserId: f.listener.id,
  kind: 'reply',
  caseId: f.caseId,
  vars: { advisorName: 'Odile Brenner', body },
})

/**
 * Queues an e-mail and removes its pg-boss job in the same transaction, so that no worker (in this
 * or another test process) delivers it before the test does: here the test plays the worker.
 */
async function queueForTest(input: QueueEmailInput) {
  return db().transaction(async (t: Transaction) => {
    const r = await queueEmail(input, { transaction: t })
    if (!r.queued) throw new Error(`not queued: ${r.reason}`)
    await db().query('DELETE FROM pgboss.job WHERE id = $1', { bind: [r.jobId], transaction: t })
    return r
  })
}

describe('queueEmail — the transactional outbox', () => {
  it('writes the row and its delivery job when the transaction commits', async () => {
    const f = await caseFixture()
    const r = await db().transaction((t) => queueEmail(replyInput(f), { transaction: t }))
    if (!r.queued) throw new Error('expected the e-mail to be queued')
    const row = await outbox(r.id)
    expect(row).toMatchObject({ status: 'queued', attempts: 0, to_user_id: f.listener.id, reply_to: `reply+${f.token}@${REPLY_DOMAIN}`, message_id: `<${r.id}@delivery.roomwright.test>`, job_id: r.jobId })
    expect(row.subject).toContain('Boom at 43 Hz in the attic room')
    expect(await jobExists(r.jobId!)).toBe(true)
    const job = await (await jobs()).getJobById<{ outboxId: string }>(DELIVER_QUEUE, r.jobId!)
    expect(job?.data).toEqual({ outboxId: r.id })
    expect(job).toMatchObject({ retryLimit: 20, retryBackoff: true })
  })
  it('leaves neither row nor job when the transaction rolls back', async () => {
    const f = await caseFixture()
    let seen: { id: string; jobId: string | null } | undefined
    await expect(
      db().transaction(async (t) => {
        const r = await queueEmail(replyInput(f), { transaction: t })
        if (r.queued) seen = { id: r.id, jobId: r.jobId }
        throw new Error('the change failed after the e-mail was queued')
      }),
    ).rejects.toThrow('the change failed')
    expect(seen?.jobId).toBeTruthy()
    expect(await outbox(seen!.id)).toBeUndefined()
    expect(await jobExists(seen!.jobId!)).toBe(false)
  })
  it('skips optional kinds for a user who turned optional e-mails off, but still sends essential ones', async () => {
    const f = await caseFixture()
    await updateUser(f.listener.id, { emailOptional: false })
    const status = await queueEmail({ to: f.listener.email, toUserId: f.listener.id, kind: 'status-changed', caseId: f.caseId, vars: { status: 'closed' } })
    expect(status).toEqual({ queued: false, reason: 'opted_out' })
    const reply = await queueEmail(replyInput(f))
    expect(reply.queued).toBe(true)
    const kinds = await q<{ kind: string }>('SELECT kind FROM email_outbox WHERE to_user_id = $1 ORDER BY created_at', [f.listener.id])
    // 'status-changed' here can only be the one queued on submission, before the switch was turned off.
    expect(kinds.filter((k) => k.kind === 'status-changed').length).toBeLessThanOrEqual(1)
    expect(kinds.filter((k) => k.kind === 'reply').length).toBe(1)
  })
  it('a case kind without a case is an error, and nothing is written', async () => {
    const f = await caseFixture()
    await expect(queueEmail({ ...replyInput(f), caseId: undefined })).rejects.toThrow(/needs the caseId/)
  })
})

describe('deliverOutboxEmail — through a real SMTP server', () => {
  it('sends once with the stored Message-ID, Reply-To and case threading, then is idempotent', async () => {
    const f = await caseFixture('Flutter echo between bare walls')
    const r = await queueForTest(replyInput(f, 'Hang a **rug** on the side wall.'))
    expect(await deliverOutboxEmail(r.id)).toBe('sent')
    expect(await deliverOutboxEmail(r.id)).toBe('already-sent')
    const row = await outbox(r.id)
    expect(row).toMatchObject({ status: 'sent', attempts: 1, last_error: null })
    expect(row.sent_at).toBeTruthy()
    const got = await received(r.messageId)
    expect(got).toHaveLength(1)
    expect(got[0].envelope_to).toEqual([f.listener.email])
    expect(got[0].headers['reply-to']).toBe(`reply+${f.token}@${REPLY_DOMAIN}`)
    expect(got[0].headers['references']).toBe(`<case-${f.caseId}@delivery.roomwright.test>`)
    expect(got[0].headers['auto-submitted']).toBe('auto-generated')
    expect(got[0].html).toContain('<strong>rug</strong>')
    expect(got[0].text).toContain('Hang a **rug** on the side wall.')
    expect(got[0].subject).toBe(row.subject)
  })

  it('survives a stopped SMTP server: records each failure, retries, and delivers exactly once when it is back', async () => {
    const f = await caseFixture()
    const r = await queueForTest(replyInput(f, 'Try the seat at 38 % of the room length.'))
    await fake!.stop()
    fake = undefined
    for (const n of [1, 2]) {
      await expect(deliverOutboxEmail(r.id)).rejects.toBeInstanceOf(MailDeliveryError)
      const row = await outbox(r.id)
      expect(row).toMatchObject({ status: 'queued', attempts: n })
      expect(row.last_error).toMatch(/ECONNREFUSED|ESOCKET|connect/i)
    }
    fake = await startFakeSmtp({ port: smtpPort, host: '127.0.0.1', inbound: async () => undefined })
    expect(await deliverOutboxEmail(r.id)).toBe('sent')
    expect(await deliverOutboxEmail(r.id)).toBe('already-sent')
    expect(await outbox(r.id)).toMatchObject({ status: 'sent', attempts: 3, last_error: null })
    expect(await received(r.messageId)).toHaveLength(1)
  })

  it('two workers delivering the same row at once send it once', async () => {
    const f = await caseFixture()
    const r = await queueForTest(replyInput(f))
    const outcomes = await Promise.all([deliverOutboxEmail(r.id), deliverOutboxEmail(r.id), deliverOutboxEmail(r.id)])
    expect(outcomes.filter((o) => o === 'sent')).toHaveLength(1)
    expect(outcomes.every((o) => ['sent', 'busy', 'already-sent'].includes(o))).toBe(true)
    expect(await received(r.messageId)).toHaveLength(1)
  })

  it('a permanent refusal (550) marks the row failed without retrying', async () => {
    const refusing = new SMTPServer({
      authOptional: true,
      disabledCommands: ['AUTH', 'STARTTLS'],
      logger: false,
      onRcptTo: (_addr, _session, cb) => cb(Object.assign(new Error('No such mailbox here'), { responseCode: 550 })),
    })
    await new Promise<void>((res) => refusing.listen(0, '127.0.0.1', () => res()))
    const port = (refusing.server.address() as AddressInfo).port
    setConfigForTests({ ...config(), SMTP_PORT: port })
    try {
      const f = await caseFixture()
      const r = await queueForTest(replyInput(f))
      expect(await deliverOutboxEmail(r.id)).toBe('failed')
      const row = await outbox(r.id)
      expect(row).toMatchObject({ status: 'failed', attempts: 1 })
      expect(row.last_error).toContain('550')
      expect(await deliverOutboxEmail(r.id)).toBe('failed')
      expect((await outbox(r.id)).attempts).toBe(1)
    } finally {
      setConfigForTests({ ...config(), SMTP_PORT: smtpPort })
      await new Promise<void>((res) => refusing.close(() => res()))
    }
  })

  it('an unknown outbox id is "missing", not an error', async () => {
    expect(await deliverOutboxEmail('00000000-0000-4000-8000-00000000beef')).toBe('missing')
  })
})

describe("the sweep's quiet window is measured by the database's clock", () => {
  const HOUR = 3_600_000
  /** This process's clock (Date only; timers keep running) moved by `ms`, as on a node whose clock is off. */
  const skewNodeClock = (ms: number) => vi.useFakeTimers({ toFake: ['Date'], now: Date.now() + ms })
  afterEach(() => vi.useRealTimers())
  const ageBy = (id: string, minutes: number) => db().query(`UPDATE email_outbox SET updated_at = now() - make_interval(mins => $2) WHERE id = $1`, { bind: [id, minutes] })

  it('a row quiet for 10 minutes by the database is re-queued by a node whose clock is an hour slow', async () => {
    const r = await queueForTest(replyInput(await caseFixture(), 'Swept by the slow node.'))
    await ageBy(r.id, 10)
    skewNodeClock(-HOUR)
    await sweepOutbox({ quietSeconds: 300 })
    vi.useRealTimers()
    const row = await outbox(r.id)
    expect(row.job_id).not.toBe(r.jobId)
    expect(row.job_id).not.toBeNull()
  })

  it('a row touched a minute ago by the database is left alone by a node whose clock is an hour fast', async () => {
    const r = await queueForTest(replyInput(await caseFixture(), 'Left alone by the fast node.'))
    await ageBy(r.id, 1)
    skewNodeClock(HOUR)
    await sweepOutbox({ quietSeconds: 300 })
    vi.useRealTimers()
    expect((await outbox(r.id)).job_id).toBe(r.jobId)
  })
})

describe('with pg-boss workers running', () => {
  beforeAll(async () => {
    await import('../../server/mail/worker')
    await startWorkers()
  })

  /**
   * Other test files queue e-mails too (every submitted case sends one), and a worker takes jobs one
   * at a time in order of priority, then age; lifting this test's job to the front keeps the wait
   * independent of that backlog.
   */
  const first = (jobId: string | null) => db().query('UPDATE pgboss.job SET priority = 100 WHERE id = $1', { bind: [jobId] })

  const waitFor = <T>(what: string, fn: () => Promise<T | undefined | false>, ms = 20_000) => poll(what, fn, ms, 200)

  it('a committed e-mail is delivered by the job, once', async () => {
    const f = await caseFixture()
    const r = await queueEmail(replyInput(f, 'Delivered by the worker.'))
    if (!r.queued) throw new Error('expected the e-mail to be queued')
    await first(r.jobId)
    await waitFor('the e-mail to be sent', async () => (await outbox(r.id)).status === 'sent')
    expect(await received(r.messageId)).toHaveLength(1)
  })

  it('the sweep re-queues a queued row whose job was lost, and the worker then delivers it', async () => {
    const f = await caseFixture()
    const r = await queueForTest(replyInput(f, 'My job was lost.'))
    await models().EmailOutbox.update({ updatedAt: minutesAgo(10) }, { where: { id: r.id } })
    const swept = await sweepOutbox({ quietSeconds: 300 })
    expect(swept.requeued).toBeGreaterThanOrEqual(1)
    const row = await outbox(r.id)
    expect(row.job_id).not.toBe(r.jobId)
    await first(row.job_id)
    await waitFor('the swept e-mail to be sent', async () => (await outbox(r.id)).status === 'sent')
    expect(await received(r.messageId)).toHaveLength(1)
    // A second sweep finds nothing more to do for it.
    await models().EmailOutbox.update({ updatedAt: minutesAgo(10) }, { where: { id: r.id } })
    await sweepOutbox({ quietSeconds: 300 })
    expect((await outbox(r.id)).status).toBe('sent')
    expect(await received(r.messageId)).toHaveLength(1)
  })
})
