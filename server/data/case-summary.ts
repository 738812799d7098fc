import type { CaseStatus, CaseSummary } from '../../shared/schemas/case'

/** A case summary as hand-written SQL reads it (the queue's statements in data/queue.ts select these columns). */
export interface SummaryRow {
  id: string; title: string; status: CaseStatus; score: number | null
  listener_id: string; listener_name: string; assignee_id: string | null; assignee_name: string | null
  room_id: string; room_name: string; room_revision: number; length: number; width: number; height: number
  flags: { id: string; severity: string }[] | null
  created_at: Date; submitted_at: Date | null; waiting_since: Date | null; last_activity_at: Date
}

const iso = (d: Date | null) => (d ? new Date(d).toISOString() : null)

/** Such a row as the API lists it (the same shape as `caseToSummary` in data/cases.ts gives for a model). */
export const toSummary = (r: SummaryRow): CaseSummary => ({
  id: r.id,
  title: r.title,
  status: r.status,
  score: r.score,
  listener: { id: r.listener_id, name: r.listener_name },
  assignee: r.assignee_id ? { id: r.assignee_id, name: r.assignee_name ?? '' } : null,
  room: { id: r.room_id, name: r.room_name, revision: r.room_revision, length: Number(r.length), width: Number(r.width), height: Number(r.height) },
  flags: r.flags ?? [],
  createdAt: iso(r.created_at)!,
  submittedAt: iso(r.submitted_at),
  waitingSince: iso(r.waiting_since),
  lastActivityAt: iso(r.last_activity_at)!,
})
