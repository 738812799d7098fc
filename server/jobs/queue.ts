import PgBoss from 'pg-boss'
import { QueryTypes, type Transaction } from 'sequelize'
import { config } from '../config'
import { db } from '../db/sequelize'
import { log } from '../lib/log'

/**
 * The PostgreSQL-backed job queue (pg-boss). Jobs are sent inside the caller's transaction where one
 * is given, so a job exists exactly when the change that asked for it was committed.
 */
let boss: PgBoss | undefined
const created = new Set<string>()
let starting: Promise<PgBoss> | undefined

export type JobHandler<T> = (job: { id: string; data: T }) => Promise<void>
const handlers = new Map<string, { handler: JobHandler<unknown>; opts: PgBoss.WorkOptions }>()
const queueOptions = new Map<string, Omit<PgBoss.Queue, 'name'>>()

/** Declares a queue and its retry policy; call at module load of the feature that owns it. */
export function defineQueue(name: string, opts: Omit<PgBoss.Queue, 'name'> = {}): void {
  queueOptions.set(name, opts)
}

export async function jobs(): Promise<PgBoss> {
  if (boss) return boss
  starting ??= (async () => {
    const b = new PgBoss({ connectionString: config().DATABASE_URL, max: 4, schema: 'pgboss', supervise: true, schedule: true })
    b.on('error', (e) => log.warn('job queue error', { err: String(e) }))
    await b.start()
    for (const [name, opts] of queueOptions) await b.createQueue(name, { name, ...opts })
    for (const name of queueOptions.keys()) created.add(name)
    boss = b
    return b
  })()
  try {
    return await starting
  } finally {
    starting = undefined
  }
}

/** Registers a handler; the worker starts when startWorkers() runs (the server, or a worker process). */
export function registerWorker<T>(name: string, handler: JobHandler<T>, opts: PgBoss.WorkOptions = {}): void {
  handlers.set(name, { handler: handler as JobHandler<unknown>, opts })
}

export async function startWorkers(): Promise<void> {
  const b = await jobs()
  for (const [name, { handler, opts }] of handlers) {
    // pg-boss hands a batch; every job in it is run (a rejection fails the batch, so each is retried).
    await b.work(name, { batchSize: 1, pollingIntervalSeconds: 1, ...opts }, async (batch) => {
      for (const job of batch) await handler({ id: job.id, data: job.data })
    })
  }
}

function inTransaction(t: Transaction): PgBoss.Db {
  return {
    executeSql: async (text, values) => {
      // pg-boss leaves unset options undefined; Sequelize's bind wants NULL for those.
      // raw SQL: pg-boss's own statements (the library hands us their text), run in the caller's transaction
      const rows = await db().query(text, { bind: (values ?? []).map((v) => (v === undefined ? null : v)), transaction: t, type: QueryTypes.SELECT })
      return { rows: rows as unknown[] }
    },
  }
}

/** Queues a job, inside `transaction` when given. */
export async function enqueue(name: string, data: object, opts: PgBoss.SendOptions & { transaction?: Transaction } = {}): Promise<string | null> {
  const { transaction, ...send } = opts
  const b = await jobs()
  if (!created.has(name)) {
    // A queue defined after pg-boss started (a module loaded late) is created on first use; idempotent.
    await b.createQueue(name, { name, ...queueOptions.get(name) })
    created.add(name)
  }
  return b.send(name, data, { ...queueOptions.get(name), ...send, ...(transaction ? { db: inTransaction(transaction) } : {}) })
}

export async function stopJobs(): Promise<void> {
  const b = boss
  boss = undefined
  created.clear()
  if (b) await b.stop({ graceful: true, wait: true, timeout: 10_000 })
}
