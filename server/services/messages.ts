import type { Transaction } from 'sequelize'
import { findCase, setAssignee, touchAfterMessage, updateStatus } from '../data/cases'
import { insertEvent } from '../data/events'
import { attachFilesToMessage, insertMessage, listMessages } from '../data/messages'
import type { MessageModel } from '../db/models'
import { findUserById } from '../data/users'
import { claimReceipt } from '../data/inbound-receipts'
import { withTransaction } from '../db/transaction'
import { badRequest, conflict, forbidden, notFound } from '../errors'
import { renderMarkdownSafe } from '../mail/templates'
import { messageSchema, type CaseMessage, type CaseStatus, type MessageInput } from '../../shared/schemas/case'
import type { User } from '../../shared/schemas/auth'
import { audienceOf, isStaff, readableCase } from './access'
import { publishCase, publishQueue } from './live'
import { notifyListener } from './notify'

export const toMessage = (m: MessageModel): CaseMessage => ({
  id: m.id,
  caseId: m.caseId,
  author: m.authorId ? { id: m.authorId, name: m.author?.name ?? '', role: m.author?.role ?? '' } : null,
  body: m.body,
  html: renderMarkdownSafe(m.body),
  internal: m.internal,
  source: m.source,
  createdAt: m.createdAt.toISOString(),
  fileIds: (m.files ?? []).map((f) => f.id),
})

/** The thread; internal notes only for advisors and supervisors, whatever the caller asks for. */
export async function getThread(user: User, caseId: string): Promise<CaseMessage[]> {
  await readableCase(user, caseId)
  return (await listMessages(caseId, audienceOf(user))).map(toMessage)
}

export async function getMessage(user: User, caseId: string, messageId: string): Promise<CaseMessage> {
  await readableCase(user, caseId)
  const [m] = await listMessages(caseId, audienceOf(user), messageId)
  if (!m) throw notFound('That message')
  return toMessage(m)
}

/** Links the poster's own unattached uploads on this case to their message (what the listener then sees follows from it: ../data/visibility.ts). */
async function attachFiles(caseId: string, messageId: string, uploaderId: string, fileIds: string[], t: Transaction) {
  if (!fileIds.length) return
  if ((await attachFilesToMessage(caseId, messageId, uploaderId, [...new Set(fileIds)], t)) !== new Set(fileIds).size) throw badRequest('Attach only files you uploaded to this case', [{ path: 'fileIds', message: 'unknown, not yours or already attached file' }])
}

/** A status move the thread makes by itself (an advisor's question, a listener's answer); a no-op when the case moved meanwhile. */
async function autoMove(caseId: string, actorId: string, from: CaseStatus, to: CaseStatus, reason: string, t: Transaction): Promise<number | null> {
  if (!(await updateStatus(caseId, from, to, t))) return null
  return insertEvent({ caseId, actorId, kind: 'status', fromStatus: from, toStatus: to, data: { auto: reason } }, t)
}

/**
 * Posts a message to a case's thread. `inboundKey` (an e-mailed reply, ../mail/inbound-identity.ts): the
 * e-mail's receipt is recorded in the same transaction, and a second delivery of it throws AlreadyReceived
 * (../data/inbound-receipts.ts) with nothing written.
 */
export async function postMessage(user: User, caseId: string, input: MessageInput, source: 'app' | 'email' = 'app', opts: { inboundKey?: string } = {}): Promise<CaseMessage> {
  const body = messageSchema.parse(input)
  const c = await readableCase(user, caseId)
  const staff = isStaff(user)
  if (!staff && (body.internal || body.ask)) throw forbidden('Only the team writes internal notes or asks for information')
  if (body.internal && body.ask) throw badRequest('A question for the listener cannot be an internal note', [{ path: 'internal', message: 'turn off "internal" to ask the listener' }])
  if (c.status === 'draft') throw conflict('Send the case to an advisor first; then the conversation starts', 'not_submitted')
  if (c.status === 'closed' && !body.internal) throw conflict('This case is closed; reopen it to continue the conversation', 'closed')

  const messageId = await withTransaction(async (t, afterCommit) => {
    const id = await insertMessage({ caseId, authorId: user.id, body: body.body, internal: body.internal, source }, t)
    if (opts.inboundKey) await claimReceipt({ caseId, messageKey: opts.inboundKey, messageId: id, outcome: 'posted' }, t)
    await attachFiles(caseId, id, user.id, body.fileIds, t)
    const seq = await insertEvent({ caseId, actorId: user.id, kind: body.internal ? 'note' : 'message', data: { messageId: id, internal: body.internal, source } }, t)
    const moves: number[] = []
    if (staff && !body.internal) {
      await touchAfterMessage(caseId, 'team', t)
      let status = c.status
      if (status === 'submitted') {
        const s = await autoMove(caseId, user.id, 'submitted', 'in_review', 'advisor replied', t)
        if (s) { moves.push(s); status = 'in_review' }
        // The first advisor to answer a new, unassigned case takes it.
        if (s && !c.assignee && (await setAssignee(caseId, user.id, null, t))) {
          moves.push(await insertEvent({ caseId, actorId: user.id, kind: 'claimed', data: { assigneeId: user.id, assigneeName: user.name, auto: 'answered first' } }, t))
        }
      }
      if (body.ask && status === 'in_review') {
        const s = await autoMove(caseId, user.id, 'in_review', 'waiting_on_listener', 'advisor asked for information', t)
        if (s) moves.push(s)
      }
      await notifyListener({ caseId, event: body.ask ? 'info-requested' : 'reply', vars: { authorName: user.name, bodyMarkdown: body.body } }, t)
    } else if (!staff) {
      await touchAfterMessage(caseId, 'listener', t)
      if (c.status === 'waiting_on_listener' || c.status === 'plan_sent') {
        const s = await autoMove(caseId, user.id, c.status, 'in_review', 'listener replied', t)
        if (s) moves.push(s)
        await touchAfterMessage(caseId, 'listener', t)
      }
    }
    afterCommit(() => {
      publishCase(caseId, { type: 'case.message', caseId, messageId: id, internal: body.internal }, { internal: body.internal })
      publishCase(caseId, { type: 'case.event', caseId, seq, kind: body.internal ? 'note' : 'message', internal: body.internal }, { internal: body.internal })
      for (const m of moves) publishCase(caseId, { type: 'case.event', caseId, seq: m, kind: 'status' })
      publishQueue(caseId)
    })
    return id
  })
  const [m] = await listMessages(caseId, 'team', messageId)
  return toMessage(m)
}

/** A listener's answer that arrived by e-mail (the reply token was already checked by the caller). */
export async function receiveEmailReply(input: { caseId: string; userId: string; body: string; messageKey?: string }): Promise<CaseMessage> {
  const user = await findUserById(input.userId)
  const c = await findCase(input.caseId)
  if (!user || !c || c.listenerId !== user.id) throw notFound('That case')
  return postMessage({ id: user.id, email: user.email, name: user.name, role: user.role }, input.caseId, { body: input.body }, 'email', { inboundKey: input.messageKey })
}
