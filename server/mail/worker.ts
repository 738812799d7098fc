import { jobs, registerWorker } from '../jobs/queue'
import { log } from '../lib/log'
import { deliverOutboxEmail, sweepOutbox } from './deliver'
import { DELIVER_QUEUE, SWEEP_QUEUE, ensureMailQueues } from './queues'

/**
 * The mail workers, loaded by server/jobs/registry.ts in whichever process runs jobs: delivery of
 * each outbox row, and the sweep once a minute (a pg-boss schedule, so one run per minute across
 * all nodes, not one per process).
 */
registerWorker<{ outboxId: string }>(DELIVER_QUEUE, async (job) => {
  await deliverOutboxEmail(job.data.outboxId)
})
registerWorker(SWEEP_QUEUE, async () => {
  await sweepOutbox()
})

export async function scheduleMailSweep(): Promise<void> {
  await ensureMailQueues()
  await (await jobs()).schedule(SWEEP_QUEUE, '* * * * *')
}
scheduleMailSweep().catch((e) => log.error('the e-mail sweep was not scheduled', { err: String(e) }))
