import { Router } from 'express'
import { requireRole } from '../middleware/guards'
import { listUsers, toPublicUser } from '../data/users'

export function usersRouter(): Router {
  const router = Router()
  router.get('/', requireRole('supervisor', 'advisor'), async (_req, res) => {
    const users = await listUsers(['advisor', 'supervisor'])
    res.json({ users: users.map((u) => ({ ...toPublicUser(u), active: u.active })) })
  })
  // No POST here: advisor and supervisor accounts are created only by accepting an invitation
  // (services/team.ts acceptInvitation), which writes the audit entry.
  return router
}
