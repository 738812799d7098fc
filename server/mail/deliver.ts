import nodemailer, { type Transporter } from 'nodemailer'
import { QueryTypes } from 'sequelize'
import { config } from '../config'
import { db } from '../db/sequelize'
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

interface OutboxRow {
  id: string
  to_address: string
  kind: string
  case_id: string | null
  subject: string
  html: string
  text: string
  reply_to: string | null
  status: 'queued' | 'sent' | 'failed'
  attempts: number
  message_id: string
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
    const [row] = await sequelize.query<OutboxRow>('SELECT * FROM email_outbox WHERE id = $1 FOR UPDATE SKIP LOCKED', {
      bind: [outboxId],
      transaction: t,
      type: QueryTypes.SELECT,
    })
    if (!row) {
      const [exists] = await sequelize.query('SELECT 1 FROM email_outbox WHERE id = $1', { bind: [outboxId], transaction: t, type: QueryTypes.SELECT })
      return { outcome: (exists ? 'busy' : 'missing') as DeliveryOutcome }
    }
    if (row.status === 'sent') return { outcome: 'already-sent' as const }
    if (row.status === 'failed') return { outcome: 'failed' as const }

    const attempt = row.attempts + 1
    try {
      const info = await mailTransport().sendMail({
        from: config().MAIL_FROM,
        to: row.to_address,
        subject: row.subject,
        html: row.html,
        text: row.text,
        replyTo: row.reply_to ?? undefined,
        messageId: row.message_id,
        references: row.case_id ? `<case-${row.case_id}@${mailDomain()}>` : undefined,
        headers: { 'Auto-Submitted': 'auto-generated', 'X-Roomwright-Kind': row.kind },
      })
      await sequelize.query(
        `UPDATE email_outbox SET status = 'sent', attempts = $2, sent_at = now(), last_error = NULL, smtp_response = $3, updated_at = now() WHERE id = $1`,
        { bind: [row.id, attempt, String(info.response ?? '').slice(0, 500)], transaction: t },
      )
      return { outcome: 'sent' as const }
    } catch (e) {
      const giveUp = isPermanent(e) || attempt >= MAX_ATTEMPTS
      await sequelize.query(
        `UPDATE email_outbox SET status = $2, attempts = $3, last_error = $4, next_attempt_at = now() + make_interval(secs => $5), updated_at = now() WHERE id = $1`,
        { bind: [row.id, giveUp ? 'failed' : 'queued', attempt, describe(e), giveUp ? 0 : retryWaitSeconds(attempt)], transaction: t },
      )
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
  const rows = await sequelize.query<{ id: string; job_id: string | null }>(
    `SELECT id, job_id FROM email_outbox WHERE status = 'queued' AND updated_at < now() - make_interval(secs => $1) ORDER BY created_at LIMIT $2`,
    { bind: [opts.quietSeconds ?? 120, opts.limit ?? 200], type: QueryTypes.SELECT },
  )
  if (!rows.length) return { checked: 0, requeued: 0 }
  await ensureMailQueues()
  const boss = await jobs()
  let requeued = 0
  for (const row of rows) {
    const job = row.job_id ? await boss.getJobById(DELIVER_QUEUE, row.job_id) : null
    if (job && LIVE_STATES.has(job.state)) continue
    await sequelize.transaction(async (t) => {
      const jobId = await enqueueInTransaction(DELIVER_QUEUE, { outboxId: row.id }, t)
      const updated = await sequelize.query(
        `UPDATE email_outbox SET job_id = $2, updated_at = now() WHERE id = $1 AND status = 'queued' AND job_id IS NOT DISTINCT FROM $3::uuid RETURNING id`,
        { bind: [row.id, jobId, row.job_id], transaction: t, type: QueryTypes.SELECT },
      )
      if (!updated.length) throw new Error('raced')
    }).then(
      () => requeued++,
      (e) => { if ((e as Error).message !== 'raced') throw e },
    )
  }
  if (requeued) log.warn('re-queued e-mails whose delivery job was lost', { requeued })
  return { checked: rows.length, requeued }
}
