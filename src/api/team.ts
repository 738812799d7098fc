import type { User } from '../../shared/schemas/auth'
import type {
  AccountSummary, AcceptInvitationInput, AuditEntry, AuditQuery, Invitation, InvitationPreview, InviteInput, StaffRole, TeamMember,
} from '../../shared/schemas/team'
import { api, forgetCsrfToken } from './client'

const member = (id: string) => `/api/team/members/${encodeURIComponent(id)}`

export async function listMembers(): Promise<TeamMember[]> {
  return (await api.get<{ members: TeamMember[] }>('/api/team/members')).members
}
export async function listInvitations(): Promise<Invitation[]> {
  return (await api.get<{ invitations: Invitation[] }>('/api/team/invitations')).invitations
}
/** 409 'email_taken' when the address already has an account. */
export const invite = (input: InviteInput) => api.post<Invitation>('/api/team/invitations', input)
export const revokeInvitation = (id: string) => api.delete<void>(`/api/team/invitations/${encodeURIComponent(id)}`)
/** Any account, listeners too: its sessions and live connections end at once. */
export const deactivate = (id: string) => api.post<AccountSummary>(`${member(id)}/deactivate`)
export const reactivate = (id: string) => api.post<AccountSummary>(`${member(id)}/reactivate`)
export const listListeners = (query: { search?: string; page?: number }) =>
  api.get<{ listeners: AccountSummary[]; total: number }>('/api/team/listeners', { query })
export const changeRole = (id: string, role: StaffRole) => api.put<TeamMember>(`${member(id)}/role`, { role })

/** 404 for an unknown link, 410 'link_gone' for a used, withdrawn or expired one. */
export const previewInvitation = (token: string) =>
  api.get<InvitationPreview>(`/api/team/invitations/by-token/${encodeURIComponent(token)}`, { notifyUnauthorized: false })

/** Creates the account and signs it in. */
export async function acceptInvitation(input: AcceptInvitationInput): Promise<User> {
  const user = await api.post<User>('/api/team/invitations/accept', input, { notifyUnauthorized: false })
  forgetCsrfToken()
  return user
}

export function listAudit(q: Partial<AuditQuery>): Promise<{ entries: AuditEntry[]; total: number }> {
  return api.get('/api/audit', { query: { ...q } })
}
