import { defineStore } from 'pinia'
import { ref } from 'vue'
import type { PlanBodyInput, PlanVersion, PlanVersionSummary } from '../../shared/schemas/plan'
import type { CaseStatus } from '../../shared/schemas/case'
import * as plansApi from '../api/plans'
import type { PlanVersionWithRoom } from '../api/plans'

/** Treatment plans per case: the version lists and the versions opened. */
export const usePlansStore = defineStore('plans', () => {
  const lists = ref<Record<string, PlanVersionSummary[]>>({})
  const versions = ref<Record<string, PlanVersionWithRoom>>({})
  const key = (caseId: string, version: number) => `${caseId}#${version}`

  async function loadList(caseId: string): Promise<PlanVersionSummary[]> {
    const list = await plansApi.listPlans(caseId)
    lists.value = { ...lists.value, [caseId]: list }
    return list
  }

  /** A version, from memory once fetched (saved versions never change). */
  async function fetchVersion(caseId: string, version: number): Promise<PlanVersionWithRoom> {
    const k = key(caseId, version)
    const known = versions.value[k]
    if (known && known.status === 'sent') return known
    const got = await plansApi.getPlan(caseId, version)
    versions.value = { ...versions.value, [k]: got }
    return got
  }

  async function save(caseId: string, body: PlanBodyInput): Promise<PlanVersion> {
    const saved = await plansApi.savePlan(caseId, body)
    await loadList(caseId)
    return saved
  }

  async function send(caseId: string, version: number, fromStatus: CaseStatus, message?: string): Promise<PlanVersion> {
    const sent = await plansApi.sendPlan(caseId, version, { fromStatus, message })
    delete versions.value[key(caseId, version)]
    await loadList(caseId)
    return sent
  }

  return { lists, versions, loadList, fetchVersion, save, send, preview: plansApi.previewPlan }
})
