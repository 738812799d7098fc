import type { Request, RequestHandler } from 'express'
import type passport from 'passport'
import { ipKeyGenerator, rateLimit } from 'express-rate-limit'
import { AppError } from '../errors'
import { config } from '../config'
import { PostgresRateLimitStore } from '../middleware/rate-limit-store'
import type { User } from '../../shared/schemas/auth'

/** Regenerates the session (against fixation, OWASP session management) and signs the user in, keeping the CSRF token. */
export function signIn(req: Request, user: User): Promise<void> {
  const token = req.session.csrfToken
  return new Promise((resolve, reject) => {
    req.session.regenerate((err) => {
      if (err) return reject(err)
      req.session.csrfToken = token
      req.login(user, { keepSessionInfo: true } as passport.LogInOptions, (e) => (e ? reject(e) : resolve()))
    })
  })
}

const tooMany: Parameters<typeof rateLimit>[0] = {
  standardHeaders: 'draft-8',
  legacyHeaders: false,
  // only failures count: an answer below 400 gives its attempt back, so people who sign in are never limited
  skipSuccessfulRequests: true,
  handler: (_req, _res, next) => next(new AppError('Too many failed attempts; wait a few minutes and try again', { status: 429, code: 'rate_limited' })),
}

/**
 * The limit on FAILED password attempts per client address (sign-in, sign-up, setting a password from an
 * invitation): LOGIN_RATE_LIMIT failures in SIGN_IN_WINDOW_MINUTES. High by default, as one office behind
 * a proxy shares an address; the per-account limit below is the tight one. Counted in PostgreSQL, so every
 * node shares one budget: sign-in, sign-up, password change and invitation acceptance share "password-address",
 * reset-link requests and resets have "reset-address".
 */
export function passwordAttemptLimiter(opts: { countSuccess?: boolean } = {}): RequestHandler {
  // reset-link requests answer 202 whether or not the address exists: every one of them counts
  return rateLimit({ ...tooMany, store: new PostgresRateLimitStore(opts.countSuccess ? 'reset-address' : 'password-address'), skipSuccessfulRequests: !opts.countSuccess, windowMs: config().SIGN_IN_WINDOW_MINUTES * 60_000, limit: config().LOGIN_RATE_LIMIT, identifier: 'address' })
}

/** The e-mail a sign-in names, as the account key (whether or not such an account exists, so no answer tells). */
const accountOf = (req: Request) => String((req.body as { email?: unknown } | undefined)?.email ?? '').trim().toLowerCase()

/**
 * The lockout on FAILED sign-ins per account AND client address: SIGN_IN_FAILURES_PER_ACCOUNT in
 * SIGN_IN_WINDOW_MINUTES from one address, then 429 for that account from that address only. Keyed by
 * both, so someone who knows an address cannot lock its owner out from elsewhere (a lockout per account
 * alone is a denial of service anyone can start; OWASP Authentication Cheat Sheet, "Account Lockout").
 * Guessing from many addresses is bounded by the per-address limit (passwordAttemptLimiter) and slowed by
 * the account-wide back-off below.
 */
export function accountAddressFailureLimiter(): RequestHandler {
  return rateLimit({
    ...tooMany,
    store: new PostgresRateLimitStore('signin-account-address'),
    windowMs: config().SIGN_IN_WINDOW_MINUTES * 60_000,
    limit: config().SIGN_IN_FAILURES_PER_ACCOUNT,
    identifier: 'account-address',
    keyGenerator: (req) => `account:${accountOf(req)}\naddress:${ipKeyGenerator(req.ip ?? '')}`,
  })
}

/** First step of the account-wide back-off, ms; it doubles with every further failure. */
export const SIGN_IN_BACKOFF_BASE_MS = 250

/**
 * The wait before a sign-in attempt on an account that already failed `failures` times in the window from
 * any address: none up to `threshold` failures, then 250 ms doubling with each failure, at most `maxMs`.
 * Exponential back-off instead of a lockout (OWASP Authentication Cheat Sheet, "Account Lockout"): the
 * owner still signs in, only more slowly, however many addresses guess at the account.
 */
export function signInBackoffMs(failures: number, threshold: number, maxMs: number): number {
  if (failures < threshold || maxMs <= 0) return 0
  const steps = Math.min(failures - threshold, 30)
  return Math.min(maxMs, SIGN_IN_BACKOFF_BASE_MS * 2 ** steps)
}

interface AccountFailures { accountFailures?: { used: number } }

/**
 * Counts FAILED sign-ins per account from every address (a success gives its attempt back) and holds each
 * new attempt for signInBackoffMs (SIGN_IN_FAILURES_PER_ACCOUNT, SIGN_IN_BACKOFF_MAX_MS) before its password
 * is checked; never refuses by itself. The wait is a timer: no worker thread or database connection is held
 * meanwhile (the client's own HTTP connection is).
 */
export function accountBackoff(): RequestHandler[] {
  const counter = rateLimit({
    ...tooMany,
    store: new PostgresRateLimitStore('signin-account'),
    windowMs: config().SIGN_IN_WINDOW_MINUTES * 60_000,
    // only counts: the back-off below acts on the count, this limiter never refuses
    limit: Number.MAX_SAFE_INTEGER,
    standardHeaders: false,
    identifier: 'account',
    requestPropertyName: 'accountFailures',
    keyGenerator: (req) => `account:${accountOf(req)}`,
  })
  const wait: RequestHandler = (req, _res, next) => {
    const used = (req as Request & AccountFailures).accountFailures?.used ?? 1
    // `used` counts this attempt too: the failures before it are one fewer
    const ms = signInBackoffMs(used - 1, config().SIGN_IN_FAILURES_PER_ACCOUNT, config().SIGN_IN_BACKOFF_MAX_MS)
    if (ms <= 0) return next()
    setTimeout(next, ms)
  }
  return [counter, wait]
}
