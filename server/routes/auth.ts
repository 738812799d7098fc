import { accountAddressFailureLimiter, accountBackoff, passwordAttemptLimiter, signIn } from '../auth/session'
import { Router } from 'express'
import passport from 'passport'
import { validate } from '../middleware/validate'
import { requireSignedIn, currentUser } from '../middleware/guards'
import { csrfToken } from '../middleware/csrf'
import {
  changePasswordSchema, loginSchema, passwordResetRequestSchema, passwordResetSchema, registerSchema, updatePreferencesSchema, type User,
} from '../../shared/schemas/auth'
import { getPreferences, registerListener, setPreferences } from '../services/auth'
import { RESET_REQUESTED_MESSAGE, changePassword, resetPassword, startPasswordReset } from '../services/passwords'
import { AppError } from '../errors'

export function authRouter(): Router {
  const router = Router()
  const limiter = passwordAttemptLimiter()
  // a lockout per account and address, and a back-off per account (auth/session.ts)
  const perAccountAddress = accountAddressFailureLimiter()
  const perAccount = accountBackoff()
  // Its own budget per client address, so asking for reset links does not eat into sign-in attempts (and the reverse).
  const resetLimiter = passwordAttemptLimiter({ countSuccess: true })

  router.get('/csrf', (req, res) => res.json({ token: csrfToken(req) }))

  router.post('/login', limiter, perAccountAddress, ...perAccount, validate(loginSchema), (req, res, next) => {
    passport.authenticate('local', { session: false }, (err: unknown, user: User | false) => {
      if (err) return next(err)
      if (!user) return next(new AppError('That e-mail and password do not match an account', { status: 401, code: 'bad_credentials' }))
      signIn(req, user).then(() => res.json(user), next)
    })(req, res, next)
  })

  router.post('/register', limiter, validate(registerSchema), async (req, res) => {
    const user = await registerListener(res.locals.body)
    await signIn(req, user)
    res.status(201).json(user)
  })

  router.post('/logout', (req, res, next) => {
    req.logout((err) => {
      if (err) return next(err)
      req.session.destroy((e) => {
        if (e) return next(e)
        res.clearCookie('rw.sid')
        res.status(204).end()
      })
    })
  })

  // Signed in, with the current password; the other sessions of the account end, and this one goes on
  // under a new id (OWASP session management: renew the id on a change of credentials, so an id that
  // was fixed or copied before the change is worth nothing after it).
  router.post('/password', requireSignedIn, limiter, validate(changePasswordSchema), async (req, res) => {
    const result = await changePassword(currentUser(req), req.sessionID, res.locals.body)
    await signIn(req, currentUser(req))
    res.json(result)
  })
  // "Forgot password?": the same 202 and body for every address, answered before any lookup.
  router.post('/password-reset/request', resetLimiter, validate(passwordResetRequestSchema), (_req, res) => {
    startPasswordReset(res.locals.body.email)
    res.status(202).json({ message: RESET_REQUESTED_MESSAGE })
  })
  // The link from the e-mail, used once; every session of the account ends, the person then signs in.
  router.post('/password-reset', resetLimiter, validate(passwordResetSchema), async (_req, res) => {
    await resetPassword(res.locals.body)
    res.status(204).end()
  })

  // The page's first question: 200 with the user or with null, never a 401 (a signed-out visitor is a normal case).
  router.get('/session', (req, res) => res.json({ user: req.user ?? null }))
  router.get('/me', requireSignedIn, (req, res) => res.json(currentUser(req)))
  router.get('/preferences', requireSignedIn, async (req, res) => res.json(await getPreferences(currentUser(req).id)))
  router.patch('/preferences', requireSignedIn, validate(updatePreferencesSchema), async (req, res) =>
    res.json(await setPreferences(currentUser(req).id, res.locals.body)))
  return router
}
