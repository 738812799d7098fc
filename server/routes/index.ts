import { Router } from 'express'
import { authRouter } from './auth'
import { usersRouter } from './users'
import { healthRouter } from './health'
import { roomsRouter } from './rooms'
import { casesRouter } from './cases'
import { savedFiltersRouter, snippetsRouter } from './team'
import { caseFilesRouter, filesRouter } from './files'
import { mailRouter } from './mail'
import { caseRatingsRouter, metricsRouter } from './metrics'
import { auditRouter, teamAdminRouter } from './team-admin'
import { plansRouter } from './plans'

/** Every API router, mounted under /api. Each feature adds its line here. */
export function apiRouter(): Router {
  const router = Router()
  router.use('/health', healthRouter())
  router.use('/auth', authRouter())
  router.use('/users', usersRouter())
  router.use('/rooms', roomsRouter())
  router.use('/cases', casesRouter())
  router.use('/cases', caseFilesRouter())
  router.use('/files', filesRouter())
  router.use('/', mailRouter())
  router.use('/snippets', snippetsRouter())
  router.use('/saved-filters', savedFiltersRouter())
  router.use('/metrics', metricsRouter())
  router.use('/cases', caseRatingsRouter())
  router.use('/team', teamAdminRouter())
  router.use('/audit', auditRouter())
  router.use('/', plansRouter())
  return router
}
