import { Router } from 'express'
import { currentUser, requireRole, requireSignedIn } from '../middleware/guards'
import { validate } from '../middleware/validate'
import { createPlanSchema, previewPlanSchema, sendPlanSchema } from '../../shared/schemas/plan'
import { casePlanParamsSchema, idParamsSchema } from '../../shared/schemas/params'
import { userRateLimit } from '../middleware/user-rate-limit'
import { createPlan, getPlan, listPlans, planReport, previewPlan, sendPlan } from '../services/plans'

const staff = requireRole('advisor', 'supervisor')

/** Treatment plans: mounted at /api (routes under /cases/:id/plans and /plans/preview). */
export function plansRouter(): Router {
  const router = Router()
  const reports = userRateLimit('reports')
  const previews = userRateLimit('previews')
  router.get('/cases/:id/plans', requireSignedIn, validate(idParamsSchema, 'params'), async (req, res) => res.json({ plans: await listPlans(currentUser(req), String(req.params.id)) }))
  router.post('/cases/:id/plans', staff, validate(idParamsSchema, 'params'), validate(createPlanSchema), async (req, res) =>
    res.status(201).json(await createPlan(currentUser(req), String(req.params.id), res.locals.body)))
  router.get('/cases/:id/plans/:version', requireSignedIn, validate(casePlanParamsSchema, 'params'), async (req, res) =>
    res.json(await getPlan(currentUser(req), String(req.params.id), res.locals.params.version)))
  router.post('/cases/:id/plans/:version/send', staff, validate(casePlanParamsSchema, 'params'), validate(sendPlanSchema), async (req, res) =>
    res.json(await sendPlan(currentUser(req), String(req.params.id), res.locals.params.version, res.locals.body)))
  router.get('/cases/:id/plans/:version/report.pdf', requireSignedIn, validate(casePlanParamsSchema, 'params'), reports, async (req, res) => {
    const { pdf, fileName } = await planReport(currentUser(req), String(req.params.id), res.locals.params.version)
    res.setHeader('Content-Type', 'application/pdf')
    res.setHeader('Content-Disposition', `inline; filename="${fileName}"`)
    res.setHeader('Cache-Control', 'private, no-store')
    res.send(pdf)
  })
  router.post('/plans/preview', staff, previews, validate(previewPlanSchema), async (req, res) =>
    res.json(await previewPlan(currentUser(req), res.locals.body.caseId, res.locals.body.plan)))
  return router
}
