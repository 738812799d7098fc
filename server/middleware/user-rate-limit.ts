/**
 * Limits per signed-in user on work a person asks for: posting messages, uploads, engine previews,
 * subwoofer searches, queue searches, room saves and plan reports. Counted in PostgreSQL
 * (rate_limit_hits, migration 0090, ./rate-limit-store.ts) so every node shares one budget, keyed by
 * the user's id (not the client address: an office behind one proxy is many people, and one person
 * on many addresses is still one). Past a limit: 429 `too_many_requests` with Retry-After (seconds,
 * RFC 9110 §10.2.3), the RateLimit headers, and words from shared/words/limits.ts.
 * The limits come from the configuration only (server/config.ts): no request can change them.
 */
import type { Request, RequestHandler } from 'express'
import { rateLimit, type RateLimitInfo } from 'express-rate-limit'
import { config, type Config } from '../config'
import { AppError } from '../errors'
import { PostgresRateLimitStore } from './rate-limit-store'
import { tooManyWords, type LimitedAction } from '../../shared/words/limits'

const LIMIT_OF: Record<LimitedAction, keyof Config> = {
  messages: 'MESSAGE_RATE_LIMIT',
  uploads: 'UPLOAD_RATE_LIMIT',
  previews: 'PREVIEW_RATE_LIMIT',
  subwoofers: 'SUBWOOFER_RATE_LIMIT',
  search: 'SEARCH_RATE_LIMIT',
  'room-saves': 'ROOM_SAVE_RATE_LIMIT',
  reports: 'REPORT_RATE_LIMIT',
}

/** The budget of `action` per user in USER_RATE_WINDOW_SECONDS, from the configuration. */
export function userLimitOf(action: LimitedAction): number {
  return config()[LIMIT_OF[action]] as number
}

/**
 * The limiter of one action, for routes that have already checked the sign-in (it runs after
 * requireSignedIn/requireRole). Every request counts, answered or refused, except those `skip` lets
 * through (a queue page without a search, say). Limiters of one action share one budget wherever mounted.
 */
export function userRateLimit(action: LimitedAction, opts: { skip?: (req: Request) => boolean } = {}): RequestHandler {
  const windowMs = config().USER_RATE_WINDOW_SECONDS * 1000
  return rateLimit({
    store: new PostgresRateLimitStore(`user-${action}`),
    windowMs,
    limit: userLimitOf(action),
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    identifier: action,
    skip: (req) => !req.user || (opts.skip?.(req) ?? false),
    keyGenerator: (req) => `user:${req.user!.id}`,
    handler: (req, res, next) => {
      // the words say the wait the Retry-After header says (the library set it just before)
      const header = Number(res.getHeader('Retry-After'))
      const resetAt = (req as Request & { rateLimit?: RateLimitInfo }).rateLimit?.resetTime?.getTime() ?? Date.now() + windowMs
      const seconds = Number.isFinite(header) && header > 0 ? header : Math.max(1, Math.ceil((resetAt - Date.now()) / 1000))
      next(new AppError(tooManyWords(action, seconds), { status: 429, code: 'too_many_requests' }))
    },
  })
}
