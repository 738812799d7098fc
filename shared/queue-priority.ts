import type { CaseStatus } from './schemas/case'
import { waitingOnTeam } from './case-workflow'

/**
 * The queue's priority, the one definition: the server's SQL (`prioritySql` in server/data/queue.ts)
 * mirrors it, and tests/api/queue-priority.test.ts checks that both give the same figure on a table
 * of cases. Weights are our own (no published source; see triageScore in server/services/triage.ts).
 */

/** Hours of waiting for the team after which waiting adds nothing more (four days). */
export const WAIT_CAP_HOURS = 96
/** Priority points per hour a case has waited for the team. */
export const POINTS_PER_HOUR = 1 / 4

/** Whether the team owes the listener an answer: such cases come first in the default order, whatever their priority. */
export const needsAnswer = (status: CaseStatus): boolean => waitingOnTeam.includes(status)

const ms = (t: string | number | Date) => (typeof t === 'number' ? t : new Date(t).getTime())

/**
 * A case's priority at `now`: its triage score plus a quarter point per hour it has waited for the team
 * (`waitingSince` is set only while the case is submitted or in review), the waiting part capped at
 * WAIT_CAP_HOURS. Not rounded (the queue shows it to one decimal).
 */
export function queuePriority(c: { score: number | null; waitingSince: string | Date | null }, now: string | number | Date): number {
  const hours = c.waitingSince === null ? 0 : (ms(now) - ms(c.waitingSince)) / 3_600_000
  return (c.score ?? 0) + Math.min(hours, WAIT_CAP_HOURS) * POINTS_PER_HOUR
}
