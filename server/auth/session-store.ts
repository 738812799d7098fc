import session from 'express-session'
import connectPgSimple from 'connect-pg-simple'
import type pg from 'pg'
import type { User } from '../../shared/schemas/auth'

const PgStore = connectPgSimple(session)
/** The session and its user in one statement (the session's user_id column is generated from its JSON). */
const SESSION_GET = `SELECT s.sess, date_part('epoch', s.expire::timestamptz) * 1000 AS expire_ms, u.id, u.email, u.name, u.role, u.active
  FROM "session" s LEFT JOIN users u ON u.id = s.user_id
 WHERE s.sid = $1 AND s.expire >= to_timestamp($2)`

type Callback<T = unknown> = (err: unknown, value?: T) => void

/** A rolling session's expiry is written again only once it would move by this much (touching costs a write per request). */
export const TOUCH_EVERY_MS = 10 * 60 * 1000

// The signed-in user read in the same statement as the session, keyed by the session's `passport` object
// (express-session keeps that object when it builds req.session, so the deserializer finds it again).
const usersOfSessions = new WeakMap<object, User | null>()

/** The user read with the session (null: gone or switched off), or undefined when it was not read with it. */
export function userReadWithSession(passportData: unknown): User | null | undefined {
  return passportData && typeof passportData === 'object' ? usersOfSessions.get(passportData) : undefined
}

interface Row {
  sess: session.SessionData & { passport?: { user?: string } }
  expire_ms: number
  id: string | null; email: string; name: string; role: User['role']; active: boolean
}

/**
 * connect-pg-simple's PostgreSQL store (sessions stay in the database, so any node serves any request),
 * with two changes, both measured in bench/queue.ts: the session and its user come back in one statement
 * (a join on the session's user_id column) instead of two, and a rolling session's expiry is written at
 * most every TOUCH_EVERY_MS instead of on every request.
 */
export class SessionStore extends PgStore {
  // sid → the expiry last read or written by this node (bounded: cleared when it grows large)
  private known = new Map<string, number>()

  private remember(sid: string, ms: number): void {
    if (this.known.size > 50_000) this.known.clear()
    this.known.set(sid, ms)
  }

  private pool: pg.Pool

  constructor(options: ConstructorParameters<typeof PgStore>[0] & { pool: pg.Pool }) {
    super(options)
    this.pool = options.pool
  }

  override get(sid: string, fn: Callback<session.SessionData | null>): void {
    // raw SQL: the session and its user in one named prepared statement, planned once per connection, not on every request
    this.pool.query<Row>({ name: 'rw_session_get', text: SESSION_GET, values: [sid, Math.ceil(Date.now() / 1000)] }).then(
      ({ rows: [row] }) => {
        if (!row) return fn(null, null)
        let sess: Row['sess']
        try {
          sess = typeof row.sess === 'string' ? JSON.parse(row.sess) : row.sess
        } catch {
          return this.destroy(sid, (e) => fn(e ?? null, null))
        }
        this.remember(sid, Number(row.expire_ms))
        if (sess.passport && typeof sess.passport === 'object' && sess.passport.user) {
          usersOfSessions.set(sess.passport, row.id && row.active ? { id: row.id, email: row.email, name: row.name, role: row.role } : null)
        }
        fn(null, sess)
      },
      (err: unknown) => fn(err),
    )
  }

  override set(sid: string, sess: session.SessionData, fn?: (err?: unknown) => void): void {
    super.set(sid, sess, (err?: unknown) => {
      if (!err && sess.cookie?.expires) this.remember(sid, new Date(sess.cookie.expires).getTime())
      fn?.(err)
    })
  }

  override destroy(sid: string, fn?: (err?: unknown) => void): void {
    this.known.delete(sid)
    super.destroy(sid, fn)
  }

  override touch(sid: string, sess: session.SessionData, fn?: (err?: unknown) => void): void {
    const next = sess.cookie?.expires ? new Date(sess.cookie.expires).getTime() : NaN
    const last = this.known.get(sid)
    if (Number.isFinite(next) && last !== undefined && next - last < TOUCH_EVERY_MS) return fn?.()
    super.touch(sid, sess, (err?: unknown) => {
      if (!err && Number.isFinite(next)) this.remember(sid, next)
      fn?.(err)
    })
  }
}
