import { accountFailureLimiter, passwordAttemptLimiter, signIn } from '../auth/session'
import { Router } from 'express'
import passport from 'passport'
import { validate } from '../middleware/validate'
import { requireSignedIn, currentUser } from '../middleware/guards'
import { csrfToken } from '../middleware/csrf'
import { loginSchema, registerSchema, updatePreferencesSchema, type User } from '../../shared/schemas/auth'
import { getPreferences, registerListener, setPreferences } from '../services/auth'
import { AppError } from '../errors'

export function authRouter(): Router {
  const router = Router()
  const limiter = passwordAttemptLimiter()
  const perAccount = accountFailureLimiter()

  router.get('/csrf', (req, res) => res.json({ token: csrfToken(req) }))

  router.post('/login', limiter, perAccount, validate(loginSchema), (req, res, next) => {
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

  router.get('/me', requireSignedIn, (req, res) => res.json(currentUser(req)))
  router.get('/preferences', requireSignedIn, async (req, res) => res.json(await getPreferences(currentUser(req).id)))
  router.patch('/preferences', requireSignedIn, validate(updatePreferencesSchema), async (req, res) =>
    res.json(await setPreferences(currentUser(req).id, res.locals.body)))
  return router
}
