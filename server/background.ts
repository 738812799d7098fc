import type { Server } from 'node:http'
import type { RequestHandler } from 'express'
import { log } from './lib/log'

export interface Background {
  stop: () => Promise<void>
}

/**
 * What runs beside the HTTP routes in the same process: live sockets, the job queue and its workers.
 * A separate worker process can call this with jobs on and no HTTP server.
 */
export async function startBackground(opts: { http?: Server; sessionMiddleware?: RequestHandler; jobs: boolean }): Promise<Background> {
  const stops: (() => Promise<void>)[] = []
  if (opts.http && opts.sessionMiddleware) {
    const { attachSockets } = await import('./sockets')
    stops.push(await attachSockets(opts.http, opts.sessionMiddleware))
  }
  if (opts.jobs) {
    await import('./jobs/registry')
    const { startWorkers, stopJobs } = await import('./jobs/queue')
    const { closeAnalysisPool } = await import('./analysis/pool')
    // Stops run in reverse: first the job workers (no new work), then the analysis threads.
    stops.push(closeAnalysisPool)
    try {
      await startWorkers()
    } catch (e) {
      log.error('job workers did not start', { err: String(e) })
      throw e
    }
    stops.push(stopJobs)
    // what a crash mid-upload left behind: at start, then hourly
    const { startStorageSweep } = await import('./storage/sweep')
    stops.push(startStorageSweep())
  }
  return {
    stop: async () => {
      for (const s of stops.reverse()) await s().catch(() => {})
    },
  }
}
