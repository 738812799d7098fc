import { z } from 'zod'
import { caseStatusSchema } from './case'
import { pageQuery } from './paging'

export const queueSorts = ['priority', 'waiting', 'age', 'activity', 'score', 'title'] as const

const csv = <T extends z.ZodType>(item: T) =>
  z.preprocess((v) => (typeof v === 'string' ? v.split(',').filter(Boolean) : v), z.array(item).max(10))

/** The queue's filters, as query parameters of GET /api/cases (and the body of a saved filter). */
export const queueQuerySchema = z.object({
  scope: z.enum(['mine', 'unassigned', 'all']).default('all'),
  status: csv(caseStatusSchema).optional(),
  flag: z.string().max(60).regex(/^[a-z0-9-]+$/).optional(),
  waitingHours: z.coerce.number().min(0).max(24 * 365).optional(),
  q: z.string().trim().max(200).optional(),
  sort: z.enum(queueSorts).default('priority'),
  dir: z.enum(['asc', 'desc']).default('desc'),
  ...pageQuery(100, 25),
})
export type QueueQuery = z.infer<typeof queueQuerySchema>

export const savedFilterSchema = z.object({
  name: z.string().trim().min(1).max(60),
  query: queueQuerySchema.omit({ page: true }).partial(),
})
export type SavedFilterInput = z.infer<typeof savedFilterSchema>
