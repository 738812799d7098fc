import { availableParallelism } from 'node:os'
import Piscina from 'piscina'
import { log } from '../lib/log'
import type { EngineTaskName, EngineTaskReply, EngineTasks } from './engine-tasks'

export interface AnalysisPoolOptions {
  /** worker threads; default one less than the cores, at least 1 */
  maxThreads?: number
  /** JavaScript heap limit per worker, MB; default 512 (an analysis of a 30 s stereo 96 kHz file needs well under that) */
  maxOldGenerationSizeMb?: number
  /** an idle worker is ended after this long, ms; default 30 000 */
  idleTimeoutMs?: number
}

const WORKER = new URL('./worker-bootstrap.mjs', import.meta.url).href

/** A worker-thread pool running server/analysis/worker.ts (measurement analysis and the room engine's tasks). */
export function createAnalysisPool(opts: AnalysisPoolOptions = {}): Piscina {
  const maxThreads = opts.maxThreads ?? Math.max(1, availableParallelism() - 1)
  const pool = new Piscina({
    filename: WORKER,
    minThreads: 0,
    maxThreads,
    idleTimeout: opts.idleTimeoutMs ?? 30_000,
    resourceLimits: { maxOldGenerationSizeMb: opts.maxOldGenerationSizeMb ?? 512 },
  })
  // A worker that dies outside a task (e.g. out of memory while starting) is reported here;
  // without a listener the 'error' event would end the whole process.
  pool.on('error', (err: unknown) => log.warn('analysis worker failed', { err: String(err) }))
  return pool
}

let shared: Piscina | undefined

/** The process's analysis pool, created on first use. */
export function analysisPool(): Piscina {
  shared ??= createAnalysisPool()
  return shared
}

/** Ends the shared pool's workers (on shutdown, and in tests). */
export async function closeAnalysisPool(): Promise<void> {
  const p = shared
  shared = undefined
  await p?.destroy()
}

/** Longest one engine task may take, queueing included, ms; the accepted rooms finish well under a second. */
export const ENGINE_TASK_TIMEOUT_MS = 30_000

/** The engine task did not finish (worker crashed or overran); the caller answers 503. */
export class EngineTaskFailedError extends Error {
  constructor(message: string) {
    super(message)
    this.name = 'EngineTaskFailedError'
  }
}

/**
 * Runs one of the engine's tasks (engine-tasks.ts) in the worker pool, off the event loop.
 * @throws RangeError with the engine's message for impossible input
 * @throws EngineTaskFailedError when the worker crashed or the task overran ENGINE_TASK_TIMEOUT_MS
 */
export async function runEngineTask<N extends EngineTaskName>(
  name: N, ...args: Parameters<EngineTasks[N]>
): Promise<ReturnType<EngineTasks[N]>> {
  let reply: EngineTaskReply
  try {
    reply = await analysisPool().run({ name, args }, { name: 'engine', signal: AbortSignal.timeout(ENGINE_TASK_TIMEOUT_MS) })
  } catch (err) {
    const e = err as { name?: string; message?: string }
    if (e?.name === 'AbortError' || e?.name === 'TimeoutError') throw new EngineTaskFailedError(`the engine task "${name}" took longer than ${ENGINE_TASK_TIMEOUT_MS / 1000} s and was stopped`)
    throw new EngineTaskFailedError(`the engine task "${name}" failed: ${e?.message ?? String(err)}`)
  }
  if (!reply.ok) throw new RangeError(reply.error.message)
  return reply.value as ReturnType<EngineTasks[N]>
}
