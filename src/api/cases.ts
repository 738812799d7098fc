import type { TriageHistoryEntry, TriageSnapshot } from '../../shared/schemas/triage'
import type {
  CaseDetail,
  CaseEvent,
  CaseMessage,
  CaseSummary,
  CreateCaseInput,
  MessageInput,
  UpdateCaseInput,
} from '../../shared/schemas/case'
import type { QueueQuery, SavedFilterInput } from '../../shared/schemas/queue'
import type { Role } from '../../shared/schemas/auth'
import type {
  ModeAnalysis,
  PairReflections,
  ReverberationAnalysis,
  RoomMode,
  SeatAnalysis,
  SetupFlag,
  SpeakerBoundaries,
} from '../../shared/acoustics'
import { ApiRequestError, api } from './client'

export type QueueRow = CaseSummary & { priority: number }
export type SequencedEvent = CaseEvent & { seq: number }

/** The stored triage snapshot of a case: the engine's computeRoomAnalysis pieces plus the queue score. */
/** The stored triage snapshot, typed from the one shared definition. */
export type CaseTriage = TriageSnapshot

export interface SavedFilter {
  id: string
  name: string
  query: SavedFilterInput['query']
}

export interface StaffUser {
  id: string
  name: string
  email: string
  role: Role
  active: boolean
}

export const casePath = (id: string) => `/api/cases/${encodeURIComponent(id)}`

/** The signed-in listener's own cases, newest activity first as the server orders them. */
export async function listMyCases(): Promise<CaseSummary[]> {
  return (await api.get<{ rows: CaseSummary[]; total: number }>('/api/cases')).rows
}

/** One page of the queue: `total` is counted up to a cap; `totalCapped` says there are more ("200+"). */
export interface QueueAnswer { rows: QueueRow[]; total: number; totalCapped?: boolean }

/** One page of the team's queue; `status` goes as a comma-separated list. */
export function queuePage(query: Partial<QueueQuery>): Promise<QueueAnswer> {
  return api.get('/api/cases', {
    query: {
      scope: query.scope,
      status: query.status?.length ? query.status.join(',') : undefined,
      flag: query.flag || undefined,
      waitingHours: query.waitingHours,
      q: query.q?.trim() || undefined,
      sort: query.sort,
      dir: query.dir,
      page: query.page,
      pageSize: query.pageSize,
    },
  })
}

export function createCase(input: CreateCaseInput): Promise<CaseDetail> {
  return api.post('/api/cases', input)
}

export function getCase(id: string): Promise<CaseDetail> {
  return api.get(casePath(id))
}

/** Status moves send `fromStatus`; 409 'stale' or 'bad_transition' when the case moved on meanwhile. */
export function updateCase(id: string, change: UpdateCaseInput): Promise<CaseDetail> {
  return api.patch(casePath(id), change)
}

/** The triage snapshot, or null before the case is sent (the server answers 404 then). */
export async function getTriage(id: string): Promise<CaseTriage | null> {
  try {
    return await api.get<CaseTriage>(`${casePath(id)}/triage`)
  } catch (error) {
    if (error instanceof ApiRequestError && error.status === 404) return null
    throw error
  }
}

export async function getTriageHistory(id: string): Promise<TriageHistoryEntry[]> {
  return (await api.get<{ history: TriageHistoryEntry[] }>(`${casePath(id)}/triage/history`)).history
}

export async function listEvents(id: string, afterSeq?: number): Promise<SequencedEvent[]> {
  return (await api.get<{ events: SequencedEvent[] }>(`${casePath(id)}/events`, { query: { after: afterSeq } })).events
}

export async function listMessages(id: string): Promise<CaseMessage[]> {
  return (await api.get<{ messages: CaseMessage[] }>(`${casePath(id)}/messages`)).messages
}

export function postMessage(id: string, input: MessageInput): Promise<CaseMessage> {
  return api.post(`${casePath(id)}/messages`, input)
}

export async function listSavedFilters(): Promise<SavedFilter[]> {
  return (await api.get<{ filters: SavedFilter[] }>('/api/saved-filters')).filters
}

export function saveFilter(input: SavedFilterInput): Promise<SavedFilter> {
  return api.post('/api/saved-filters', input)
}

export function deleteSavedFilter(id: string): Promise<void> {
  return api.delete(`/api/saved-filters/${encodeURIComponent(id)}`)
}

/** Advisors and supervisors, for the hand-over picker. */
export async function listStaff(): Promise<StaffUser[]> {
  return (await api.get<{ users: StaffUser[] }>('/api/users')).users
}

/** Plain words for a failed case action. */
export function caseErrorMessage(error: ApiRequestError): string {
  if (error.status === 409 && (error.code === 'stale' || error.code === 'bad_transition')) {
    return 'Someone changed this case a moment ago, so that step no longer applies. The page now shows the case as it is.'
  }
  if (error.status === 403) return 'Your account may not do that on this case.'
  if (error.status === 404) return 'This case was not found. It may have been removed, or it belongs to someone else.'
  if (error.status === 0) return error.message
  if (error.status >= 500) return 'Something went wrong on our side. Try again in a moment.'
  return error.message
}

export interface CaseRating { score: number; comment: string; createdAt: string }
export async function getRating(id: string): Promise<CaseRating | null> {
  return (await api.get<{ rating: CaseRating | null }>(`${casePath(id)}/rating`)).rating
}
export async function rateCase(id: string, input: { score: number; comment: string }): Promise<CaseRating> {
  return api.post<CaseRating>(`${casePath(id)}/rating`, input)
}
