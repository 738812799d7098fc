import type { RequestHandler, Response } from 'express'
import session from 'express-session'
import { createRequire } from 'node:module'
import { sessionBody, type SessionStore } from './session-store'
import { log } from '../lib/log'

// the cookie parser and the signing module express-session itself uses (so a cookie read and verified
// here is exactly one it would accept)
const fromSession = createRequire(createRequire(import.meta.url).resolve('express-session'))
const signature = fromSession('cookie-signature') as { sign(value: string, secret: string): string; unsign(signed: string, secret: string): string | false }
const cookie = fromSession('cookie') as { parse(header: string): Record<string, string | undefined> }
/** express-session's Cookie serialises itself with its options (its `serialize`, missing from its types). */
const serialize = (c: session.Cookie, name: string, value: string) => (c as unknown as { serialize(n: string, v: string): string }).serialize(name, value)

const VERIFIED_MAX = 20_000

export interface SessionOptions {
  name: string
  store: SessionStore
  secret: string
  cookie: session.CookieOptions & { maxAge: number }
}

/**
 * express-session with a shorter path for the commonest request: a GET or HEAD carrying a signed-in
 * session's cookie that this node holds in memory (auth/session-store.ts). Everything else — no cookie,
 * an unknown or changed session, any other method — goes through express-session unchanged.
 *
 * On the short path, per request (each measured in bench/queue.ts's signed-in /api/auth/me):
 * - the cookie's signature is checked once per distinct cookie value and remembered (value → session id),
 *   not recomputed with an HMAC on every request;
 * - the session is built with express-session's own classes (`store.createSession`), so `req.session`
 *   behaves exactly as it does on the long path (save, regenerate, destroy);
 * - at the end it is saved only when its data changed (a text comparison instead of three SHA-1 hashes),
 *   and the rolling expiry is written, and the cookie sent again with it, only when the stored expiry
 *   would move (at most every TOUCH_EVERY_MS): the cookie's expiry and the stored one move together.
 * The same store answers both paths, so sign-out, deactivation and role changes on any node apply on the
 * next request here as they do on the long path (the store's caught-up check).
 */
export function sessionMiddleware(opts: SessionOptions): { api: RequestHandler; full: RequestHandler } {
  const { name, store, secret } = opts
  const full = session({
    name,
    store,
    secret,
    // rolling expiry (14 days after the last request); the store writes it at most every 10 minutes
    resave: false,
    saveUninitialized: false,
    rolling: true,
    cookie: opts.cookie,
  })
  // signed cookie value → the session id it carries; only values whose signature checked out are kept
  const verified = new Map<string, string>()
  const sidOf = (raw: string): string | undefined => {
    const known = verified.get(raw)
    if (known !== undefined) return known
    if (!raw.startsWith('s:')) return undefined
    const sid = signature.unsign(raw.slice(2), secret)
    if (sid === false) return undefined
    if (verified.size >= VERIFIED_MAX) verified.clear()
    verified.set(raw, sid)
    return sid
  }

  const api: RequestHandler = (req, res, next) => {
    if ((req.method !== 'GET' && req.method !== 'HEAD') || req.session || !req.headers.cookie) return full(req, res, next)
    const raw = cookie.parse(req.headers.cookie)[name]
    const sid = raw ? sidOf(raw) : undefined
    if (!sid) return full(req, res, next)
    store.fromMemoryCaughtUp(sid, (hit) => {
      if (!hit) return full(req, res, next)
      req.sessionStore = store as unknown as typeof req.sessionStore
      req.sessionID = sid
      const s = store.createSession(req, hit.sess)
      s.touch()
      const expires = s.cookie.expires?.getTime() ?? NaN
      // rolling expiry: stored expiry and cookie renewed at most every TOUCH_EVERY_MS (10 min), so an active session never lapses
      const due = Number.isFinite(expires) && store.touchDue(sid, expires)
      const insecure = s.cookie.secure && !req.secure
      if (due && !insecure) res.append('Set-Cookie', serialize(s.cookie, name, raw!))
      endAfterSaving(res, (done) => {
        const now = req.session
        if (!now) return done()
        if (req.sessionID !== sid || now.id !== sid) {
          // regenerated during the request: a new id, so a new signed cookie (as express-session would send)
          if (!res.headersSent && !insecure) res.append('Set-Cookie', serialize(now.cookie, name, `s:${signature.sign(req.sessionID, secret)}`))
          return now.save(done)
        }
        if (sessionBody(now) !== hit.body) return now.save(done)
        if (due) return store.touch(sid, now, done)
        done()
      })
      next()
    })
  }
  return { api, full }
}

/** Holds the response's end until `work` is done (so the next request of the client sees what this one saved). */
function endAfterSaving(res: Response, work: (done: (err?: unknown) => void) => void): void {
  const end = res.end
  let ended = false
  res.end = function (this: Response, ...args: unknown[]) {
    if (ended) return this
    ended = true
    work((err) => {
      if (err) log.warn('session not saved', { err: String(err) })
      res.end = end
      ;(end as (...a: unknown[]) => Response).apply(res, args)
    })
    return this
  } as Response['end']
}
