import { z } from 'zod'
import type { CaseStatus } from './case'

/** "HH:MM" on a 24-hour clock; an end of day may be "24:00". */
const clock = z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$|^24:00$/, 'use HH:MM on a 24-hour clock, e.g. 09:00')
export const minutesOfDay = (hhmm: string) => Number(hhmm.slice(0, 2)) * 60 + Number(hhmm.slice(3, 5))

/** One working day's hours; working time never crosses midnight (an end of "24:00" closes the day). */
export const dayHoursSchema = z
  .object({ start: clock, end: clock })
  .refine((d) => minutesOfDay(d.end) > minutesOfDay(d.start), { message: 'the day must end after it starts', path: ['end'] })
export type DayHours = z.infer<typeof dayHoursSchema>

export const weekdayLabels = ['Monday', 'Tuesday', 'Wednesday', 'Thursday', 'Friday', 'Saturday', 'Sunday'] as const

/** A time zone name from the IANA database that this runtime knows, e.g. "Europe/Berlin". */
export function isTimeZone(name: string): boolean {
  try {
    new Intl.DateTimeFormat('en-US', { timeZone: name })
    return /^[A-Za-z_]+(\/[A-Za-z0-9_+-]+)*$|^UTC$/.test(name)
  } catch {
    return false
  }
}

/** The team's working week: seven entries, Monday first; null for a day off. */
export const businessHoursSchema = z.object({
  timeZone: z.string().max(64).refine(isTimeZone, 'choose a time zone such as Europe/London'),
  week: z
    .array(dayHoursSchema.nullable())
    .length(7, 'give seven days, Monday first')
    .refine((w) => w.some(Boolean), 'at least one day needs working hours'),
})
export type BusinessHours = z.infer<typeof businessHoursSchema>

/** Response targets the supervisor sets; with business hours they count working hours only. */
export const targetsSchema = z.object({
  firstResponseHours: z.number().positive('a target above zero').max(24 * 90),
  resolutionHours: z.number().positive('a target above zero').max(24 * 365),
  /** A case counts as "about to breach" once this share of its target has gone by. */
  warnAtPercent: z.number().int().min(10).max(99),
  businessHours: businessHoursSchema.nullable(),
})
export type Targets = z.infer<typeof targetsSchema>
export type TargetsResponse = Targets & { updatedAt: string | null; updatedBy: { id: string; name: string } | null }

const uuidList = z.preprocess(
  (v) => (typeof v === 'string' ? v.split(',').map((s) => s.trim()).filter(Boolean) : v),
  z.array(z.string().uuid('a list of ids separated by commas')).min(1).max(200),
)
const instant = z.string().datetime({ offset: true, message: 'an ISO date-time such as 2025-03-03T00:00:00Z' })

/**
 * Query parameters every GET /api/metrics/* route takes. `from`/`to` bound the period (default: the
 * 12 weeks ending now); `advisorIds` keeps cases whose current assignee is listed, `listenerIds`
 * cases of those listeners.
 */
export const metricsQuerySchema = z
  .object({
    from: instant.optional(),
    to: instant.optional(),
    advisorIds: uuidList.optional(),
    listenerIds: uuidList.optional(),
  })
  .refine((q) => !q.from || !q.to || Date.parse(q.from) < Date.parse(q.to), { message: 'the period must end after it starts', path: ['to'] })
  .refine((q) => !q.from || !q.to || Date.parse(q.to) - Date.parse(q.from) <= 400 * 86_400_000, { message: 'choose a period of at most 400 days', path: ['to'] })
export type MetricsQuery = z.infer<typeof metricsQuerySchema>

export interface StatusCount { status: CaseStatus; count: number }
export interface StatusCounts { statuses: StatusCount[]; open: number }

export const waitingBuckets = [
  { key: 'lt4h', label: 'under 4 h', maxHours: 4 },
  { key: '4to24h', label: '4–24 h', maxHours: 24 },
  { key: '1to2d', label: '1–2 days', maxHours: 48 },
  { key: '2to4d', label: '2–4 days', maxHours: 96 },
  { key: '4to7d', label: '4–7 days', maxHours: 168 },
  { key: 'gt7d', label: 'over 7 days', maxHours: null },
] as const
export interface WaitingDistribution {
  buckets: { key: string; label: string; count: number }[]
  total: number
  /** Hours since the listener began waiting, over the cases waiting for the team. */
  medianHours: number | null
  longestHours: number | null
}

export type Clock = 'working' | 'calendar'
export interface WeekFigure {
  /** Monday 00:00 of the week in the team's time zone, as an instant. */
  weekStart: string
  count: number
  medianHours: number | null
  p90Hours: number | null
  /** Cases whose time was within the target. */
  withinTarget: number
}
export interface ResponseTimes {
  clock: Clock
  timeZone: string
  firstResponse: { targetHours: number; weeks: WeekFigure[]; overall: Omit<WeekFigure, 'weekStart'> }
  resolution: { targetHours: number; weeks: WeekFigure[]; overall: Omit<WeekFigure, 'weekStart'> }
}

export interface BreachRow {
  caseId: string
  title: string
  status: CaseStatus
  listener: { id: string; name: string }
  assignee: { id: string; name: string } | null
  target: 'first_response' | 'resolution'
  state: 'breached' | 'at_risk'
  elapsedHours: number
  targetHours: number
  /** When the target runs (ran) out, counting working time when business hours are set. */
  dueAt: string
  submittedAt: string
}
export interface Breaches { clock: Clock; warnAtPercent: number; rows: BreachRow[] }

export interface AdvisorLoad {
  advisor: { id: string; name: string; role: 'advisor' | 'supervisor'; active: boolean }
  open: number
  waitingOnTeam: number
  waitingOnListener: number
  planSent: number
  closedInPeriod: number
  firstResponsesInPeriod: number
  medianResolutionHours: number | null
}
export interface Workload { advisors: AdvisorLoad[]; unassignedOpen: number }

export interface ReopenWeek { weekStart: string; closed: number; reopened: number; rate: number | null }
export interface ReopenRate { closed: number; reopened: number; rate: number | null; weeks: ReopenWeek[] }

export interface FlagFigure { flagId: string; label: string; cases: number; share: number; open: number; medianResolutionHours: number | null }
export interface FlagBreakdown { cases: number; flags: FlagFigure[] }

export interface SatisfactionWeek { weekStart: string; count: number; average: number | null }
export interface Satisfaction {
  count: number
  average: number | null
  /** Counts of ratings 1…5 (index 0 is a 1). */
  distribution: [number, number, number, number, number]
  closedInPeriod: number
  weeks: SatisfactionWeek[]
  recent: { caseId: string; title: string; score: number; comment: string; createdAt: string; listenerName: string }[]
}

export const ratingSchema = z.object({
  score: z.number().int('a whole number from 1 to 5').min(1, 'from 1 to 5').max(5, 'from 1 to 5'),
  comment: z.string().trim().max(2000, 'keep it under 2000 characters').default(''),
})
export type RatingInput = z.input<typeof ratingSchema>
export interface Rating { caseId: string; score: number; comment: string; createdAt: string }

/** Flag names live in shared/words/flags.ts (one source for the queue, the workspace and the dashboard). */
export { flagLabel, flagLabels } from '../words/flags'
