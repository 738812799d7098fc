import type { Server } from 'node:http'
import type { RequestHandler } from 'express'

export interface Background {
  stop: () => Promise<void>
}

/**
 * What runs beside the HTTP routes in the same process: live sockets, the job queue and its workers.
 * Each feature registers itself here; a separate worker process can call the same function without HTTP.
 */
export async function startBackground(_opts: { http?: Server; sessionMiddleware?: RequestHandler; jobs: boolean }): Promise<Background> {
  const stops: (() => Promise<void>)[] = []
  return {
    stop: async () => {
      for (const s of stops.reverse()) await s().catch(() => {})
    },
  }
}
