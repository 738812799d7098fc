import { Router } from 'express'
import { idParamsSchema, revisionQuerySchema } from '../../shared/schemas/params'
import { requireRole, requireSignedIn, currentUser } from '../middleware/guards'
import { validate } from '../middleware/validate'
import { roomSchema } from '../../shared/schemas/room'
import { createRoom, getRoom, listMyRooms, previewRoom, saveRoomRevision } from '../services/rooms'
import { searchRoomSubwoofers } from '../services/subwoofers'
import { subwooferSearchRequestSchema } from '../../shared/schemas/subwoofers'
import { userRateLimit } from '../middleware/user-rate-limit'

const id = validate(idParamsSchema, 'params')

export function roomsRouter(): Router {
  const router = Router()
  const previews = userRateLimit('previews')
  const searches = userRateLimit('subwoofers')
  const saves = userRateLimit('room-saves')
  router.get('/', requireRole('listener'), async (req, res) => res.json({ rooms: await listMyRooms(currentUser(req)) }))
  router.post('/', requireRole('listener'), saves, validate(roomSchema), async (req, res) => res.status(201).json(await createRoom(currentUser(req), res.locals.body)))
  router.post('/preview', requireSignedIn, previews, validate(roomSchema), async (req, res) => res.type('json').send(await previewRoom(res.locals.body, currentUser(req).id)))
  router.post('/subwoofers', requireSignedIn, searches, validate(subwooferSearchRequestSchema), async (_req, res) =>
    res.json(await searchRoomSubwoofers(res.locals.body.room, res.locals.body.counts)))
  router.get('/:id', requireSignedIn, id, validate(revisionQuerySchema, 'query'), async (req, res) =>
    res.json(await getRoom(currentUser(req), String(req.params.id), res.locals.query.revision)))
  router.put('/:id', requireRole('listener'), id, saves, validate(roomSchema), async (req, res) =>
    res.json(await saveRoomRevision(currentUser(req), String(req.params.id), res.locals.body)))
  return router
}
