import { Router } from 'express'
import { z } from 'zod'
import { currentUser, requireRole, requireSignedIn } from '../middleware/guards'
import { validate } from '../middleware/validate'
import { metricsQuerySchema, ratingSchema, targetsSchema } from '../../shared/schemas/metrics'
import * as metrics from '../services/metrics'
import { getRating, rateCase } from '../services/ratings'

const supervisor = requireRole('supervisor')
const query = validate(metricsQuerySchema, 'query')

/** The supervisor's figures; every route takes the same `from`, `to`, `advisorIds`, `listenerIds`. */
export function metricsRouter(): Router {
  const router = Router()
  router.get('/status', supervisor, query, async (_req, res) => res.json(await metrics.casesByStatus(res.locals.query)))
  router.get('/queue', supervisor, query, async (_req, res) => res.json(await metrics.casesByStatus(res.locals.query)))
  router.get('/waiting', supervisor, query, async (_req, res) => res.json(await metrics.waitingTimes(res.locals.query)))
  router.get('/response-times', supervisor, query, async (_req, res) => res.json(await metrics.responseTimes(res.locals.query)))
  router.get('/breaches', supervisor, query, async (_req, res) => res.json(await metrics.breaches(res.locals.query)))
  router.get('/workload', supervisor, query, async (_req, res) => res.json(await metrics.workload(res.locals.query)))
  router.get('/reopen-rate', supervisor, query, async (_req, res) => res.json(await metrics.reopenRate(res.locals.query)))
  router.get('/flags', supervisor, query, async (_req, res) => res.json(await metrics.flags(res.locals.query)))
  router.get('/satisfaction', supervisor, query, async (_req, res) => res.json(await metrics.satisfaction(res.locals.query)))
  router.get('/targets', supervisor, async (_req, res) => res.json(await metrics.getTargets()))
  router.put('/targets', supervisor, validate(targetsSchema), async (req, res) => res.json(await metrics.setTargets(currentUser(req), res.locals.body)))
  return router
}

const idParam = z.object({ id: z.string().uuid() })

/** A listener's 1–5 rating of their closed case. */
export function caseRatingsRouter(): Router {
  const router = Router()
  router.get('/:id/rating', requireSignedIn, validate(idParam, 'params'), async (req, res) => {
    const rating = await getRating(currentUser(req), res.locals.params.id)
    res.json({ rating })
  })
  router.post('/:id/rating', requireRole('listener'), validate(idParam, 'params'), validate(ratingSchema), async (req, res) =>
    res.status(201).json(await rateCase(currentUser(req), res.locals.params.id, res.locals.body)))
  return router
}
