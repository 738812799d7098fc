import { queuePage, type QueuePage } from '../data/queue'
import { queueQuerySchema } from '../../shared/schemas/queue'
import { AppError } from '../errors'
import { zodFields } from '../middleware/validate'
import type { User } from '../../shared/schemas/auth'

/**
 * The team's queue: one page for the query parameters. The default views ("Mine", "Unassigned", "All")
 * cover open work, what needs an answer first; a status filter reaches closed cases.
 */
export async function teamQueue(user: User, rawQuery: unknown): Promise<QueuePage> {
  const parsed = queueQuerySchema.safeParse(rawQuery)
  if (!parsed.success) throw new AppError('Some filters need another look', { status: 400, code: 'invalid', fields: zodFields(parsed.error.issues) })
  return queuePage(user.id, parsed.data)
}
