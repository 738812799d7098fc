import { defineStore } from 'pinia'
import { ref } from 'vue'
import type { AccountSummary, Invitation, InviteInput, StaffRole, TeamMember } from '../../shared/schemas/team'
import * as teamApi from '../api/team'

/** The desk's advisors and supervisors, and the invitations still open. */
export const useTeamStore = defineStore('team', () => {
  const members = ref<TeamMember[]>([])
  const invitations = ref<Invitation[]>([])
  const loaded = ref(false)

  async function load(): Promise<void> {
    const [m, i] = await Promise.all([teamApi.listMembers(), teamApi.listInvitations()])
    members.value = m
    invitations.value = i
    loaded.value = true
  }

  const listeners = ref<AccountSummary[]>([])
  const listenersTotal = ref(0)

  const replace = (m: AccountSummary) => {
    if (m.role === 'listener') listeners.value = listeners.value.map((x) => (x.id === m.id ? m : x))
    else members.value = members.value.map((x) => (x.id === m.id ? (m as TeamMember) : x))
  }
  async function searchListeners(search: string): Promise<void> {
    const r = await teamApi.listListeners({ search: search.trim() || undefined })
    listeners.value = r.listeners
    listenersTotal.value = r.total
  }

  async function invite(input: InviteInput): Promise<Invitation> {
    const inv = await teamApi.invite(input)
    invitations.value = [inv, ...invitations.value.filter((i) => i.email !== inv.email)]
    return inv
  }
  async function revoke(id: string): Promise<void> {
    await teamApi.revokeInvitation(id)
    invitations.value = invitations.value.filter((i) => i.id !== id)
  }
  async function deactivate(id: string) { replace(await teamApi.deactivate(id)) }
  async function reactivate(id: string) { replace(await teamApi.reactivate(id)) }
  async function changeRole(id: string, role: StaffRole) { replace(await teamApi.changeRole(id, role)) }

  return { members, invitations, listeners, listenersTotal, searchListeners, loaded, load, invite, revoke, deactivate, reactivate, changeRole }
})
