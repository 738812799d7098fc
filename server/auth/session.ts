import type { Request, RequestHandler } from 'express'
import type passport from 'passport'
import { rateLimit } from 'express-rate-limit'
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

/**
 * The limit on FAILED sign-ins per account (the e-mail given, whether or not it exists, so the answer tells
 * nothing): SIGN_IN_FAILURES_PER_ACCOUNT in SIGN_IN_WINDOW_MINUTES, from any number of addresses.
 */
export function accountFailureLimiter(): RequestHandler {
  return rateLimit({
    ...tooMany,
    store: new PostgresRateLimitStore('signin-account'),
    windowMs: config().SIGN_IN_WINDOW_MINUTES * 60_000,
    limit: config().SIGN_IN_FAILURES_PER_ACCOUNT,
    identifier: 'account',
    keyGenerator: (req) => `account:${String((req.body as { email?: unknown } | undefined)?.email ?? '').trim().toLowerCase()}`,
  })
}
