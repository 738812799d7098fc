import type { Request, RequestHandler } from 'express'
import type passport from 'passport'
import { rateLimit } from 'express-rate-limit'
import { AppError } from '../errors'
import { config } from '../config'
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

/** The limit on password attempts (sign-in, sign-up, setting a password from an invitation), per client address. */
export function passwordAttemptLimiter(): RequestHandler {
  return rateLimit({
    windowMs: 15 * 60 * 1000,
    limit: config().LOGIN_RATE_LIMIT,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    handler: (_req, _res, next) => next(new AppError('Too many attempts; wait a few minutes and try again', { status: 429, code: 'rate_limited' })),
  })
}
