import type { Transaction } from 'sequelize'
import { findCase } from '../data/cases'
import { findUserById } from '../data/users'
import { queueEmail } from '../mail/outbox'
import { config } from '../config'

export type ListenerEmailKind = 'reply' | 'info-requested' | 'status-changed' | 'plan-sent'

export const caseUrl = (caseId: string) => `${config().PUBLIC_URL ?? `http://localhost:${config().PORT}`}/cases/${caseId}`

/** Queues the listener's e-mail about a case in the same transaction as the change it reports. */
export async function notifyListener(input: { caseId: string; event: ListenerEmailKind; vars?: Record<string, unknown> }, t: Transaction): Promise<void> {
  const c = await findCase(input.caseId, t)
  if (!c) return
  const listener = await findUserById(c.listenerId)
  if (!listener || !listener.active) return
  await queueEmail(
    {
      to: listener.email,
      toUserId: listener.id,
      kind: input.event,
      caseId: c.id,
      vars: { listenerName: listener.name, caseTitle: c.title, caseUrl: caseUrl(c.id), ...input.vars },
    },
    { transaction: t },
  )
}
