import { defineStore } from 'pinia'
import { ref, shallowRef } from 'vue'
import type {
  Breaches, FlagBreakdown, ReopenRate, ResponseTimes, Satisfaction, StatusCounts, Targets, TargetsResponse, WaitingDistribution, Workload,
} from '../../shared/schemas/metrics'
import * as metricsApi from '../api/metrics'
import { updateCase } from '../api/cases'

/** Every dashboard figure, loaded together for one period. */
export const useMetricsStore = defineStore('metrics', () => {
  const filter = ref<metricsApi.MetricsFilter>({})
  const status = shallowRef<StatusCounts | null>(null)
  const waiting = shallowRef<WaitingDistribution | null>(null)
  const responseTimes = shallowRef<ResponseTimes | null>(null)
  const breaches = shallowRef<Breaches | null>(null)
  const workload = shallowRef<Workload | null>(null)
  const reopen = shallowRef<ReopenRate | null>(null)
  const flags = shallowRef<FlagBreakdown | null>(null)
  const satisfaction = shallowRef<Satisfaction | null>(null)
  const targets = shallowRef<TargetsResponse | null>(null)
  const loadedAt = ref<Date | null>(null)

  async function load(): Promise<void> {
    const f = filter.value
    const [s, w, r, b, wl, ro, fl, sa, t] = await Promise.all([
      metricsApi.getStatusCounts(f), metricsApi.getWaiting(f), metricsApi.getResponseTimes(f), metricsApi.getBreaches(f),
      metricsApi.getWorkload(f), metricsApi.getReopenRate(f), metricsApi.getFlags(f), metricsApi.getSatisfaction(f), metricsApi.getTargets(),
    ])
    status.value = s; waiting.value = w; responseTimes.value = r; breaches.value = b
    workload.value = wl; reopen.value = ro; flags.value = fl; satisfaction.value = sa; targets.value = t
    loadedAt.value = new Date()
  }

  async function saveTargets(t: Targets): Promise<void> {
    targets.value = await metricsApi.saveTargets(t)
    await load()
  }

  /** Hands a case to another advisor (or back to the queue with null), then refreshes the figures. */
  async function reassign(caseId: string, assigneeId: string | null): Promise<void> {
    await updateCase(caseId, { assigneeId })
    await load()
  }

  return { filter, status, waiting, responseTimes, breaches, workload, reopen, flags, satisfaction, targets, loadedAt, load, saveTargets, reassign }
})
