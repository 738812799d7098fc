import session from 'express-session'
import connectPgSimple from 'connect-pg-simple'
import type pg from 'pg'
import type { User } from '../../shared/schemas/auth'
import { caughtUp, feedLive, subscribeChanges } from '../db/change-feed'
import { config } from '../config'

const PgStore = connectPgSimple(session)
/** The session and its user in one statement (the session's user_id column is generated from its JSON). */
const SESSION_GET = `SELECT s.sess, date_part('epoch', s.expire::timestamptz) * 1000 AS expire_ms, u.id, u.email, u.name, u.role, u.active
  FROM "session" s LEFT JOIN users u ON u.id = s.user_id
 WHERE s.sid = $1 AND s.expire >= to_timestamp($2)`

type Callback<T = unknown> = (err: unknown, value?: T) => void

/** A rolling session's expiry is written again only once it would move by this much (touching costs a write per request). */
export const TOUCH_EVERY_MS = 10 * 60 * 1000

/**
 * How long this node may answer from its memory for a signed-in session and its user: the bound if a
 * change notification were ever lost while the feed still looked up (changes normally drop the entry at
 * once, on every node, through the change feed).
 */
export const sessionCacheMs = () => config().SESSION_CACHE_SECONDS * 1000
const SESSION_CACHE_MAX = 20_000

interface Cached { json: string; body: string; expireMs: number; user: User | null; userId: string; at: number }

/** A session's data without its cookie, as text: what tells whether a request changed the session. */
export function sessionBody(sess: object): string {
  const { cookie: _cookie, ...rest } = sess as { cookie?: unknown }
  return JSON.stringify(rest)
}

/** A signed-in session answered from this node's memory: a fresh object, and its body to compare against at the end. */
export interface MemorySession { sess: session.SessionData; body: string }

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
  // sid → the session and its user as last read from PostgreSQL (signed-in sessions only)
  private cache = new Map<string, Cached>()
  private sidsOf = new Map<string, Set<string>>()
  // bumped by every invalidation: a read that started before one is not cached (it may be stale)
  private generation = 0
  private unsubscribe: () => Promise<void>

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
    this.unsubscribe = subscribeChanges({
      change: (payload) => {
        if (payload.startsWith('u:')) this.forgetUser(payload.slice(2))
      },
      reset: () => this.forgetAll(),
    })
  }

  /** Stops listening for changes (the app's close). */
  async closeCache(): Promise<void> {
    this.forgetAll()
    await this.unsubscribe()
  }

  private forget(sid: string): void {
    this.generation++
    const c = this.cache.get(sid)
    if (!c) return
    this.cache.delete(sid)
    const sids = this.sidsOf.get(c.userId)
    sids?.delete(sid)
    if (sids && !sids.size) this.sidsOf.delete(c.userId)
  }

  private forgetUser(userId: string): void {
    this.generation++
    for (const sid of this.sidsOf.get(userId) ?? []) this.cache.delete(sid)
    this.sidsOf.delete(userId)
  }

  private forgetAll(): void {
    this.generation++
    this.cache.clear()
    this.sidsOf.clear()
  }

  private keep(sid: string, c: Cached): void {
    if (this.cache.size >= SESSION_CACHE_MAX) this.forgetAll()
    this.cache.set(sid, c)
    let sids = this.sidsOf.get(c.userId)
    if (!sids) this.sidsOf.set(c.userId, (sids = new Set()))
    sids.add(sid)
  }

  /** The session from memory when this node may answer from it, else undefined. */
  private fromMemory(sid: string): MemorySession | undefined {
    const c = this.cache.get(sid)
    if (!c) return undefined
    const now = Date.now()
    if (!feedLive() || now - c.at > sessionCacheMs() || c.expireMs < now) {
      this.forget(sid)
      return undefined
    }
    // a fresh object per request (passport and express-session change it in place)
    const sess = JSON.parse(c.json) as Row['sess']
    if (sess.passport && typeof sess.passport === 'object') usersOfSessions.set(sess.passport, c.user)
    return { sess, body: c.body }
  }

  /**
   * The signed-in session from this node's memory, once every change committed before the call has been
   * applied (db/change-feed.ts); undefined when it is not held or may be stale (the caller reads it the usual way).
   */
  fromMemoryCaughtUp(sid: string, fn: (hit: MemorySession | undefined) => void): void {
    if (!this.cache.has(sid)) return fn(undefined)
    caughtUp().then((ok) => fn(ok ? this.fromMemory(sid) : undefined), () => fn(undefined))
  }

  /** Whether a rolling session's stored expiry would move now (see touch): only then is it written, and its cookie sent again. */
  touchDue(sid: string, nextMs: number): boolean {
    const last = this.known.get(sid)
    return last === undefined || nextMs - last >= TOUCH_EVERY_MS
  }

  override get(sid: string, fn: Callback<session.SessionData | null>): void {
    this.fromMemoryCaughtUp(sid, (hit) => (hit ? fn(null, hit.sess) : this.read(sid, fn)))
  }

  private read(sid: string, fn: Callback<session.SessionData | null>): void {
    const generation = this.generation
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
        const expireMs = Number(row.expire_ms)
        this.remember(sid, expireMs)
        if (sess.passport && typeof sess.passport === 'object' && sess.passport.user) {
          const user = row.id && row.active ? { id: row.id, email: row.email, name: row.name, role: row.role } : null
          // only what no change overtook, and only while changes can reach this node
          if (user && sessionCacheMs() > 0 && feedLive() && generation === this.generation) this.keep(sid, { json: JSON.stringify(sess), body: sessionBody(sess), expireMs, user, userId: user.id, at: Date.now() })
          usersOfSessions.set(sess.passport, user)
        }
        fn(null, sess)
      },
      (err: unknown) => fn(err),
    )
  }

  override set(sid: string, sess: session.SessionData, fn?: (err?: unknown) => void): void {
    this.forget(sid)
    super.set(sid, sess, (err?: unknown) => {
      this.forget(sid)
      if (!err && sess.cookie?.expires) this.remember(sid, new Date(sess.cookie.expires).getTime())
      fn?.(err)
    })
  }

  override destroy(sid: string, fn?: (err?: unknown) => void): void {
    this.known.delete(sid)
    this.forget(sid)
    super.destroy(sid, (err?: unknown) => {
      this.forget(sid)
      fn?.(err)
    })
  }

  override touch(sid: string, sess: session.SessionData, fn?: (err?: unknown) => void): void {
    const next = sess.cookie?.expires ? new Date(sess.cookie.expires).getTime() : NaN
    if (Number.isFinite(next) && !this.touchDue(sid, next)) return fn?.()
    super.touch(sid, sess, (err?: unknown) => {
      if (!err && Number.isFinite(next)) {
        this.remember(sid, next)
        const c = this.cache.get(sid)
        if (c) c.expireMs = next
      }
      fn?.(err)
    })
  }
}
