import type {
  Breaches, FlagBreakdown, ReopenRate, ResponseTimes, Satisfaction, StatusCounts, Targets, TargetsResponse, WaitingDistribution, Workload,
} from '../../shared/schemas/metrics'
import { api, type QueryParams } from './client'

/** The period and filters every dashboard figure takes (ISO instants; ids comma-separated). */
export interface MetricsFilter { from?: string; to?: string; advisorIds?: string[] }

const query = (f: MetricsFilter): QueryParams => ({ from: f.from, to: f.to, advisorIds: f.advisorIds?.length ? f.advisorIds.join(',') : undefined })
const get = <T>(path: string, f: MetricsFilter) => api.get<T>(`/api/metrics/${path}`, { query: query(f) })

export const getStatusCounts = (f: MetricsFilter = {}) => get<StatusCounts>('status', f)
export const getWaiting = (f: MetricsFilter = {}) => get<WaitingDistribution>('waiting', f)
export const getResponseTimes = (f: MetricsFilter = {}) => get<ResponseTimes>('response-times', f)
export const getBreaches = (f: MetricsFilter = {}) => get<Breaches>('breaches', f)
export const getWorkload = (f: MetricsFilter = {}) => get<Workload>('workload', f)
export const getReopenRate = (f: MetricsFilter = {}) => get<ReopenRate>('reopen-rate', f)
export const getFlags = (f: MetricsFilter = {}) => get<FlagBreakdown>('flags', f)
export const getSatisfaction = (f: MetricsFilter = {}) => get<Satisfaction>('satisfaction', f)

export const getTargets = () => api.get<TargetsResponse>('/api/metrics/targets')
/** 400 with field paths (e.g. businessHours.week.0.end) when a value does not fit. */
export const saveTargets = (t: Targets) => api.put<TargetsResponse>('/api/metrics/targets', t)
