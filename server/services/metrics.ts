import * as data from '../data/metrics'
import { withTransaction } from '../db/transaction'
import { badRequest } from '../errors'
import { addWorkingMs } from './business-hours'
import { recordAudit } from './team'
import { caseStatuses } from '../../shared/schemas/case'
import {
  flagLabel, targetsSchema, waitingBuckets,
  type Breaches, type FlagBreakdown, type MetricsQuery, type ReopenRate, type ResponseTimes, type Satisfaction,
  type StatusCounts, type Targets, type TargetsResponse, type WaitingDistribution, type WeekFigure, type Workload,
} from '../../shared/schemas/metrics'
import type { User } from '../../shared/schemas/auth'

const iso = (d: Date | string) => new Date(d).toISOString()
const num = (v: unknown): number | null => (v === null || v === undefined ? null : Number(v))
const round = (v: number | null, digits = 2) => (v === null ? null : Math.round(v * 10 ** digits) / 10 ** digits)

export async function getTargets(): Promise<TargetsResponse> {
  const s = await data.readSettings()
  return {
    firstResponseHours: Number(s.firstResponseHours),
    resolutionHours: Number(s.resolutionHours),
    warnAtPercent: s.warnAtPercent,
    businessHours: s.timeZone && s.week ? { timeZone: s.timeZone, week: s.week } : null,
    updatedAt: s.updatedAt ? iso(s.updatedAt) : null,
    updatedBy: s.updatedBy ? { id: s.updatedBy, name: s.editor?.name ?? '' } : null,
  }
}

/** Supervisors set the targets; the change and its previous values go into the audit log. */
export async function setTargets(user: User, input: Targets): Promise<TargetsResponse> {
  const t = targetsSchema.parse(input)
  if (t.businessHours && !(await data.databaseKnowsZone(t.businessHours.timeZone))) {
    throw badRequest('The database does not know that time zone', [{ path: 'businessHours.timeZone', message: 'choose another spelling, e.g. Europe/London' }])
  }
  const before = await getTargets()
  await withTransaction(async (tx) => {
    await data.writeSettings(t, user.id, tx)
    const { updatedAt: _a, updatedBy: _b, ...previous } = before
    await recordAudit({ actorId: user.id, action: 'targets.changed', details: { before: previous, after: t } }, tx)
  })
  return getTargets()
}

/** The period and filters of a metrics request, with the team's clock. */
export async function scopeOf(q: MetricsQuery): Promise<{ scope: data.Scope; targets: TargetsResponse }> {
  const targets = await getTargets()
  const timeZone = targets.businessHours?.timeZone ?? 'UTC'
  const fallback = await data.defaultPeriod(timeZone)
  const to = q.to ? new Date(q.to) : fallback.to
  const from = q.from ? new Date(q.from) : q.to ? new Date(to.getTime() - 12 * 7 * 86_400_000) : fallback.from
  if (!(to > from)) throw badRequest('The period must end after it starts', [{ path: 'to', message: 'after "from"' }])
  return {
    scope: { from, to, advisorIds: q.advisorIds ?? null, listenerIds: q.listenerIds ?? null, timeZone, week: targets.businessHours?.week ?? null },
    targets,
  }
}

export async function casesByStatus(q: MetricsQuery): Promise<StatusCounts> {
  const { scope } = await scopeOf(q)
  const rows = await data.statusCounts(scope)
  const statuses = caseStatuses.filter((s) => s !== 'draft').map((status) => ({ status, count: rows.find((r) => r.status === status)?.count ?? 0 }))
  return { statuses, open: statuses.filter((s) => s.status !== 'closed').reduce((n, s) => n + s.count, 0) }
}

export async function waitingTimes(q: MetricsQuery): Promise<WaitingDistribution> {
  const { scope } = await scopeOf(q)
  const edges = [0, ...waitingBuckets.flatMap((b) => (b.maxHours === null ? [] : [b.maxHours]))]
  const rows = await data.waitingDistribution(scope, edges)
  const overall = rows.find((r) => r.bucket === null)
  return {
    // width_bucket: 1 for [0, 4), 2 for [4, 24) … and edges.length for values at or above the last edge.
    buckets: waitingBuckets.map((b, i) => ({ key: b.key, label: b.label, count: rows.find((r) => r.bucket === i + 1)?.count ?? 0 })),
    total: overall?.count ?? 0,
    medianHours: round(num(overall?.median_h)),
    longestHours: round(num(overall?.longest_h)),
  }
}

function weekFigures(rows: data.WeekRow[]) {
  const fig = (r: data.WeekRow) => ({ count: r.count, medianHours: round(num(r.median_h)), p90Hours: round(num(r.p90_h)), withinTarget: r.within })
  const weeks: WeekFigure[] = rows.filter((r) => r.week_start !== null).map((r) => ({ weekStart: iso(r.week_start!), ...fig(r) }))
  const o = rows.find((r) => r.week_start === null)
  return { weeks, overall: o ? fig(o) : { count: 0, medianHours: null, p90Hours: null, withinTarget: 0 } }
}

export async function responseTimes(q: MetricsQuery): Promise<ResponseTimes> {
  const { scope, targets } = await scopeOf(q)
  const [fr, res] = await Promise.all([
    data.responseWeeks(scope, 'first_response', targets.firstResponseHours),
    data.responseWeeks(scope, 'resolution', targets.resolutionHours),
  ])
  return {
    clock: targets.businessHours ? 'working' : 'calendar',
    timeZone: scope.timeZone,
    firstResponse: { targetHours: targets.firstResponseHours, ...weekFigures(fr) },
    resolution: { targetHours: targets.resolutionHours, ...weekFigures(res) },
  }
}

/** Open cases past or near their target, worst first; the due time comes from the working-time function. */
export async function breaches(q: MetricsQuery): Promise<Breaches> {
  const { scope, targets } = await scopeOf(q)
  const rows = await data.openClocks(scope, targets)
  return {
    clock: targets.businessHours ? 'working' : 'calendar',
    warnAtPercent: targets.warnAtPercent,
    rows: rows.map((r) => {
      const targetHours = r.responded ? targets.resolutionHours : targets.firstResponseHours
      const elapsedHours = Number(r.elapsed_s) / 3600
      return {
        caseId: r.case_id,
        title: r.title,
        status: r.status,
        listener: { id: r.listener_id, name: r.listener_name },
        assignee: r.assignee_id ? { id: r.assignee_id, name: r.assignee_name ?? '' } : null,
        target: r.responded ? 'resolution' : 'first_response',
        state: elapsedHours >= targetHours ? 'breached' : 'at_risk',
        elapsedHours: round(elapsedHours)!,
        targetHours,
        dueAt: addWorkingMs(r.clock_start, targetHours * 3_600_000, targets.businessHours).toISOString(),
        submittedAt: iso(r.clock_start),
      }
    }),
  }
}

export async function workload(q: MetricsQuery): Promise<Workload> {
  const { scope } = await scopeOf(q)
  const rows = await data.workload(scope)
  return {
    advisors: rows.filter((r) => r.id !== null).map((r) => ({
      advisor: { id: r.id!, name: r.name ?? '', role: r.role!, active: !!r.active },
      open: r.open,
      waitingOnTeam: r.waiting_on_team,
      waitingOnListener: r.waiting_on_listener,
      planSent: r.plan_sent,
      closedInPeriod: r.closed_in_period,
      firstResponsesInPeriod: r.first_responses_in_period,
      medianResolutionHours: round(num(r.median_resolution_h)),
    })),
    unassignedOpen: scope.advisorIds ? 0 : rows.find((r) => r.id === null)?.open ?? 0,
  }
}

const rate = (part: number, whole: number) => (whole > 0 ? round(part / whole, 4) : null)

export async function reopenRate(q: MetricsQuery): Promise<ReopenRate> {
  const { scope } = await scopeOf(q)
  const rows = await data.reopenWeeks(scope)
  const o = rows.find((r) => r.week_start === null) ?? { closed: 0, reopened: 0 }
  return {
    closed: o.closed,
    reopened: o.reopened,
    rate: rate(o.reopened, o.closed),
    weeks: rows.filter((r) => r.week_start !== null).map((r) => ({ weekStart: iso(r.week_start!), closed: r.closed, reopened: r.reopened, rate: rate(r.reopened, r.closed) })),
  }
}

export async function flags(q: MetricsQuery): Promise<FlagBreakdown> {
  const { scope } = await scopeOf(q)
  const rows = await data.flagBreakdown(scope)
  const total = rows.find((r) => r.flag_id === null)?.cases ?? 0
  return {
    cases: total,
    flags: rows.filter((r) => r.flag_id !== null).map((r) => ({
      flagId: r.flag_id!, label: flagLabel(r.flag_id!), cases: r.cases, share: rate(r.cases, total) ?? 0, open: r.open,
      medianResolutionHours: round(num(r.median_resolution_h)),
    })),
  }
}

export async function satisfaction(q: MetricsQuery): Promise<Satisfaction> {
  const { scope } = await scopeOf(q)
  const [rows, recent] = await Promise.all([data.satisfactionWeeks(scope), data.recentRatings(scope)])
  const o = rows.find((r) => r.week_start === null)!
  return {
    count: o.count,
    average: round(num(o.average)),
    distribution: [o.d1, o.d2, o.d3, o.d4, o.d5],
    closedInPeriod: o.closed,
    weeks: rows.filter((r) => r.week_start !== null).map((r) => ({ weekStart: iso(r.week_start!), count: r.count, average: round(num(r.average)) })),
    recent: recent.map((r) => ({ caseId: r.case_id, title: r.title, score: r.score, comment: r.comment, createdAt: iso(r.created_at), listenerName: r.listener_name })),
  }
}
