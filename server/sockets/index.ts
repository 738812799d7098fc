import type { Server as HttpServer, IncomingMessage } from 'node:http'
import type { RequestHandler } from 'express'
import { Server, type Socket } from 'socket.io'
import { createAdapter } from '@socket.io/postgres-adapter'
import pg from 'pg'
import { config } from '../config'
import { sessionUser } from '../services/auth'
import { isStaff, readableCase } from '../services/access'
import { listEvents } from '../data/events'
import { log } from '../lib/log'
import type { User } from '../../shared/schemas/auth'

let io: Server | undefined
export const sockets = () => io

type Ack = (answer: { ok: true; [k: string]: unknown } | { ok: false; error: { code: string; message: string } }) => void
const refuse = (ack: Ack | undefined, code: string, message: string) => ack?.({ ok: false, error: { code, message } })

/** Who may join which room; checked on the server at every join, whatever the client shows. */
export async function joinCase(socket: Socket, user: User, caseId: string, afterSeq: number | undefined) {
  await readableCase(user, caseId)
  await socket.join(`case:${caseId}`)
  if (isStaff(user)) await socket.join(`case:${caseId}:staff`)
  // Catching up after a reconnect comes from the database, never from memory.
  const missed = afterSeq !== undefined ? await listEvents(caseId, { afterId: afterSeq, viewer: user }) : []
  socket.to(`case:${caseId}`).emit('presence', { caseId, userId: user.id, name: user.name, role: user.role, state: 'viewing' })
  return missed
}

/** socket.io on the app's HTTP server: the HTTP session signs the socket in (no second sign-in). */
export async function attachSockets(http: HttpServer, sessionMiddleware: RequestHandler): Promise<() => Promise<void>> {
  const server = new Server(http, { serveClient: false, connectionStateRecovery: undefined })
  const pool = new pg.Pool({ connectionString: config().DATABASE_URL, max: 3, connectionTimeoutMillis: 3000 })
  pool.on('error', (e) => log.warn('socket adapter pool error', { err: String(e) }))
  // The adapter keeps one client checked out for LISTEN and gives it no 'error' listener: without
  // this, PostgreSQL going away crashes the process; with it, the client ends and the adapter reconnects.
  pool.on('connect', (client) => client.on('error', (e) => log.warn('socket adapter connection lost', { err: String(e) })))
  server.adapter(createAdapter(pool, { heartbeatInterval: 5000, heartbeatTimeout: 10000 }))
  server.engine.use(sessionMiddleware)

  server.use(async (socket, next) => {
    const req = socket.request as IncomingMessage & { session?: { passport?: { user?: string } } }
    const id = req.session?.passport?.user
    const user = id ? await sessionUser(id).catch(() => null) : null
    if (!user) return next(new Error('signed_out'))
    socket.data.user = user
    next()
  })

  server.on('connection', (socket) => {
    const user = socket.data.user as User
    socket.join(`user:${user.id}`)
    if (isStaff(user)) socket.join('queue')

    socket.on('case.join', async (msg: { caseId?: string; afterSeq?: number }, ack?: Ack) => {
      try {
        if (typeof msg?.caseId !== 'string') return refuse(ack, 'invalid', 'caseId is required')
        const missed = await joinCase(socket, user, msg.caseId, typeof msg.afterSeq === 'number' ? msg.afterSeq : undefined)
        ack?.({ ok: true, missed })
      } catch {
        refuse(ack, 'not_found', 'That case was not found')
      }
    })
    socket.on('case.leave', async (msg: { caseId?: string }) => {
      if (typeof msg?.caseId !== 'string') return
      await socket.leave(`case:${msg.caseId}`)
      await socket.leave(`case:${msg.caseId}:staff`)
    })
    socket.on('case.typing', (msg: { caseId?: string; typing?: boolean }) => {
      if (typeof msg?.caseId !== 'string' || !socket.rooms.has(`case:${msg.caseId}`)) return
      socket.to(`case:${msg.caseId}`).emit('presence', { caseId: msg.caseId, userId: user.id, name: user.name, role: user.role, state: msg.typing ? 'typing' : 'viewing' })
    })
    socket.on('queue.join', (_msg: unknown, ack?: Ack) => {
      if (!isStaff(user)) return refuse(ack, 'forbidden', 'Only the team sees the queue')
      ack?.({ ok: true })
    })
  })

  io = server
  return async () => {
    io = undefined
    server.disconnectSockets(true)
    await new Promise<void>((r) => server.close(() => r()))
    await pool.end().catch(() => {})
  }
}
