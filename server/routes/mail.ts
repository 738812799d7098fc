import { createHash, timingSafeEqual } from 'node:crypto'
import { Router, type RequestHandler } from 'express'
import { z } from 'zod'
import { rateLimit } from 'express-rate-limit'
import { PostgresRateLimitStore } from '../middleware/rate-limit-store'
import { config } from '../config'
import { AppError, notFound } from '../errors'
import { requireRole } from '../middleware/guards'
import { validate } from '../middleware/validate'
import { listMailbox } from '../mail/mailbox'
import { handleInboundEmail } from '../mail/inbound'

export const INBOUND_SECRET_HEADER = 'X-Roomwright-Inbound-Secret'

const digest = (s: string) => createHash('sha256').update(s, 'utf8').digest()
/** Whether a request carries the shared secret of the inbound webhook, compared in constant time (equal-length digests). */
const hasInboundSecret = (given: string | undefined) => !!given && timingSafeEqual(digest(given), digest(config().INBOUND_EMAIL_SECRET))
const requireInboundSecret: RequestHandler = (req, _res, next) => {
  if (!hasInboundSecret(req.get(INBOUND_SECRET_HEADER))) {
    return next(new AppError('The inbound e-mail secret is missing or wrong', { status: 401, code: 'bad_inbound_secret' }))
  }
  next()
}

/**
 * Wrong or missing secrets per client address, counted in PostgreSQL across nodes (LOGIN_RATE_LIMIT in
 * SIGN_IN_WINDOW_MINUTES). A request with the right secret is skipped before it is counted, so a
 * provider posting many e-mails at once is never limited, not even while its requests are in flight.
 */
const inboundSecretFailures = () => rateLimit({
  store: new PostgresRateLimitStore('inbound-secret'),
  windowMs: config().SIGN_IN_WINDOW_MINUTES * 60_000,
  limit: config().LOGIN_RATE_LIMIT,
  standardHeaders: 'draft-8',
  legacyHeaders: false,
  skip: (req) => hasInboundSecret(req.get(INBOUND_SECRET_HEADER)),
  handler: (_req, _res, next) => next(new AppError('Too many requests with a wrong inbound secret; wait a few minutes', { status: 429, code: 'rate_limited' })),
})

/** The mailbox exists only while the local fake SMTP server is in use. */
const fakeSmtpOnly: RequestHandler = (_req, _res, next) => next(config().FAKE_SMTP === 'on' ? undefined : notFound('The mailbox'))

const mailboxQuery = z.object({
  limit: z.coerce.number().int().min(1).max(200).default(50),
  before: z.coerce.number().int().positive().max(Number.MAX_SAFE_INTEGER).optional(),
  to: z.string().trim().email().optional(),
})

const addressList = z.union([z.string().min(3).max(2000), z.array(z.string().min(3).max(500)).min(1).max(50)])
const inboundBody = z.object({
  to: addressList,
  from: z.string().min(3).max(500),
  subject: z.string().max(1000).default(''),
  text: z.string().max(1_000_000).optional(),
  html: z.string().max(2_000_000).optional(),
  /** the receiving server's Authentication-Results (RFC 8601), when the provider passes it on */
  authenticationResults: z.string().max(4000).optional(),
  /** the Message-ID header: the same e-mail posted twice is taken in once (mail/inbound-identity.ts) */
  messageId: z.string().max(998).optional(),
  /** the Date header: with the text, the identity of an e-mail that has no Message-ID */
  date: z.string().max(200).optional(),
})

/** Rejections the sender cannot fix by retrying: who may write is refused (403), what was written is unusable (422). */
const rejectionStatus = (reason: string) => (reason === 'unknown_token' || reason === 'sender_mismatch' || reason === 'sender_unverified' || reason === 'no_reply_address' || reason === 'listener_inactive' ? 403 : 422)
const rejectionMessage: Record<string, string> = {
  no_reply_address: 'No recipient is a case reply address',
  unknown_token: 'The reply address matches no case',
  sender_mismatch: 'The sender is not the listener of this case',
  sender_unverified: 'The receiving mail server found the sender forged (SPF/DMARC failed)',
  listener_inactive: 'The listener\'s account is switched off',
  auto_reply: 'Automatic replies are not added to cases',
  empty_reply: 'Nothing was left once the quoted history was removed',
}

/** Mounted at /api: GET /dev/mailbox (supervisors, fake SMTP only) and POST /inbound/email (shared secret). */
export function mailRouter(): Router {
  const router = Router()
  const secretFailures = inboundSecretFailures()

  router.get('/dev/mailbox', fakeSmtpOnly, requireRole('supervisor'), validate(mailboxQuery, 'query'), async (_req, res) => {
    res.json({ messages: await listMailbox(res.locals.query) })
  })

  router.post('/inbound/email', secretFailures, requireInboundSecret, validate(inboundBody), async (_req, res) => {
    const result = await handleInboundEmail(res.locals.body, { via: 'webhook' })
    if (!result.accepted) {
      throw new AppError(rejectionMessage[result.reason] ?? 'The case did not accept this message', { status: rejectionStatus(result.reason), code: result.reason })
    }
    // a delivery of an e-mail the case already took in: 200 with the first message's id, nothing added
    res.status(result.duplicate ? 200 : 201).json(result)
  })

  return router
}
