import type { PlanPreview } from '../../shared/plan'
import type { PlanBodyInput, PlanVersion, PlanVersionSummary, SendPlanInput } from '../../shared/schemas/plan'
import type { Room } from '../../shared/schemas/room'
import type { CaseStatus } from '../../shared/schemas/case'
import { api } from './client'

export type { PlanPreview }
export type PlanVersionWithRoom = PlanVersion & { room: Room; caseTitle: string }

export const plansPath = (caseId: string) => `/api/cases/${encodeURIComponent(caseId)}/plans`

/** Versions of the case's plan, newest first (a listener gets only the sent ones). */
export async function listPlans(caseId: string): Promise<PlanVersionSummary[]> {
  return (await api.get<{ plans: PlanVersionSummary[] }>(plansPath(caseId))).plans
}

/** One version with the room revision it was made for. */
export function getPlan(caseId: string, version: number): Promise<PlanVersionWithRoom> {
  return api.get<PlanVersionWithRoom>(`${plansPath(caseId)}/${version}`)
}

/** Saves the plan as the next version (a draft); 400 with field paths such as `treatments.2.x`. */
export function savePlan(caseId: string, body: PlanBodyInput): Promise<PlanVersion> {
  return api.post<PlanVersion>(plansPath(caseId), body)
}

/** Sends a version: the case moves to "plan sent" from `fromStatus` (409 when it moved meanwhile) and the listener is e-mailed. */
export function sendPlan(caseId: string, version: number, input: SendPlanInput): Promise<PlanVersion> {
  return api.post<PlanVersion>(`${plansPath(caseId)}/${version}/send`, input)
}

/** Predictions, snap targets and suggestions for an unsaved plan on the case's current room. */
export function previewPlan(caseId: string, plan: PlanBodyInput, signal?: AbortSignal): Promise<PlanPreview> {
  return api.post<PlanPreview>('/api/plans/preview', { caseId, plan }, { signal })
}

export const planPdfUrl = (caseId: string, version: number) => `${plansPath(caseId)}/${version}/report.pdf`

export type { CaseStatus }
