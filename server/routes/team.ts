import { Router } from 'express'
import { z } from 'zod'
import { requireRole, currentUser } from '../middleware/guards'
import { validate } from '../middleware/validate'
import { snippetSchema, snippetUpdateSchema } from '../../shared/schemas/snippet'
import { savedFilterSchema } from '../../shared/schemas/queue'
import { createSnippet, deleteSnippet, listSnippets, snippetsForCase, updateSnippet } from '../services/snippets'
import { deleteSavedFilter, listSavedFilters, saveFilter } from '../services/saved-filters'
import { notFound } from '../errors'

const idParam = z.object({ id: z.string().uuid() })

/** Reply snippets (the team's and each advisor's own) and each advisor's saved queue filters. */
export function snippetsRouter(): Router {
  const router = Router()
  router.get('/', requireRole('advisor', 'supervisor'), async (req, res) => res.json({ snippets: await listSnippets(currentUser(req)) }))
  router.get('/for-case/:id', requireRole('advisor', 'supervisor'), validate(idParam, 'params'), async (req, res) =>
    res.json({ snippets: await snippetsForCase(currentUser(req), res.locals.params.id) }))
  router.post('/', requireRole('advisor', 'supervisor'), validate(snippetSchema), async (req, res) => res.status(201).json(await createSnippet(currentUser(req), res.locals.body)))
  router.put('/:id', requireRole('advisor', 'supervisor'), validate(idParam, 'params'), validate(snippetUpdateSchema), async (req, res) =>
    res.json(await updateSnippet(currentUser(req), res.locals.params.id, res.locals.body)))
  router.delete('/:id', requireRole('advisor', 'supervisor'), validate(idParam, 'params'), async (req, res) => {
    await deleteSnippet(currentUser(req), res.locals.params.id)
    res.status(204).end()
  })
  return router
}

export function savedFiltersRouter(): Router {
  const router = Router()
  router.get('/', requireRole('advisor', 'supervisor'), async (req, res) => res.json({ filters: await listSavedFilters(currentUser(req).id) }))
  router.post('/', requireRole('advisor', 'supervisor'), validate(savedFilterSchema), async (req, res) => res.status(201).json(await saveFilter(currentUser(req).id, res.locals.body)))
  router.delete('/:id', requireRole('advisor', 'supervisor'), validate(idParam, 'params'), async (req, res) => {
    if (!(await deleteSavedFilter(currentUser(req).id, res.locals.params.id))) throw notFound('That filter')
    res.status(204).end()
  })
  return router
}
