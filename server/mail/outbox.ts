import { randomUUID } from 'node:crypto'
import { Op, col, fn, where, type Transaction } from 'sequelize'
import { z } from 'zod'
import { config } from '../config'
import { db } from '../db/sequelize'
import { models } from '../db/models'
import { CASE_KINDS, ESSENTIAL_KINDS, canonicalVars, renderEmail, type EmailKind } from './templates'
import { DELIVER_QUEUE, enqueueInTransaction, ensureMailQueues } from './queues'

export interface QueueEmailInput {
  /** Recipient address. */
  to: string
  /** The recipient's account, when they have one: their name fills `recipientName` and their e-mail choice is respected. */
  toUserId?: string
  kind: EmailKind
  /** The case the e-mail is about: its title fills `caseTitle`, its reply token the Reply-To. */
  caseId?: string
  /** Template vars (see emailVarsSchemas); given values win over those looked up from the user and case. */
  vars: Record<string, unknown>
  /** The case's reply token, when the caller has it at hand (else read from the case). */
  replyToken?: string
}

export type QueueEmailResult =
  | { queued: true; id: string; messageId: string; jobId: string | null }
  | { queued: false; reason: 'opted_out' }

const address = z.string().trim().email().max(254)

/** The domain of MAIL_FROM's address (for Message-IDs), else MAIL_REPLY_DOMAIN. */
export function mailDomain(): string {
  const m = /@([^>\s]+)>?\s*$/.exec(config().MAIL_FROM)
  return m ? m[1].toLowerCase() : config().MAIL_REPLY_DOMAIN
}
export const replyAddress = (token: string) => `reply+${token}@${config().MAIL_REPLY_DOMAIN}`

/**
 * Writes one e-mail to the outbox and its delivery job to pg-boss in the caller's transaction, so
 * the e-mail exists exactly when the change it reports was committed (transactional outbox). The
 * e-mail is rendered now and stored whole, with a Message-ID fixed for every later attempt.
 *
 * Optional kinds (status-changed, welcome) are skipped when the recipient's account has
 * `email_optional` off; essential kinds always go.
 */
export async function queueEmail(input: QueueEmailInput, opts: { transaction?: Transaction } = {}): Promise<QueueEmailResult> {
  if (!opts.transaction) return db().transaction((t) => queueEmail(input, { transaction: t }))
  const t = opts.transaction
  const to = address.parse(input.to)
  const { User, Case, EmailOutbox } = models()

  const user = await User.findOne({
    attributes: ['id', 'name', 'emailOptional'],
    where: input.toUserId ? { id: input.toUserId } : where(fn('lower', col('email')), Op.eq, fn('lower', to)),
    transaction: t,
  })
  if (input.toUserId && !user) throw new Error(`cannot e-mail user ${input.toUserId}: there is no such user`)
  if (user && !user.emailOptional && !ESSENTIAL_KINDS.has(input.kind)) return { queued: false, reason: 'opted_out' }

  let replyToken = input.replyToken
  const fromCase: Record<string, unknown> = {}
  if (input.caseId) {
    const c = await Case.findByPk(input.caseId, { attributes: ['title', 'replyToken'], transaction: t })
    if (!c) throw new Error(`cannot e-mail about case ${input.caseId}: there is no such case`)
    fromCase.caseId = input.caseId
    fromCase.caseTitle = c.title
    replyToken ??= c.replyToken
  }
  if (CASE_KINDS.has(input.kind) && !input.caseId) throw new TypeError(`a ${input.kind} e-mail needs the caseId it is about`)

  const vars = { ...(user ? { recipientName: user.name } : {}), ...fromCase, ...canonicalVars(input.vars) }
  const rendered = renderEmail(input.kind, vars as never)

  const id = randomUUID()
  const messageId = `<${id}@${mailDomain()}>`
  const replyTo = CASE_KINDS.has(input.kind) && replyToken ? replyAddress(replyToken) : null

  await ensureMailQueues()
  const jobId = await enqueueInTransaction(DELIVER_QUEUE, { outboxId: id }, t)
  await EmailOutbox.create(
    { id, toAddress: to, toUserId: user?.id ?? null, kind: input.kind, caseId: input.caseId ?? null, subject: rendered.subject, html: rendered.html, text: rendered.text, replyTo, messageId, jobId },
    { transaction: t },
  )
  return { queued: true, id, messageId, jobId }
}
