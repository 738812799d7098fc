import { Router } from 'express'
import { authRouter } from './auth'
import { usersRouter } from './users'
import { healthRouter } from './health'

/** Every API router, mounted under /api. Each feature adds its line here. */
export function apiRouter(): Router {
  const router = Router()
  router.use('/health', healthRouter())
  router.use('/auth', authRouter())
  router.use('/users', usersRouter())
  return router
}
