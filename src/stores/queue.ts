import { defineStore } from 'pinia'
import { computed, reactive, ref, shallowRef } from 'vue'
import type { CaseStatus } from '../../shared/schemas/case'
import type { QueueQuery, SavedFilterInput } from '../../shared/schemas/queue'
import * as casesApi from '../api/cases'
import type { QueueRow, SavedFilter } from '../api/cases'
import { ApiRequestError } from '../api/client'

export type QueueFilters = Omit<QueueQuery, 'status' | 'flag' | 'waitingHours' | 'q'> & {
  status: CaseStatus[]
  flag: string | null
  waitingHours: number | null
  q: string
}

export const defaultFilters = (): QueueFilters => ({
  scope: 'all',
  status: [],
  flag: null,
  waitingHours: null,
  q: '',
  sort: 'priority',
  dir: 'desc',
  page: 1,
  pageSize: 25,
})

const asError = (caught: unknown) =>
  caught instanceof ApiRequestError ? caught : new ApiRequestError(0, 'client', caught instanceof Error ? caught.message : 'Something went wrong on this page.')

/** The team's queue: filters, one page of rows, the advisor's saved filters. */
export const useQueueStore = defineStore('queue', () => {
  const filters = reactive<QueueFilters>(defaultFilters())
  const rows = shallowRef<QueueRow[]>([])
  const total = ref(0)
  /** The server counted up to `total` and stopped: there are more (shown as "200+"). */
  const totalCapped = ref(false)
  const loading = ref(false)
  const loaded = ref(false)
  const error = shallowRef<ApiRequestError | null>(null)
  const refreshedAt = ref<number | null>(null)
  let sequence = 0

  /** Loads the page for the current filters; a slower earlier answer never overwrites a newer one. */
  async function load(): Promise<void> {
    const mine = ++sequence
    loading.value = true
    try {
      const answer = await casesApi.queuePage({
        ...filters,
        flag: filters.flag ?? undefined,
        waitingHours: filters.waitingHours ?? undefined,
        q: filters.q || undefined,
      })
      if (mine !== sequence) return
      rows.value = answer.rows
      total.value = answer.total
      totalCapped.value = answer.totalCapped === true
      error.value = null
      loaded.value = true
      refreshedAt.value = Date.now()
      const lastPage = Math.max(1, Math.ceil(answer.total / filters.pageSize))
      if (filters.page > lastPage && !totalCapped.value) {
        filters.page = lastPage
        void load()
      }
    } catch (caught) {
      if (mine === sequence) error.value = asError(caught)
    } finally {
      if (mine === sequence) loading.value = false
    }
  }

  function setFilters(next: Partial<QueueFilters>): void {
    Object.assign(filters, next)
  }

  function reset(): void {
    Object.assign(filters, defaultFilters())
  }

  /** The filters worth saving: everything but the page. */
  const savable = computed<SavedFilterInput['query']>(() => ({
    scope: filters.scope,
    status: filters.status.length ? filters.status : undefined,
    flag: filters.flag ?? undefined,
    waitingHours: filters.waitingHours ?? undefined,
    q: filters.q || undefined,
    sort: filters.sort,
    dir: filters.dir,
    pageSize: filters.pageSize,
  }))

  const saved = shallowRef<SavedFilter[]>([])
  const savedError = shallowRef<ApiRequestError | null>(null)

  async function loadSaved(): Promise<void> {
    try {
      saved.value = await casesApi.listSavedFilters()
      savedError.value = null
    } catch (caught) {
      savedError.value = asError(caught)
    }
  }

  async function saveCurrent(name: string): Promise<SavedFilter> {
    const filter = await casesApi.saveFilter({ name, query: savable.value })
    saved.value = [...saved.value.filter((f) => f.id !== filter.id), filter].sort((a, b) => a.name.localeCompare(b.name))
    return filter
  }

  async function removeSaved(id: string): Promise<void> {
    await casesApi.deleteSavedFilter(id)
    saved.value = saved.value.filter((f) => f.id !== id)
  }

  function apply(filter: SavedFilter): void {
    const q = filter.query
    Object.assign(filters, defaultFilters(), {
      scope: q.scope ?? 'all',
      status: q.status ?? [],
      flag: q.flag ?? null,
      waitingHours: q.waitingHours ?? null,
      q: q.q ?? '',
      sort: q.sort ?? 'priority',
      dir: q.dir ?? 'desc',
      pageSize: q.pageSize ?? 25,
      page: 1,
    })
  }

  /** Assigns the case to `userId`; the queue reloads either way so the row shows who has it now. */
  async function claim(caseId: string, userId: string): Promise<void> {
    try {
      await casesApi.updateCase(caseId, { assigneeId: userId })
    } finally {
      void load()
    }
  }

  return { filters, rows, total, totalCapped, loading, loaded, error, refreshedAt, load, setFilters, reset, savable, saved, savedError, loadSaved, saveCurrent, removeSaved, apply, claim }
})
