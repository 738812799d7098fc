import type { Server as HttpServer } from 'node:http'
import type { RequestHandler } from 'express'
import { Server } from 'socket.io'

let io: Server | undefined
export const sockets = () => io

/** socket.io on the app's HTTP server, sharing the HTTP session (no second sign-in). */
export async function attachSockets(http: HttpServer, sessionMiddleware: RequestHandler): Promise<() => Promise<void>> {
  const server = new Server(http, { serveClient: false, cors: undefined })
  server.engine.use(sessionMiddleware)
  io = server
  return async () => {
    io = undefined
    await new Promise<void>((r) => server.close(() => r()))
  }
}
