import { z } from 'zod'
import { emailSchema, passwordSchema, type Role } from './auth'
import { pageQuery } from './paging'

export const staffRoles = ['advisor', 'supervisor'] as const
export const staffRoleSchema = z.enum(staffRoles)
export type StaffRole = z.infer<typeof staffRoleSchema>

export const inviteSchema = z.object({
  email: emailSchema,
  name: z.string().trim().min(1, 'enter their name').max(120),
  role: staffRoleSchema,
})
export type InviteInput = z.infer<typeof inviteSchema>

/** Invitation tokens are 32 random bytes, base64url (43 characters). */
export const invitationTokenSchema = z.string().regex(/^[A-Za-z0-9_-]{43}$/, 'this link is incomplete; open it from the e-mail again')

export const acceptInvitationSchema = z.object({
  token: invitationTokenSchema,
  password: passwordSchema,
  name: z.string().trim().min(1, 'enter your name').max(120).optional(),
})
export type AcceptInvitationInput = z.infer<typeof acceptInvitationSchema>

export const roleChangeSchema = z.object({ role: staffRoleSchema })

/** Any account as the people list shows it (listeners too). `openCases`: assigned ones for staff, their own for listeners. */
export interface AccountSummary {
  id: string
  name: string
  email: string
  role: Role
  active: boolean
  createdAt: string
  openCases: number
}

export const listenerQuerySchema = z.object({
  search: z.string().trim().max(120).optional().transform((s) => s || undefined),
  active: z.enum(['true', 'false']).optional().transform((v) => (v === undefined ? undefined : v === 'true')),
  ...pageQuery(100, 25),
})
export type ListenerQuery = z.output<typeof listenerQuerySchema>

export interface TeamMember {
  id: string
  name: string
  email: string
  role: StaffRole
  active: boolean
  createdAt: string
  openCases: number
}

export interface Invitation {
  id: string
  email: string
  name: string
  role: StaffRole
  invitedBy: { id: string; name: string } | null
  createdAt: string
  expiresAt: string
  state: 'pending' | 'accepted' | 'expired' | 'revoked'
}

/** What the set-password page shows before the password is chosen. */
export interface InvitationPreview { email: string; name: string; role: StaffRole; expiresAt: string }

/** Every audit action with its label; the list of actions (and the query's enum) is read from it. */
export const auditActionLabels = {
  'invitation.sent': 'Invitation sent',
  'invitation.revoked': 'Invitation withdrawn',
  'invitation.accepted': 'Invitation accepted',
  'member.deactivated': 'Account switched off',
  'member.reactivated': 'Account switched back on',
  'member.role_changed': 'Role changed',
  'targets.changed': 'Response targets changed',
  'snippet.team_created': 'Team snippet added',
  'snippet.team_changed': 'Team snippet edited',
  'snippet.team_deleted': 'Team snippet removed',
  'password.changed': 'Password changed',
  'password.reset': 'Password reset by e-mail link',
}
export type AuditAction = keyof typeof auditActionLabels
export const auditActions = Object.keys(auditActionLabels) as [AuditAction, ...AuditAction[]]

const instant = z.string().datetime({ offset: true, message: 'an ISO date-time such as 2025-03-03T00:00:00Z' })

export const auditQuerySchema = z.object({
  actorId: z.string().uuid().optional(),
  targetUserId: z.string().uuid().optional(),
  action: z.enum(auditActions).optional(),
  from: instant.optional(),
  to: instant.optional(),
  ...pageQuery(200, 50),
})
export type AuditQuery = z.infer<typeof auditQuerySchema>

export interface AuditEntry {
  id: string
  action: AuditAction
  actor: { id: string; name: string } | null
  target: { id: string | null; name: string; email: string } | null
  details: Record<string, unknown>
  createdAt: string
}
