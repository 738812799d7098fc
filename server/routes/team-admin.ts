import { passwordAttemptLimiter, signIn } from '../auth/session'
import { Router } from 'express'
import passport from 'passport'
import { z } from 'zod'
import { currentUser, requireRole } from '../middleware/guards'
import { validate } from '../middleware/validate'
import { acceptInvitationSchema, auditQuerySchema, invitationTokenSchema, inviteSchema, listenerQuerySchema, roleChangeSchema } from '../../shared/schemas/team'
import type { User } from '../../shared/schemas/auth'
import * as team from '../services/team'

const supervisor = requireRole('supervisor')
const idParam = validate(z.object({ id: z.string().uuid() }), 'params')


/** Team management for supervisors, and the public end of an invitation link. */
export function teamAdminRouter(): Router {
  const router = Router()
  const limiter = passwordAttemptLimiter()

  router.get('/members', supervisor, async (_req, res) => res.json({ members: await team.listMembers() }))
  router.get('/listeners', supervisor, validate(listenerQuerySchema, 'query'), async (_req, res) => res.json(await team.listListeners(res.locals.query)))
  // deactivate / reactivate take any account (listeners too); the role change only team members.
  router.post('/members/:id/deactivate', supervisor, idParam, async (req, res) => res.json(await team.deactivate(currentUser(req), res.locals.params.id)))
  router.post('/members/:id/reactivate', supervisor, idParam, async (req, res) => res.json(await team.reactivate(currentUser(req), res.locals.params.id)))
  router.put('/members/:id/role', supervisor, idParam, validate(roleChangeSchema), async (req, res) =>
    res.json(await team.changeRole(currentUser(req), res.locals.params.id, res.locals.body.role)))

  router.get('/invitations', supervisor, async (_req, res) => res.json({ invitations: await team.listInvitations() }))
  router.post('/invitations', supervisor, validate(inviteSchema), async (req, res) => {
    const { invitation } = await team.invite(currentUser(req), res.locals.body)
    res.status(201).json(invitation)
  })
  router.delete('/invitations/:id', supervisor, idParam, async (req, res) => {
    await team.revokeInvitation(currentUser(req), res.locals.params.id)
    res.status(204).end()
  })

  // Public: the set-password page reads the invitation, then uses it once.
  router.get('/invitations/by-token/:token', limiter, validate(z.object({ token: invitationTokenSchema }), 'params'), async (_req, res) =>
    res.json(await team.previewInvitation(res.locals.params.token)))
  router.post('/invitations/accept', limiter, validate(acceptInvitationSchema), async (req, res) => {
    const user = await team.acceptInvitation(res.locals.body)
    await signIn(req, user)
    res.status(201).json(user)
  })
  return router
}

export function auditRouter(): Router {
  const router = Router()
  router.get('/', supervisor, validate(auditQuerySchema, 'query'), async (_req, res) => res.json(await team.listAudit(res.locals.query)))
  return router
}
