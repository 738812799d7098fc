import { Router } from 'express'
import { z } from 'zod'
import { requireRole, requireSignedIn, currentUser } from '../middleware/guards'
import { validate } from '../middleware/validate'
import { roomSchema } from '../../shared/schemas/room'
import { createRoom, getRoom, listMyRooms, previewRoom, saveRoomRevision } from '../services/rooms'
import { searchRoomSubwoofers } from '../services/subwoofers'
import { subwooferSearchRequestSchema } from '../../shared/schemas/subwoofers'

const revisionQuery = z.object({ revision: z.coerce.number().int().positive().optional() })

export function roomsRouter(): Router {
  const router = Router()
  router.get('/', requireRole('listener'), async (req, res) => res.json({ rooms: await listMyRooms(currentUser(req)) }))
  router.post('/', requireRole('listener'), validate(roomSchema), async (req, res) => res.status(201).json(await createRoom(currentUser(req), res.locals.body)))
  router.post('/preview', requireSignedIn, validate(roomSchema), async (_req, res) => res.type('json').send(await previewRoom(res.locals.body)))
  router.post('/subwoofers', requireSignedIn, validate(subwooferSearchRequestSchema), async (_req, res) =>
    res.json(await searchRoomSubwoofers(res.locals.body.room, res.locals.body.counts)))
  router.get('/:id', requireSignedIn, validate(revisionQuery, 'query'), async (req, res) =>
    res.json(await getRoom(currentUser(req), String(req.params.id), res.locals.query.revision)))
  router.put('/:id', requireRole('listener'), validate(roomSchema), async (req, res) =>
    res.json(await saveRoomRevision(currentUser(req), String(req.params.id), res.locals.body)))
  return router
}
