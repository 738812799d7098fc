import { Router } from 'express'
import { requireRole, requireSignedIn, currentUser } from '../middleware/guards'
import { validate } from '../middleware/validate'
import { createCaseSchema, messageSchema, updateCaseSchema } from '../../shared/schemas/case'
import { createCase, listMyCases, updateCase } from '../services/cases'
import { readableCase, audienceOf } from '../services/access'
import { latestTriage, triageHistory } from '../services/triage'
import { getThread, postMessage } from '../services/messages'
import { listEvents } from '../data/events'
import { notFound } from '../errors'
import { teamQueue } from '../services/queue'
import { afterQuerySchema, idParamsSchema } from '../../shared/schemas/params'
import { userRateLimit } from '../middleware/user-rate-limit'

const afterQuery = afterQuerySchema
const id = validate(idParamsSchema, 'params')

export function casesRouter(): Router {
  const router = Router()
  // only the team's full-text searches count (a listener's list, or a queue page without `q`, is cheap)
  const searches = userRateLimit('search', { skip: (req) => req.user?.role === 'listener' || !String(req.query.q ?? '').trim() })
  const posts = userRateLimit('messages')
  // Listeners get their own cases; the team gets the queue, paged, sorted and filtered on the server.
  router.get('/', requireSignedIn, searches, async (req, res) => {
    const user = currentUser(req)
    if (user.role === 'listener') {
      const rows = await listMyCases(user)
      return res.json({ rows, total: rows.length })
    }
    // the page's JSON bytes and ETag come made with the (cached) page: the same answer res.json would give
    const page = await teamQueue(user, req.query)
    const etagOf = req.app.get('etag fn') as ((body: Buffer) => string) | undefined
    page.etag ??= etagOf?.(page.body)
    if (page.etag) res.set('ETag', page.etag)
    res.type('json').send(page.body)
  })
  router.post('/', requireRole('listener'), validate(createCaseSchema), async (req, res) => res.status(201).json(await createCase(currentUser(req), res.locals.body)))
  router.get('/:id', requireSignedIn, id, async (req, res) => res.json(await readableCase(currentUser(req), String(req.params.id))))
  router.patch('/:id', requireSignedIn, id, validate(updateCaseSchema), async (req, res) => res.json(await updateCase(currentUser(req), String(req.params.id), res.locals.body)))
  router.get('/:id/triage', requireSignedIn, id, async (req, res) => {
    await readableCase(currentUser(req), String(req.params.id))
    const triage = await latestTriage(String(req.params.id))
    if (!triage) throw notFound('A triage for this case (it is computed when the case is sent)')
    res.json(triage)
  })
  router.get('/:id/triage/history', requireSignedIn, id, async (req, res) => {
    await readableCase(currentUser(req), String(req.params.id))
    res.json({ history: await triageHistory(String(req.params.id)) })
  })
  router.get('/:id/events', requireSignedIn, id, validate(afterQuery, 'query'), async (req, res) => {
    const user = currentUser(req)
    await readableCase(user, String(req.params.id))
    res.json({ events: await listEvents(String(req.params.id), { afterId: res.locals.query.after, audience: audienceOf(user) }) })
  })
  router.get('/:id/messages', requireSignedIn, id, async (req, res) => res.json({ messages: await getThread(currentUser(req), String(req.params.id)) }))
  router.post('/:id/messages', requireSignedIn, id, posts, validate(messageSchema), async (req, res) =>
    res.status(201).json(await postMessage(currentUser(req), String(req.params.id), res.locals.body)))
  return router
}
