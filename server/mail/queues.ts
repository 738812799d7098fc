import type { Transaction } from 'sequelize'
import { defineQueue, enqueue, jobs } from '../jobs/queue'

/** The outgoing-mail queues and their retry policy. */
export const DELIVER_QUEUE = 'mail-deliver'
export const SWEEP_QUEUE = 'mail-sweep'

/**
 * pg-boss retries a failed delivery `retryLimit` times; with `retryBackoff` the n-th retry waits
 * between retryDelay·2^(n−1) and twice that (n capped at 16; pg-boss v10 plans.js), so with a
 * 1 s base the first retries come after seconds and the 20th between about 2.3 and 4.6 days after
 * the first attempt: of the order of the five days an ordinary MTA keeps a message queued (Postfix
 * maximal_queue_lifetime default, from memory). A job left active past expireInSeconds (a process
 * that died mid-send) is retried the same way.
 */
export const DELIVERY_POLICY = { retryLimit: 20, retryDelay: 1, retryBackoff: true, expireInSeconds: 300, retentionMinutes: 14 * 24 * 60 } as const
/** Attempts after which the outbox row is marked failed (the first try plus every retry). */
export const MAX_ATTEMPTS = DELIVERY_POLICY.retryLimit + 1

defineQueue(DELIVER_QUEUE, DELIVERY_POLICY)
defineQueue(SWEEP_QUEUE, { retryLimit: 0, expireInSeconds: 120 })

let ensured: Promise<void> | undefined
/**
 * Creates both queues if pg-boss was started before this module was loaded (createQueue is
 * idempotent in pg-boss v10: ON CONFLICT DO NOTHING).
 */
export function ensureMailQueues(): Promise<void> {
  ensured ??= (async () => {
    const b = await jobs()
    await b.createQueue(DELIVER_QUEUE, { name: DELIVER_QUEUE, ...DELIVERY_POLICY })
    await b.createQueue(SWEEP_QUEUE, { name: SWEEP_QUEUE, retryLimit: 0, expireInSeconds: 120 })
  })().catch((e) => {
    ensured = undefined
    throw e
  })
  return ensured
}
/** For tests that stop and restart pg-boss in one process. */
export function forgetEnsuredQueues(): void {
  ensured = undefined
}

/** Sends a mail job inside `t`, with the delivery policy for delivery jobs. */
export async function enqueueInTransaction(name: string, data: object, t: Transaction): Promise<string | null> {
  return enqueue(name, data, { ...(name === DELIVER_QUEUE ? DELIVERY_POLICY : {}), transaction: t })
}
