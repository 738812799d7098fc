import { randomBytes, timingSafeEqual } from 'node:crypto'
import type { Request, RequestHandler } from 'express'
import { AppError } from '../errors'

declare module 'express-session' {
  interface SessionData {
    csrfToken?: string
  }
}

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS'])

/** The session's synchroniser token (OWASP CSRF cheat sheet), made on first request. */
export function csrfToken(req: Request): string {
  req.session.csrfToken ??= randomBytes(32).toString('base64url')
  return req.session.csrfToken
}

/** Every state-changing request must echo the session's token in X-CSRF-Token. */
export function csrfProtection(opts: { exempt?: string[] } = {}): RequestHandler {
  return (req, _res, next) => {
    if (SAFE.has(req.method) || opts.exempt?.some((p) => req.path.startsWith(p))) return next()
    const sent = req.get('x-csrf-token') ?? ''
    const expected = req.session?.csrfToken ?? ''
    const ok = expected.length > 0 && sent.length === expected.length && timingSafeEqual(Buffer.from(sent), Buffer.from(expected))
    if (!ok) return next(new AppError('The page is out of date: reload and try again', { status: 403, code: 'csrf' }))
    next()
  }
}
