import { z } from 'zod'

/** Our own names for a case's life: draft → submitted → in review ⇄ waiting on listener → plan sent → closed (reopenable). */
export const caseStatuses = ['draft', 'submitted', 'in_review', 'waiting_on_listener', 'plan_sent', 'closed'] as const
export const caseStatusSchema = z.enum(caseStatuses)
export type CaseStatus = z.infer<typeof caseStatusSchema>

/** The names shown for each status live in shared/words/statuses.ts (one source for every page and e-mail). */
export { caseStatusLabels } from '../words/statuses'

export const budgetBands = ['under-250', '250-1000', '1000-3000', 'over-3000', 'not-sure'] as const

export const caseAnswersSchema = z.object({
  use: z.string().max(1000).default(''),
  seat: z.string().max(1000).default(''),
  bothers: z.string().max(2000).default(''),
  budget: z.enum(budgetBands).default('not-sure'),
  constraints: z.string().max(2000).default(''),
})

export const createCaseSchema = z.object({
  roomId: z.string().uuid('choose one of your rooms'),
  title: z.string().trim().min(3, 'give the case a short title').max(160),
  description: z.string().max(10_000).default(''),
  answers: caseAnswersSchema.default({ use: '', seat: '', bothers: '', budget: 'not-sure', constraints: '' }),
})
export type CreateCaseInput = z.input<typeof createCaseSchema>

export const updateCaseSchema = z
  .object({
    status: caseStatusSchema.optional(),
    /** The status the caller last saw; a transition from another state answers 409. */
    fromStatus: caseStatusSchema.optional(),
    assigneeId: z.string().uuid().nullable().optional(),
    handoffNote: z.string().max(2000).optional(),
    title: z.string().trim().min(3).max(160).optional(),
    description: z.string().max(10_000).optional(),
    answers: caseAnswersSchema.partial().optional(),
    roomId: z.string().uuid().optional(),
  })
  .refine((v) => Object.keys(v).some((k) => k !== 'fromStatus' && k !== 'handoffNote'), 'nothing to change')
export type UpdateCaseInput = z.infer<typeof updateCaseSchema>

export const messageSchema = z.object({
  body: z.string().trim().min(1, 'write something first').max(20_000),
  internal: z.boolean().default(false),
  /** "Ask for information": the case then waits on the listener. */
  ask: z.boolean().default(false),
  fileIds: z.array(z.string().uuid()).max(10).default([]),
})
export type MessageInput = z.input<typeof messageSchema>

export const fileKinds = ['photo', 'measurement', 'attachment'] as const
export type FileKind = (typeof fileKinds)[number]

export interface CaseFile {
  id: string
  caseId: string
  kind: FileKind
  name: string
  mime: string
  size: number
  createdAt: string
  uploaderId: string
  hasThumbnail: boolean
  analysis: { status: 'queued' | 'running' | 'done' | 'failed'; error?: string | null; result?: unknown } | null
}

export interface CaseMessage {
  id: string
  caseId: string
  author: { id: string; name: string; role: string } | null
  body: string
  html: string
  internal: boolean
  source: 'app' | 'email'
  createdAt: string
  fileIds: string[]
}

export interface CaseEvent {
  id: string
  kind: string
  actor: { id: string; name: string } | null
  fromStatus: CaseStatus | null
  toStatus: CaseStatus | null
  data: Record<string, unknown>
  createdAt: string
}

export interface CaseSummary {
  id: string
  title: string
  status: CaseStatus
  score: number | null
  listener: { id: string; name: string }
  assignee: { id: string; name: string } | null
  room: { id: string; name: string; revision: number; length: number; width: number; height: number }
  flags: { id: string; severity: string }[]
  createdAt: string
  submittedAt: string | null
  waitingSince: string | null
  lastActivityAt: string
}

export interface CaseDetail extends CaseSummary {
  description: string
  answers: z.infer<typeof caseAnswersSchema>
  listenerId: string
}
