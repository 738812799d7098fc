import { createServer, type Server } from 'node:http'
import type { AddressInfo } from 'node:net'
import { createApp } from './app'
import { config } from './config'
import { closeDb } from './db/sequelize'
import { startBackground, type Background } from './background'

export interface RunningServer {
  url: string
  port: number
  http: Server
  close: () => Promise<void>
}

/** Starts HTTP (client, API, sockets) and the background work on one port. */
export async function startServer(opts: { port?: number; clientDir?: string | false; background?: boolean } = {}): Promise<RunningServer> {
  const cfg = config()
  const built = createApp({ clientDir: opts.clientDir })
  const http = createServer(built.app)
  const background: Background = await startBackground({ http, sessionMiddleware: built.sessionMiddleware, jobs: opts.background ?? cfg.JOBS === 'on' })
  await new Promise<void>((resolve, reject) => {
    http.once('error', reject)
    http.listen(opts.port ?? cfg.PORT, cfg.HOST, () => resolve())
  })
  const port = (http.address() as AddressInfo).port
  let closing: Promise<void> | undefined
  return {
    url: `http://${cfg.HOST}:${port}`,
    port,
    http,
    close: () =>
      (closing ??= (async () => {
        await background.stop()
        await new Promise<void>((r) => {
          http.close(() => r())
          http.closeAllConnections()
        })
        await built.close()
        await closeDb()
      })()),
  }
}
