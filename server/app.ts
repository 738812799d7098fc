import express, { type RequestHandler } from 'express'
import session from 'express-session'
import helmet from 'helmet'
import pg from 'pg'
import { existsSync } from 'node:fs'
import { join, resolve } from 'node:path'
import { config } from './config'
import { configurePassport } from './auth/passport'
import { SessionStore } from './auth/session-store'
import { csrfProtection } from './middleware/csrf'
import { rejectNulCharacters } from './middleware/validate'
import { errorHandler, notFoundHandler } from './middleware/errors'
import { apiRouter } from './routes'
import { closeAnalysisPool } from './analysis/pool'
import { closeQueueCache } from './services/queue'

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

  app.use(
    helmet({
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
    }),
  )

  const sessionPool = new pg.Pool({ connectionString: cfg.DATABASE_URL, max: 8, connectionTimeoutMillis: 3000 })
  sessionPool.on('error', () => {})
  const store = new SessionStore({ pool: sessionPool, tableName: 'session', createTableIfMissing: false, pruneSessionInterval: 15 * 60 })
  const sessionMiddleware = session({
    name: 'rw.sid',
    store,
    secret: cfg.SESSION_SECRET,
    // rolling expiry (14 days after the last request); the store writes it at most every 10 minutes
    resave: false,
    saveUninitialized: false,
    rolling: true,
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
  api.use(sessionMiddleware)
  api.use(passport.session())
  api.use(csrfProtection({ exempt: ['/inbound/'] }))
  api.use(apiRouter())
  api.use(notFoundHandler)
  app.use('/api', api)

  const clientDir = opts.clientDir === undefined ? resolve('dist') : opts.clientDir
  if (clientDir && existsSync(join(clientDir, 'index.html'))) {
    app.use(express.static(clientDir, { index: false, maxAge: '1h' }))
    app.get(/^(?!\/api\/|\/socket\.io\/).*/, (_req, res) => res.sendFile(join(clientDir, 'index.html')))
  }
  app.use(errorHandler)

  // the worker pool runs the room engine for requests too (preview, save, submit): its threads end with the app
  return { app, sessionMiddleware, close: async () => { await closeAnalysisPool(); await store.closeCache(); await closeQueueCache(); await sessionPool.end() } }
}
