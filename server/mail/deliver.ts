import nodemailer, { type Transporter } from 'nodemailer'
import { Op, Transaction } from 'sequelize'
import { config } from '../config'
import { db } from '../db/sequelize'
import { models } from '../db/models'
import { dbNow, dbNowPlus } from '../db/models/now'
import { jobs } from '../jobs/queue'
import { log } from '../lib/log'
import { DELIVER_QUEUE, DELIVERY_POLICY, MAX_ATTEMPTS, enqueueInTransaction, ensureMailQueues } from './queues'
import { mailDomain } from './outbox'

/**
 * Delivery of the outbox: why an e-mail is never lost and (almost) never sent twice.
 *
 * - Never lost: the outbox row and its pg-boss job are written in the transaction of the change
 *   (server/mail/outbox.ts). A failed send leaves the row 'queued' and throws, so pg-boss retries
 *   with backoff; a process that dies mid-send leaves its job active until it expires, and pg-boss
 *   retries it then; a job that is gone for any other reason is re-queued by the sweep below.
 * - Never twice: the handler locks the row (FOR UPDATE SKIP LOCKED), so two workers never send the
 *   same row at once; a row already 'sent' is done; the row is marked sent in the same transaction
 *   right after the SMTP server's 250 reply. The one window left is a crash between that 250 and the
 *   commit: delivery is at-least-once, and the retry carries the same Message-ID (fixed when the
 *   row was written), by which a receiving system or mail client can recognise the duplicate
 *   (RFC 5322 §3.6.4: a Message-ID identifies one message).
 * - Permanent refusals (SMTP 5yz other than authentication, RFC 5321 §4.2.1) are not retried: the
 *   row is marked failed with the server's answer, as is a row that used up every attempt.
 */

export type DeliveryOutcome = 'sent' | 'already-sent' | 'failed' | 'busy' | 'missing'

export class MailDeliveryError extends Error {}

let cached: { key: string; transport: Transporter } | undefined
/** The nodemailer SMTP transport for the configured server (rebuilt when the settings change). */
export function mailTransport(): Transporter {
  const c = config()
  const key = [c.SMTP_HOST, c.SMTP_PORT, c.SMTP_SECURE, c.SMTP_USER ?? '', c.SMTP_PASS ?? ''].join('\u0000')
  if (cached?.key !== key) {
    cached?.transport.close()
    cached = {
      key,
      transport: nodemailer.createTransport({
        host: c.SMTP_HOST,
        port: c.SMTP_PORT,
        secure: c.SMTP_SECURE,
        auth: c.SMTP_USER ? { user: c.SMTP_USER, pass: c.SMTP_PASS ?? '' } : undefined,
        connectionTimeout: 10_000,
        greetingTimeout: 10_000,
        socketTimeout: 60_000,
      }),
    }
  }
  return cached.transport
}


const AUTH_CODES = new Set([530, 534, 535, 538])
/** SMTP 5yz is a permanent refusal (RFC 5321 §4.2.1), except authentication trouble, which is ours to fix. */
function isPermanent(e: unknown): boolean {
  const code = (e as { responseCode?: number })?.responseCode
  return typeof code === 'number' && code >= 500 && code < 600 && !AUTH_CODES.has(code)
}
const describe = (e: unknown) => {
  const err = e as { message?: string; code?: string; responseCode?: number }
  return [err.code, err.responseCode, err.message ?? String(e)].filter(Boolean).join(' ').slice(0, 2000)
}
/** Lower bound of pg-boss's wait before retry n (see DELIVERY_POLICY), seconds. */
const retryWaitSeconds = (attempt: number) => (DELIVERY_POLICY.retryDelay * 2 ** Math.min(16, attempt)) / 2

/**
 * The delivery job: sends one outbox row. Resolves with what happened; rejects (so that pg-boss
 * retries) when the SMTP server could not be reached or answered with a temporary error.
 */
export async function deliverOutboxEmail(outboxId: string): Promise<DeliveryOutcome> {
  const sequelize = db()
  const result = await sequelize.transaction(async (t) => {
    const { EmailOutbox } = models()
    const row = await EmailOutbox.findByPk(outboxId, { transaction: t, lock: Transaction.LOCK.UPDATE, skipLocked: true })
    if (!row) {
      const exists = await EmailOutbox.count({ where: { id: outboxId }, transaction: t })
      return { outcome: (exists ? 'busy' : 'missing') as DeliveryOutcome }
    }
    if (row.status === 'sent') return { outcome: 'already-sent' as const }
    if (row.status === 'failed') return { outcome: 'failed' as const }

    const attempt = row.attempts + 1
    try {
      const info = await mailTransport().sendMail({
        from: config().MAIL_FROM,
        to: row.toAddress,
        subject: row.subject,
        html: row.html,
        text: row.text,
        replyTo: row.replyTo ?? undefined,
        messageId: row.messageId,
        references: row.caseId ? `<case-${row.caseId}@${mailDomain()}>` : undefined,
        headers: { 'Auto-Submitted': 'auto-generated', 'X-Roomwright-Kind': row.kind },
      })
      await row.update({ status: 'sent', attempts: attempt, sentAt: dbNow(), lastError: null, smtpResponse: String(info.response ?? '').slice(0, 500), updatedAt: dbNow() }, { transaction: t })
      return { outcome: 'sent' as const }
    } catch (e) {
      const giveUp = isPermanent(e) || attempt >= MAX_ATTEMPTS
      // next_attempt_at is informational (pg-boss owns the retry): the earliest retry, by the database's clock
      const next = dbNowPlus(giveUp ? 0 : retryWaitSeconds(attempt)) as unknown as Date
      await row.update({ status: giveUp ? 'failed' : 'queued', attempts: attempt, lastError: describe(e), nextAttemptAt: next, updatedAt: dbNow() }, { transaction: t })
      if (giveUp) {
        log.error('e-mail not delivered, giving up', { outboxId, attempt, err: describe(e) })
        return { outcome: 'failed' as const }
      }
      return { outcome: 'retry' as const, error: describe(e) }
    }
  })
  // Thrown after the commit, so the attempt and its error stay recorded.
  if (result.outcome === 'retry') throw new MailDeliveryError(`e-mail ${outboxId} not delivered yet, will retry: ${'error' in result ? result.error : ''}`)
  return result.outcome
}

const LIVE_STATES = new Set(['created', 'retry', 'active'])

/**
 * Re-queues outbox rows still 'queued' whose delivery job is gone (lost with a database restored
 * from backup, deleted by hand, or finished while another attempt held the row). Rows touched in
 * the last `quietSeconds` are left alone; their job is running or about to.
 */
export async function sweepOutbox(opts: { quietSeconds?: number; limit?: number } = {}): Promise<{ checked: number; requeued: number }> {
  const sequelize = db()
  const { EmailOutbox } = models()
  // by the database's clock, which wrote updated_at: a node whose own clock runs fast or slow picks the same rows
  const quiet = dbNowPlus(-(opts.quietSeconds ?? 120))
  const rows = await EmailOutbox.findAll({
    attributes: ['id', 'jobId'], where: { status: 'queued', updatedAt: { [Op.lt]: quiet } }, order: [['createdAt', 'ASC']], limit: opts.limit ?? 200,
  })
  if (!rows.length) return { checked: 0, requeued: 0 }
  await ensureMailQueues()
  const boss = await jobs()
  let requeued = 0
  for (const row of rows) {
    const job = row.jobId ? await boss.getJobById(DELIVER_QUEUE, row.jobId) : null
    if (job && LIVE_STATES.has(job.state)) continue
    await sequelize.transaction(async (t) => {
      const jobId = await enqueueInTransaction(DELIVER_QUEUE, { outboxId: row.id }, t)
      const [updated] = await EmailOutbox.update(
        { jobId, updatedAt: dbNow() },
        { where: { id: row.id, status: 'queued', jobId: row.jobId }, transaction: t },
      )
      if (!updated) throw new Error('raced')
    }).then(
      () => requeued++,
      (e) => { if ((e as Error).message !== 'raced') throw e },
    )
  }
  if (requeued) log.warn('re-queued e-mails whose delivery job was lost', { requeued })
  return { checked: rows.length, requeued }
}
