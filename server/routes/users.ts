import { Router } from 'express'
import { requireRole } from '../middleware/guards'
import { validate } from '../middleware/validate'
import { createUserSchema } from '../../shared/schemas/auth'
import { createStaffUser } from '../services/auth'
import { listUsers, toPublicUser } from '../data/users'

export function usersRouter(): Router {
  const router = Router()
  router.get('/', requireRole('supervisor', 'advisor'), async (_req, res) => {
    const users = await listUsers(['advisor', 'supervisor'])
    res.json({ users: users.map((u) => ({ ...toPublicUser(u), active: u.active })) })
  })
  router.post('/', requireRole('supervisor'), validate(createUserSchema), async (_req, res) => {
    res.status(201).json(await createStaffUser(res.locals.body))
  })
  return router
}
