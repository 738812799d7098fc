import type { Server as HttpServer, IncomingMessage } from 'node:http'
import type { RequestHandler } from 'express'
import { Server, type Socket } from 'socket.io'
import { createAdapter } from '@socket.io/postgres-adapter'
import pg from 'pg'
import { config } from '../config'
import { sessionUser } from '../services/auth'
import { audienceOf, isStaff, readableCase } from '../services/access'
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
  const missed = afterSeq !== undefined ? await listEvents(caseId, { afterId: afterSeq, audience: audienceOf(user) }) : []
  socket.to(`case:${caseId}`).emit('presence', { caseId, userId: user.id, name: user.name, role: user.role, state: 'viewing' })
  return missed
}

const LOOPBACK = new Set(['localhost', '127.0.0.1', '[::1]'])

/**
 * Whether a socket handshake from `origin` is let in (cross-site WebSocket hijacking: a browser sends
 * the session cookie with a WebSocket opened by any page, and always names that page's Origin).
 * Allowed: the origin of the configured PUBLIC_URL; without PUBLIC_URL (a machine of one's own, the dev
 * server's proxy) any loopback origin. A handshake without Origin comes from no browser page and is
 * let in (it still needs the session cookie).
 */
export function originAllowed(origin: string | undefined): boolean {
  if (origin === undefined) return true
  let parsed: URL
  try {
    parsed = new URL(origin)
  } catch {
    return false
  }
  if (parsed.origin === 'null' || (parsed.protocol !== 'http:' && parsed.protocol !== 'https:')) return false
  const publicUrl = config().PUBLIC_URL
  if (publicUrl) return parsed.origin === new URL(publicUrl).origin
  return LOOPBACK.has(parsed.hostname)
}

/** socket.io on the app's HTTP server: the HTTP session signs the socket in (no second sign-in). */
export async function attachSockets(http: HttpServer, sessionMiddleware: RequestHandler): Promise<() => Promise<void>> {
  const server = new Server(http, {
    serveClient: false,
    connectionStateRecovery: undefined,
    // checked on every handshake request (polling and WebSocket upgrade) before the session is read
    allowRequest: (req, done) => (originAllowed(req.headers.origin) ? done(null, true) : done('origin_refused', false)),
  })
  const pool = new pg.Pool({ connectionString: config().DATABASE_URL, max: 3, connectionTimeoutMillis: 3000 })
  pool.on('error', (e) => log.warn('socket adapter pool error', { err: String(e) }))
  // The adapter keeps one client checked out for LISTEN and gives it no 'error' listener: without
  // this, PostgreSQL going away crashes the process; with it, the client ends and the adapter reconnects.
  pool.on('connect', (client) => client.on('error', (e) => log.warn('socket adapter connection lost', { err: String(e) })))
  server.adapter(createAdapter(pool, { heartbeatInterval: 5000, heartbeatTimeout: 10000 }))
  server.engine.use(sessionMiddleware)

  server.use(async (socket, next) => {
    const req = socket.request as IncomingMessage & { session?: { passport?: { user?: string } }; sessionID?: string }
    const id = req.session?.passport?.user
    const user = id ? await sessionUser(id).catch(() => null) : null
    if (!user) return next(new Error('signed_out'))
    socket.data.user = user
    socket.data.sid = req.sessionID
    next()
  })

  server.on('connection', (socket) => {
    const user = socket.data.user as User
    // user:<id> reaches every socket of an account, session:<sid> those of one sign-in (so ending
    // some sessions of an account, e.g. on a password change, disconnects exactly their sockets).
    socket.join(`user:${user.id}`)
    if (socket.data.sid) socket.join(`session:${socket.data.sid}`)
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
