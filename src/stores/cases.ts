import type { TriageHistoryEntry } from '../../shared/schemas/triage'
import { defineStore } from 'pinia'
import { computed, ref, shallowRef } from 'vue'
import type { CaseDetail, CaseFile, CaseMessage, CaseStatus, CaseSummary, CreateCaseInput, MessageInput, UpdateCaseInput } from '../../shared/schemas/case'
import type { RoomRecord } from '../../shared/schemas/room'
import * as casesApi from '../api/cases'
import type { CaseTriage, SequencedEvent } from '../api/cases'
import { ApiRequestError } from '../api/client'
import * as filesApi from '../api/files'
import { getRoom } from '../api/rooms'

/**
 * One part of the open case (outside the store: `cases.detail.data`, `.loading`, `.error`), loaded on its own so one failure does not blank the page. A reload asked
 * for while one is in flight runs once more afterwards (so a change is never missed); a reset drops
 * answers still on their way for the case that was open before.
 */
function section<T>(initial: T) {
  const data = shallowRef<T>(initial)
  const loading = ref(false)
  const loaded = ref(false)
  const error = shallowRef<ApiRequestError | null>(null)
  let generation = 0
  let pending: Promise<void> | null = null
  let latest: (() => Promise<T>) | null = null
  let again = false

  function load(fetcher: () => Promise<T>): Promise<void> {
    latest = fetcher
    if (pending) {
      again = true
      return pending
    }
    const mine = generation
    loading.value = true
    pending = (async () => {
      do {
        again = false
        try {
          const answer = await latest!()
          if (mine !== generation) return
          data.value = answer
          error.value = null
          loaded.value = true
        } catch (caught) {
          if (mine !== generation) return
          error.value = asApiError(caught)
        }
      } while (again)
    })().finally(() => {
      if (mine === generation) {
        loading.value = false
        pending = null
      }
    })
    return pending
  }

  function reset(): void {
    generation++
    pending = null
    again = false
    data.value = initial
    loaded.value = false
    loading.value = false
    error.value = null
  }

  return { data, loading, loaded, error, load, reset }
}

function asApiError(caught: unknown): ApiRequestError {
  return caught instanceof ApiRequestError ? caught : new ApiRequestError(0, 'client', caught instanceof Error ? caught.message : 'Something went wrong on this page.')
}

const STATUS_KINDS = new Set(['status', 'reopened', 'assigned', 'claimed', 'unassigned', 'created', 'updated', 'submitted'])
const MESSAGE_KINDS = new Set(['message', 'note', 'ask'])
const FILE_KINDS = new Set(['file', 'analysis', 'file-analysed'])
const TRIAGE_KINDS = new Set(['triage', 'room-revised'])
const PLAN_KINDS = new Set(['plan-sent', 'plan-saved'])

/** The listener's case list, and the one case open on screen with its room, triage, thread, files and history. */
export const useCasesStore = defineStore('cases', () => {
  const mine = section<CaseSummary[]>([])

  const currentId = ref<string | null>(null)
  const detail = section<CaseDetail | null>(null)
  const triage = section<CaseTriage | null>(null)
  const triageHistory = section<TriageHistoryEntry[]>([])
  const room = section<RoomRecord | null>(null)
  const messages = section<CaseMessage[]>([])
  const files = section<CaseFile[]>([])
  const events = section<SequencedEvent[]>([])

  /** Counts plan events seen live, so the plan on screen reloads when a version is saved or sent. */
  const planChanges = ref(0)

  const lastSeq = computed(() => events.data.value.at(-1)?.seq)
  const status = computed<CaseStatus | null>(() => detail.data.value?.status ?? null)

  function loadMine(): Promise<void> {
    return mine.load(casesApi.listMyCases)
  }

  function createCase(input: CreateCaseInput): Promise<CaseDetail> {
    return casesApi.createCase(input)
  }

  const isCurrent = (id: string) => currentId.value === id

  async function refreshDetail(): Promise<void> {
    const id = currentId.value
    if (!id) return
    const before = detail.data.value?.room
    await detail.load(() => casesApi.getCase(id))
    const after = detail.data.value?.room
    if (after && (!before || before.id !== after.id || before.revision !== after.revision || !room.loaded.value)) void refreshRoom()
  }

  async function refreshRoom(): Promise<void> {
    const ref = detail.data.value?.room
    if (!ref) return
    await room.load(() => getRoom(ref.id, ref.revision))
  }

  function refreshTriage(): Promise<void> {
    const id = currentId.value
    if (!id) return Promise.resolve()
    return Promise.all([triage.load(() => casesApi.getTriage(id)), triageHistory.load(() => casesApi.getTriageHistory(id))]).then(() => {})
  }

  function refreshMessages(): Promise<void> {
    const id = currentId.value
    return id ? messages.load(() => casesApi.listMessages(id)) : Promise.resolve()
  }

  function refreshFiles(): Promise<void> {
    const id = currentId.value
    return id ? files.load(() => filesApi.listFiles(id)) : Promise.resolve()
  }

  function refreshEvents(): Promise<void> {
    const id = currentId.value
    return id ? events.load(() => casesApi.listEvents(id)) : Promise.resolve()
  }

  /**
   * Opens a case: every part in parallel, each with its own loading and error state. `sent: true` says the
   * case is known to be past draft (the team never sees a draft), so its triage is asked for at once
   * rather than after the case itself has answered.
   */
  async function open(id: string, opts: { sent?: boolean } = {}): Promise<void> {
    if (currentId.value !== id) {
      for (const part of [detail, triage, triageHistory, room, messages, files, events]) part.reset()
      currentId.value = id
    }
    // A draft has no triage yet (it is computed on submission): ask for it only once the case is sent.
    const triageOnceSent = async () => {
      await refreshDetail()
      if (isCurrent(id) && detail.data.value && detail.data.value.status !== 'draft') await refreshTriage()
    }
    await Promise.all([opts.sent ? Promise.all([refreshDetail(), refreshTriage()]) : triageOnceSent(), refreshMessages(), refreshFiles(), refreshEvents()])
  }

  function close(id: string): void {
    if (currentId.value === id) currentId.value = null
  }

  /** Fetches the events after the last one seen and reloads what they touched. */
  async function syncEvents(): Promise<SequencedEvent[]> {
    const id = currentId.value
    if (!id) return []
    let fresh: SequencedEvent[]
    try {
      fresh = await casesApi.listEvents(id, lastSeq.value)
    } catch {
      await refreshEvents()
      return []
    }
    if (!isCurrent(id) || fresh.length === 0) return fresh
    const known = new Set(events.data.value.map((e) => e.seq))
    events.data.value = [...events.data.value, ...fresh.filter((e) => !known.has(e.seq))]
    await applyKinds(fresh.map((e) => e.kind))
    return fresh
  }

  async function applyKinds(kinds: string[]): Promise<void> {
    const jobs: Promise<void>[] = []
    if (kinds.some((k) => STATUS_KINDS.has(k))) jobs.push(refreshDetail())
    if (kinds.some((k) => MESSAGE_KINDS.has(k))) jobs.push(refreshMessages())
    // A reply can bring files with it: the team's uploads become visible to the listener only then.
    if (kinds.some((k) => FILE_KINDS.has(k) || MESSAGE_KINDS.has(k))) jobs.push(refreshFiles())
    if (kinds.some((k) => TRIAGE_KINDS.has(k))) jobs.push(refreshTriage(), refreshDetail())
    if (kinds.some((k) => PLAN_KINDS.has(k))) planChanges.value++
    await Promise.all(jobs)
  }

  /** After a reconnect: the missed events from the database, then everything they may have changed. */
  async function catchUp(): Promise<void> {
    await Promise.all([syncEvents(), refreshDetail(), refreshMessages(), refreshFiles()])
  }

  async function sendMessage(input: MessageInput): Promise<CaseMessage> {
    const id = currentId.value!
    const message = await casesApi.postMessage(id, input)
    if (isCurrent(id) && !messages.data.value.some((m) => m.id === message.id)) messages.data.value = [...messages.data.value, message]
    if (input.ask) void refreshDetail()
    void syncEvents()
    return message
  }

  /** Saves a change; on 409 (the case moved on) the case reloads and the error is rethrown for the page to explain. */
  async function update(change: UpdateCaseInput): Promise<CaseDetail> {
    const id = currentId.value!
    try {
      const updated = await casesApi.updateCase(id, change)
      if (isCurrent(id)) detail.data.value = updated
      void syncEvents()
      if (change.status === 'submitted') void refreshTriage()
      return updated
    } catch (error) {
      if (error instanceof ApiRequestError && error.status === 409) await Promise.all([refreshDetail(), syncEvents()])
      throw error
    }
  }

  function moveTo(to: CaseStatus): Promise<CaseDetail> {
    return update({ status: to, fromStatus: status.value ?? undefined })
  }

  function assign(assigneeId: string | null, handoffNote?: string): Promise<CaseDetail> {
    return update(handoffNote ? { assigneeId, handoffNote } : { assigneeId })
  }

  async function uploadFile(file: File, onProgress?: (fraction: number) => void, signal?: AbortSignal): Promise<CaseFile> {
    const id = currentId.value!
    const stored = await filesApi.uploadFile(id, file, onProgress, signal)
    if (isCurrent(id) && !files.data.value.some((f) => f.id === stored.id)) files.data.value = [...files.data.value, stored]
    return stored
  }

  return {
    mine,
    loadMine,
    createCase,
    currentId,
    detail,
    triage,
    triageHistory,
    room,
    messages,
    files,
    events,
    lastSeq,
    planChanges,
    status,
    open,
    close,
    refreshDetail,
    refreshTriage,
    refreshMessages,
    refreshFiles,
    refreshEvents,
    refreshRoom,
    syncEvents,
    catchUp,
    sendMessage,
    update,
    moveTo,
    assign,
    uploadFile,
  }
})
