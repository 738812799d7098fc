import express, { type RequestHandler } from 'express'
import helmet from 'helmet'
import pg from 'pg'
import { existsSync } from 'node:fs'
import { join, resolve } from 'node:path'
import { config } from './config'
import { configurePassport } from './auth/passport'
import { SessionStore } from './auth/session-store'
import { sessionMiddleware } from './auth/session-middleware'
import { clientPage } from './middleware/client-page'
import { csrfProtection } from './middleware/csrf'
import { rejectNulCharacters } from './middleware/validate'
import { errorHandler, notFoundHandler } from './middleware/errors'
import { apiRouter } from './routes'
import { closeAnalysisPool } from './analysis/pool'
import { closeQueueCache } from './services/queue'

/**
 * helmet's headers, worked out once and set in one step: with these options every one of them is the same
 * on every response (no nonces, nothing read from the request), and twelve middleware calls per request
 * were a measurable share of a cached request's CPU.
 */
function fixedHeaders(h: RequestHandler): RequestHandler {
  const set: [string, string | number | readonly string[]][] = []
  const remove: string[] = []
  const res = { setHeader: (k: string, v: string) => set.push([k, v]), removeHeader: (k: string) => remove.push(k) }
  let called = false
  h({ method: 'GET', headers: {}, url: '/' } as never, res as never, () => (called = true))
  if (!called) throw new Error('helmet did not finish synchronously')
  return (_req, r, next) => {
    for (const k of remove) r.removeHeader(k)
    for (const [k, v] of set) r.setHeader(k, v)
    next()
  }
}

/**
 * What passport.session() does (passport's SessionStrategy: the user id kept in the session, the
 * deserializer, `req.user`; a session whose account is gone forgets it), without building a strategy
 * object and its callbacks on every request (passport's authenticate was 2.3 % of a cached GET's CPU).
 */
function sessionUser(p: typeof import('passport')): RequestHandler {
  const init = p.initialize()
  return (req, res, next) => {
    // req.login / req.logout serve only state-changing requests (sign-in, sign-out); giving every request
    // them costs a reshaped request object (passport.initialize was 3.8 % of a cached GET's CPU)
    const safe = req.method === 'GET' || req.method === 'HEAD'
    ;(safe ? (_q: unknown, _r: unknown, go: () => void) => go() : init)(req, res, () => {
      const data = (req.session as { passport?: { user?: unknown } } | undefined)?.passport
      const id = data?.user
      if (id === undefined || id === null || id === '') return next()
      p.deserializeUser(id, req, (err: unknown, user?: Express.User | false | null) => {
        if (err) return next(err)
        if (!user) delete data!.user
        else req.user = user
        next()
      })
    })
  }
}

export interface BuiltApp {
  app: express.Express
  sessionMiddleware: RequestHandler
  close: () => Promise<void>
}

/** Builds the Express app (no listening here, so tests run it in-process on port 0). */
export function createApp(opts: { clientDir?: string | false } = {}): BuiltApp {
  const cfg = config()
  const app = express()
  app.disable('x-powered-by')
  if (cfg.TRUST_PROXY) app.set('trust proxy', 1)

  const securityHeaders = helmet({
      contentSecurityPolicy: {
        directives: {
          defaultSrc: ["'self'"],
          imgSrc: ["'self'", 'data:', 'blob:'],
          styleSrc: ["'self'", "'unsafe-inline'"],
          fontSrc: ["'self'", 'data:'],
          connectSrc: ["'self'", 'ws:', 'wss:'],
          objectSrc: ["'none'"],
          frameAncestors: ["'none'"],
          upgradeInsecureRequests: cfg.NODE_ENV === 'production' ? [] : null,
        },
      },
      crossOriginEmbedderPolicy: false,
    })
  app.use(fixedHeaders(securityHeaders))

  const sessionPool = new pg.Pool({ connectionString: cfg.DATABASE_URL, max: 8, connectionTimeoutMillis: 3000 })
  sessionPool.on('error', () => {})
  const store = new SessionStore({ pool: sessionPool, tableName: 'session', createTableIfMissing: false, pruneSessionInterval: 15 * 60 })
  const sessions = sessionMiddleware({
    name: 'rw.sid',
    store,
    secret: cfg.SESSION_SECRET,
    cookie: {
      httpOnly: true,
      sameSite: 'lax',
      secure: cfg.NODE_ENV === 'production' && !!cfg.PUBLIC_URL?.startsWith('https:'),
      maxAge: 14 * 24 * 3600 * 1000,
    },
  })

  const passport = configurePassport()
  const api = express.Router()
  api.use(express.json({ limit: '1mb' }))
  api.use(rejectNulCharacters)
  api.use(sessions.api)
  api.use(sessionUser(passport))
  api.use(csrfProtection({ exempt: ['/inbound/'] }))
  api.use(apiRouter())
  api.use(notFoundHandler)
  app.use('/api', api)

  const clientDir = opts.clientDir === undefined ? resolve('dist') : opts.clientDir
  if (clientDir && existsSync(join(clientDir, 'index.html'))) {
    app.use(express.static(clientDir, { index: false, maxAge: '1h' }))
    // the page carries who is signed in (./middleware/client-page.ts), read through the same session as the API
    app.get(/^(?!\/api\/|\/socket\.io\/).*/, sessions.api, sessionUser(passport), clientPage(join(clientDir, 'index.html')))
  }
  app.use(errorHandler)

  // the worker pool runs the room engine for requests too (preview, save, submit): its threads end with the app
  // sockets read the session through express-session itself (their handshakes are no API requests)
  return { app, sessionMiddleware: sessions.full, close: async () => { await closeAnalysisPool(); await store.closeCache(); await closeQueueCache(); await sessionPool.end() } }
}
