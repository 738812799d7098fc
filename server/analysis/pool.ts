import { availableParallelism } from 'node:os'
import Piscina from 'piscina'
import { log } from '../lib/log'

export interface AnalysisPoolOptions {
  /** worker threads; default one less than the cores, at least 1 */
  maxThreads?: number
  /** JavaScript heap limit per worker, MB; default 512 (an analysis of a 30 s stereo 96 kHz file needs well under that) */
  maxOldGenerationSizeMb?: number
  /** an idle worker is ended after this long, ms; default 30 000 */
  idleTimeoutMs?: number
}

const WORKER = new URL('./worker-bootstrap.mjs', import.meta.url).href

/** A worker-thread pool running server/analysis/worker.ts. */
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
